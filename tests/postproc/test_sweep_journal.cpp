// The sweep journal: points round-trip exactly, every rank keeps its own file, a resumed sweep
// reads them all (whatever the rank count of the run that wrote them), a line cut short by an
// interruption is skipped and the next record starts on a line of its own.
#include "postproc/io/sweep_journal.hpp"

#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <fstream>

#include "input/errors.hpp"
#include "temp_folder.hpp"

namespace oxystrat::test {
namespace {

namespace fs = std::filesystem;

PointResult point(double v) {
  PointResult r;
  r.ok = true;
  r.values.push_back({"do_min", "mol/m3", v, "DO min", "mmol/L", 1.0});
  return r;
}

TEST(SweepJournal, EveryRanksFileIsReadOnResume) {
  TempFolder tmp;
  const std::string target = (tmp / "out").string();
  SweepJournal rank0(target, "sig", 0), rank1(target, "sig", 1);
  rank0.open(false, 2);
  rank1.open(false, 2);
  rank0.record(0, point(0.1));
  rank1.record(1, point(0.2));
  rank1.record(3, point(1.0 / 3.0));
  EXPECT_EQ(rank0.path(), target + ".journal.csv");
  EXPECT_EQ(rank1.path(), target + ".journal-1.csv");
  // A single process resuming sees all three points, values exact.
  const auto done = SweepJournal(target, "sig", 0).load();
  ASSERT_EQ(done.size(), 3u);
  EXPECT_EQ(done.at(3).values.at(0).value, 1.0 / 3.0);
  // Rank 0 of a fresh single-process run removes the other rank's file.
  SweepJournal fresh(target, "sig", 0);
  fresh.open(false, 1);
  EXPECT_FALSE(fs::exists(rank1.path()));
  EXPECT_TRUE(fresh.load().empty());
}

TEST(SweepJournal, AnotherSweepsJournalIsRefused) {
  TempFolder tmp;
  const std::string target = (tmp / "out").string();
  SweepJournal a(target, "one", 0);
  a.open(false);
  a.record(0, point(1.0));
  EXPECT_THROW(SweepJournal(target, "two", 0).load(), CaseError);
}

TEST(SweepJournal, ALineCutShortIsSkippedAndTheNextStartsAfresh) {
  TempFolder tmp;
  const std::string target = (tmp / "out").string();
  SweepJournal j(target, "sig", 0);
  j.open(false);
  j.record(0, point(1.0));
  { std::ofstream(j.path(), std::ios::app) << "1\t1\t0\t\tdo_min|mmol/L|DO min|0.5"; }  // killed mid-line
  SweepJournal again(target, "sig", 0);
  EXPECT_EQ(again.load().size(), 1u);
  again.open(true);
  again.record(2, point(2.0));
  const auto done = again.load();
  ASSERT_EQ(done.size(), 2u);
  EXPECT_EQ(done.at(2).values.at(0).value, 2.0);
}

TEST(SweepJournal, SiValueAndDisplayUnitRoundTrip) {
  // A journal holds SI with the display unit beside it (format 2.0): resuming loses neither.
  PointResult r;
  r.ok = true;
  r.values.push_back({"power_gassed", "W", 2345.678901234567, "P gassed", "kW", 1e-3});
  size_t index = 0;
  PointResult back;
  ASSERT_TRUE(decode_point(encode_point(7, r), index, back));
  EXPECT_EQ(index, 7u);
  ASSERT_EQ(back.values.size(), 1u);
  const auto& v = back.values[0];
  EXPECT_EQ(v.unit, "W");
  EXPECT_EQ(v.value, 2345.678901234567);  // %.17g: exact
  EXPECT_EQ(v.display_unit, "kW");
  EXPECT_EQ(v.display_per_si, 1e-3);
  EXPECT_EQ(v.display(), 2345.678901234567 * 1e-3);
}

}  // namespace
}  // namespace oxystrat::test
