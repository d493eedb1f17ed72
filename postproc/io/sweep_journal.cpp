#include "postproc/io/sweep_journal.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <functional>
#include <sstream>
#include <system_error>

#include "input/errors.hpp"
#include "postproc/io/file_output.hpp"

namespace oxystrat {
namespace fs = std::filesystem;
namespace {

std::string one_line(std::string s) {
  for (auto& c : s) {
    if (c == '\t' || c == '\n' || c == '\r') c = ' ';
  }
  return s;
}

// "DIR.journal-R.csv" -> R (> 0); -1 for any other name.
int rank_of(const std::string& file, const std::string& stem) {
  const std::string head = stem + ".journal-", tail = ".csv";
  if (file.size() <= head.size() + tail.size() || file.rfind(head, 0) != 0 ||
      file.compare(file.size() - tail.size(), tail.size(), tail) != 0) {
    return -1;
  }
  const std::string digits = file.substr(head.size(), file.size() - head.size() - tail.size());
  if (digits.empty() || digits.size() > 6 || !std::all_of(digits.begin(), digits.end(), [](char c) { return c >= '0' && c <= '9'; })) {
    return -1;
  }
  const int r = std::atoi(digits.c_str());
  return r > 0 ? r : -1;
}

}  // namespace

std::string encode_point(size_t index, const PointResult& r) {
  std::string s = fmt::format("{}\t{}\t{}\t{}", index, r.ok ? 1 : 0, r.feasible ? 1 : 0, one_line(r.error));
  // A value travels as "NAME|SI unit|label|SI value|display unit|display per SI".
  for (const auto& v : r.values) {
    s += fmt::format("\t{}|{}|{}|{:.17g}|{}|{:.17g}", v.name, v.unit, v.label, v.value, v.display_unit, v.display_per_si);
  }
  // Constraint checks travel as "check:NAME|1|detail|satisfied" (the detail without '|').
  for (const auto& k : r.checks) {
    std::string detail = one_line(k.detail);
    for (auto& ch : detail) ch = ch == '|' ? '/' : ch;
    s += fmt::format("\tcheck:{}|1|{}|{}", k.name, detail, k.satisfied ? 1 : 0);
  }
  return s + "\tend";
}

bool decode_point(const std::string& line, size_t& index, PointResult& r) {
  std::istringstream row(line);
  std::string field;
  std::vector<std::string> f;
  while (std::getline(row, field, '\t')) f.push_back(field);
  if (f.size() < 5 || f.back() != "end") return false;  // cut short by an interruption
  try {
    index = std::stoul(f[0]);
  } catch (const std::exception&) {
    return false;
  }
  r = PointResult{};
  r.ok = f[1] == "1";
  r.feasible = f[2] == "1";
  r.error = f[3];
  for (size_t k = 4; k + 1 < f.size(); ++k) {
    std::istringstream v(f[k]);
    SummaryValue s;
    std::string value, per_si;
    if (!std::getline(v, s.name, '|') || !std::getline(v, s.unit, '|') || !std::getline(v, s.label, '|') ||
        !std::getline(v, value, '|')) {
      return false;
    }
    s.value = std::strtod(value.c_str(), nullptr);
    if (s.name.rfind("check:", 0) == 0) {
      r.checks.push_back({s.name.substr(6), s.value != 0.0, s.label});
      continue;
    }
    if (!std::getline(v, s.display_unit, '|') || !std::getline(v, per_si)) return false;
    s.display_per_si = std::strtod(per_si.c_str(), nullptr);
    r.values.push_back(s);
  }
  return true;
}

std::string sweep_signature(const LoadedCase& base, const std::vector<std::string>& sets,
                            const std::vector<std::string>& vary, const std::string& sample, const SweepOptions& opts) {
  // "si": values are journaled in SI since format 2.0; a journal of an earlier release is not resumed.
  std::string s = fmt::format("{:x} si", std::hash<std::string>{}(base.source_text));
  for (const auto& x : sets) s += " --set " + x;
  for (const auto& v : vary) s += " --vary " + v;
  s += " --sample " + sample + " --seed " + std::to_string(opts.seed) + (opts.with_mixing ? " mixing" : "") +
       (opts.supportable_biomass ? "" : " no-biomass") +
       (opts.uncertainty_samples > 0 ? " uncertainty " + std::to_string(opts.uncertainty_samples) : "");
  return s;
}

SweepJournal::SweepJournal(const std::string& target, std::string signature, int rank)
    : target_(target), signature_(std::move(signature)), rank_(rank) {
  path_ = rank == 0 ? target + ".journal.csv" : fmt::format("{}.journal-{}.csv", target, rank);
}

std::vector<std::string> SweepJournal::files() const {
  const fs::path t(target_);
  const fs::path parent = t.has_parent_path() ? t.parent_path() : fs::path(".");
  const std::string stem = t.filename().string();
  std::vector<std::pair<int, std::string>> found;
  std::error_code ec;
  if (fs::exists(target_ + ".journal.csv", ec)) found.emplace_back(0, target_ + ".journal.csv");
  for (const auto& e : fs::directory_iterator(parent, ec)) {
    const std::string name = e.path().filename().string();
    if (const int r = rank_of(name, stem); r > 0) found.emplace_back(r, (parent / name).string());
  }
  std::sort(found.begin(), found.end());
  std::vector<std::string> out;
  for (auto& [r, f] : found) out.push_back(std::move(f));
  return out;
}

std::map<size_t, PointResult> SweepJournal::load() const {
  std::map<size_t, PointResult> done;
  for (const auto& file : files()) {
    std::ifstream in(file);
    if (!in) continue;
    std::string line;
    if (!std::getline(in, line)) continue;  // created, nothing written yet
    if (line != "# " + signature_) {
      throw CaseError(file + " belongs to a different sweep (other case, overrides, --vary or options); remove it "
                             "or run without --resume");
    }
    while (std::getline(in, line)) {
      size_t index = 0;
      PointResult r;
      if (decode_point(line, index, r)) done[index] = r;
    }
  }
  return done;
}

void SweepJournal::open(bool resume, int ranks) {
  if (!resume && rank_ == 0) {
    const std::string stem = fs::path(target_).filename().string();
    for (const auto& f : files()) {
      if (rank_of(fs::path(f).filename().string(), stem) >= ranks) std::remove(f.c_str());
    }
  }
  if (resume) {
    std::ifstream probe(path_, std::ios::binary | std::ios::ate);
    if (probe && probe.tellg() > 0) {
      char last = '\n';
      probe.seekg(-1, std::ios::end);
      probe.get(last);
      probe.close();
      if (last != '\n') {  // a line cut short by the interruption: the next starts on its own
        std::ofstream out(path_, std::ios::app);
        out << "\n";
        finish_file(out, path_);
      }
      return;
    }
  }
  std::ofstream out(path_, std::ios::trunc);
  out << "# " << signature_ << "\n";
  finish_file(out, path_);
}

void SweepJournal::record(size_t index, const PointResult& r) {
  std::ofstream out(path_, std::ios::app);
  out << encode_point(index, r) << "\n";
  finish_file(out, path_);
}

void SweepJournal::remove() {
  if (rank_ == 0) {
    for (const auto& f : files()) std::remove(f.c_str());
  } else {
    std::remove(path_.c_str());
  }
}

}  // namespace oxystrat
