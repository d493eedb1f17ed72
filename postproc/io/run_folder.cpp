#include "postproc/io/run_folder.hpp"
#include "input/errors.hpp"

#include <signal.h>
#include <unistd.h>

#include <algorithm>
#include <cerrno>
#include <charconv>
#include <mutex>
#include <optional>
#include <string_view>
#include <system_error>

namespace oxystrat {
namespace fs = std::filesystem;

namespace {

// Staging folders of this process not yet committed, for abandon_run_folders(). Commits run under
// the same lock, so an interrupt never lands between moving the old result aside and putting the
// new one in its place.
struct Registry {
  std::mutex lock;
  std::vector<fs::path> staging;
  std::vector<fs::path> inputs;  // absolute
  std::function<void(const std::string&)> notes;
  bool abandoned = false;
};

Registry& registry() {
  static Registry r;
  return r;
}

// The process id in a leftover's name suffix ("1234" or "1234-0"); nothing when it is not one.
std::optional<pid_t> pid_in(std::string_view suffix) {
  const auto dash = suffix.find('-');
  const std::string_view digits = suffix.substr(0, dash);
  if (digits.empty() || !std::all_of(digits.begin(), digits.end(), [](char c) { return c >= '0' && c <= '9'; })) {
    return std::nullopt;
  }
  if (dash != std::string_view::npos) {
    const auto rest = suffix.substr(dash + 1);
    if (rest.empty() || !std::all_of(rest.begin(), rest.end(), [](char c) { return c >= '0' && c <= '9'; })) {
      return std::nullopt;
    }
  }
  pid_t pid = 0;
  const auto [end, ec] = std::from_chars(digits.data(), digits.data() + digits.size(), pid);
  if (ec != std::errc() || end != digits.data() + digits.size() || pid <= 0) return std::nullopt;
  return pid;
}

// A process that no longer exists on this machine (EPERM: it exists, owned by someone else).
bool dead(pid_t pid) { return ::kill(pid, 0) != 0 && errno == ESRCH; }

// True when `inner` is `outer` or lies inside it (both canonical).
bool within(const fs::path& inner, const fs::path& outer) {
  return std::mismatch(outer.begin(), outer.end(), inner.begin(), inner.end()).first == outer.end();
}

// The files protect_from_replacement() was given.
std::vector<fs::path> protected_inputs() {
  auto& r = registry();
  const std::lock_guard hold(r.lock);
  return r.inputs;
}

void note(const std::string& text) {
  auto& r = registry();
  std::function<void(const std::string&)> sink;
  {
    const std::lock_guard hold(r.lock);
    sink = r.notes;
  }
  if (sink) sink(text);
}

}  // namespace

void set_run_folder_notes(std::function<void(const std::string&)> sink) {
  auto& r = registry();
  const std::lock_guard hold(r.lock);
  r.notes = std::move(sink);
}

void check_replaceable(const fs::path& target, const std::vector<fs::path>& inputs) {
  std::error_code ec;
  const fs::path t = fs::weakly_canonical(target, ec);
  if (ec) throw IoError("cannot resolve the output folder " + target.string() + ": " + ec.message());
  const auto refuse = [&](const fs::path& held, const std::string& what) {
    throw CaseError("--out " + target.string() + " --force would delete " + t.string() + ", which holds " + what +
                    " " + held.string() + "; choose another --out (a new folder, or an old result folder)");
  };
  const fs::path cwd = fs::current_path(ec);
  if (!ec && within(fs::weakly_canonical(cwd, ec), t)) refuse(cwd, "the working folder");
  for (const auto& in : inputs) {
    const fs::path c = fs::weakly_canonical(fs::absolute(in), ec);
    if (!ec && within(c, t)) refuse(in, "the input file");
  }
}


void protect_from_replacement(const fs::path& input) {
  std::error_code ec;
  fs::path p = fs::absolute(input, ec);
  if (ec) p = input;
  auto& r = registry();
  const std::lock_guard hold(r.lock);
  r.inputs.push_back(p);
}

fs::path output_folder_path(const fs::path& out) {
  fs::path t = out.lexically_normal();
  if (!t.empty() && !t.has_filename()) t = t.parent_path();  // "res/" names the folder "res"
  return t;
}

RunFolder::RunFolder(fs::path target, bool force) : target_(output_folder_path(target)), force_(force) {
  if (target.empty()) throw CaseError("no output folder given (--out DIR)");
  if (target_.empty() || target_ == "." || target_ == ".." || !target_.has_filename()) {
    throw CaseError("output folder '" + target.string() + "' must name a new folder, not the current or parent one");
  }
  const fs::path parent = target_.has_parent_path() ? target_.parent_path() : fs::path(".");
  const std::string name = target_.filename().string();
  std::error_code ec;
  // Leftovers of killed runs on this target: a staging folder, or the old result moved aside
  // between the two renames of a commit (put back when the new result never arrived).
  for (const auto& e : fs::directory_iterator(parent, ec)) {
    const std::string n = e.path().filename().string();
    const bool partial = n.rfind(name + ".partial-", 0) == 0, old = n.rfind(name + ".old-", 0) == 0;
    if (!partial && !old) continue;
    const auto pid = pid_in(std::string_view(n).substr(name.size() + (partial ? 9 : 5)));
    if (!pid || !dead(*pid) || !e.is_directory(ec)) continue;
    std::error_code gone;
    const std::string shown = (target_.parent_path() / n).string();  // as the user named the target
    if (old && !fs::exists(target_, gone)) {
      fs::rename(e.path(), target_, gone);
      if (!gone) note("put back " + target_.string() + " from " + shown + ", left by a run that was killed while replacing it");
    } else {
      fs::remove_all(e.path(), gone);
      if (!gone) note("removed " + shown + ", left by a run that was killed");
    }
  }
  if (fs::exists(target_) && !force_) {
    throw IoError("output folder " + target_.string() +
                             " exists; choose another --out or add --force to replace it");
  }
  if (fs::exists(target_) && !fs::is_directory(target_)) {
    throw IoError(target_.string() + " exists and is not a folder");
  }
  if (fs::exists(target_)) check_replaceable(target_, protected_inputs());
  fs::create_directories(parent, ec);
  if (ec) throw IoError("cannot create " + parent.string() + ": " + ec.message());
  static int counter = 0;  // several run folders in one process (sweeps) get their own staging
  staging_ = parent / (name + ".partial-" + std::to_string(::getpid()) + "-" + std::to_string(counter++));
  fs::remove_all(staging_, ec);
  fs::create_directory(staging_, ec);
  if (ec) throw IoError("cannot create " + staging_.string() + ": " + ec.message());
  auto& r = registry();
  const std::lock_guard hold(r.lock);
  r.staging.push_back(staging_);
}

RunFolder::~RunFolder() {
  auto& r = registry();
  const std::lock_guard hold(r.lock);
  r.staging.erase(std::remove(r.staging.begin(), r.staging.end(), staging_), r.staging.end());
  if (!committed_) {
    std::error_code ec;
    fs::remove_all(staging_, ec);
  }
}

void RunFolder::commit() {
  auto& r = registry();
  const std::lock_guard hold(r.lock);
  if (r.abandoned) throw IoError("interrupted: " + target_.string() + " was not written");
  std::error_code ec;
  fs::path old;
  if (fs::exists(target_)) {
    if (!force_) throw IoError("output folder " + target_.string() + " appeared during the run");
    check_replaceable(target_, r.inputs);
    old = target_.string() + ".old-" + std::to_string(::getpid());
    fs::rename(target_, old, ec);
    if (ec) throw IoError("cannot move the old " + target_.string() + " aside: " + ec.message());
  }
  fs::rename(staging_, target_, ec);
  if (ec) {
    if (!old.empty()) fs::rename(old, target_);  // put the previous result back
    throw IoError("cannot move the result into " + target_.string() + ": " + ec.message());
  }
  committed_ = true;
  r.staging.erase(std::remove(r.staging.begin(), r.staging.end(), staging_), r.staging.end());
  if (!old.empty()) fs::remove_all(old, ec);
}

void abandon_run_folders() {
  auto& r = registry();
  const std::lock_guard hold(r.lock);
  r.abandoned = true;
  std::error_code ec;
  for (const auto& s : r.staging) fs::remove_all(s, ec);
  r.staging.clear();
}

}  // namespace oxystrat
