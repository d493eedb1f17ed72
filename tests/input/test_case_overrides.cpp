// --set KEY=VALUE overrides: they change the case as if the file said so, and errors in them name
// the --set argument instead of a file line.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <numbers>

#include "case_text.hpp"
#include "tests/round_off.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

// One multiplication per value: round-off tolerance (kRoundOff).

TEST(CaseOverride, ParseSplitsAtTheFirstEquals) {
  const auto o = parse_override(" operation.speed = 110 rpm ");
  EXPECT_EQ(o.key, "operation.speed");
  EXPECT_EQ(o.value, "110 rpm");
  EXPECT_EQ(o.raw, " operation.speed = 110 rpm ");
  EXPECT_EQ(parse_override("title=a=b").value, "a=b");
}

TEST(CaseOverride, SpeedWithUnit) {
  const auto loaded = load(CaseText(), {"operation.speed=110 rpm"});
  EXPECT_NEAR(loaded.data.operation.speed_rps, 110.0 / 60.0, kRoundOff);
  ASSERT_EQ(loaded.overrides.size(), 1u);
  EXPECT_EQ(loaded.overrides[0], "operation.speed=110 rpm");
  EXPECT_THAT(loaded.effective_text, HasSubstr("110 rpm"));
  EXPECT_EQ(loaded.source_text, kBaseCase);  // the file as given is kept as it was
}

TEST(CaseOverride, QuotedValueAsTheShellPassesIt) {
  const auto loaded = load(CaseText(), {"operation.speed=\"110 rpm\""});
  EXPECT_NEAR(loaded.data.operation.speed_rps, 110.0 / 60.0, kRoundOff);
}

// Text after a quoted value used to be kept: title became '"x" garbage' and the case passed.
TEST(CaseOverride, TrailingTextAfterAQuotedValueIsRefused) {
  for (const std::string bad : {"title=\"x\" garbage", "operation.speed=\"110 rpm\" 5", "title='x' y",
                                "feed.times=[\"0 h\"] x", "title=\"unclosed"}) {
    try {
      load(CaseText(), {bad});
      ADD_FAILURE() << bad << " was accepted";
    } catch (const CaseError& e) {
      EXPECT_THAT(e.what(), HasSubstr("--set '" + bad + "': the value"));
      EXPECT_THAT(e.what(), HasSubstr("is not one TOML value"));
    }
  }
  // Plain text without quotes is still a string.
  EXPECT_EQ(load(CaseText(), {"title=my vessel"}).data.title, "my vessel");
}

TEST(CaseOverride, ImpellerTypeByZeroBasedIndex) {
  const auto c = load(CaseText(), {"impeller.1.type=hydrofoil-up"}).data;
  EXPECT_EQ(c.impellers[0].type, ImpellerType::rushton);
  EXPECT_EQ(c.impellers[1].type, ImpellerType::hydrofoil_up);
  // The type's defaults follow the new type (input/case_vessel.cpp: 3 blades, band 0.12 D).
  EXPECT_EQ(c.impellers[1].blades, 3);
  EXPECT_NEAR(c.impellers[1].blade_height_m, 0.12 * 0.30, kRoundOff);
}

TEST(CaseOverride, GridCountAsTomlInteger) {
  const auto c = load(CaseText(), {"grid.axial=120"}).data;
  EXPECT_EQ(c.grid.axial, 120);
  EXPECT_EQ(c.grid.radial, 6);
}

TEST(CaseOverride, LaterOverridesWin) {
  const auto c = load(CaseText(), {"operation.speed=110 rpm", "operation.speed=2 rps"}).data;
  EXPECT_NEAR(c.operation.speed_rps, 2.0, kRoundOff);
}

TEST(CaseOverride, CreatesAKeyTheFileDoesNotHave) {
  const auto c = load(CaseText(), {"output.sectors=12", "impeller.0.blades=4"}).data;
  EXPECT_EQ(c.output.sectors, 12);
  EXPECT_EQ(c.impellers[0].blades, 4);
}

TEST(CaseOverride, NoEquals) {
  try {
    parse_override("operation.speed");
    ADD_FAILURE() << "accepted an argument without '='";
  } catch (const CaseError& e) {
    EXPECT_THAT(e.what(), HasSubstr("--set 'operation.speed': expected KEY=VALUE"));
  }
}

TEST(CaseOverride, EmptyKey) {
  EXPECT_THROW(parse_override("=110 rpm"), CaseError);
  EXPECT_THAT(error_of(CaseText(), {"operation..speed=1 rps"}),
              HasSubstr("--set 'operation..speed=1 rps': the key 'operation..speed' has an empty part"));
}

TEST(CaseOverride, IndexOutOfRange) {
  const auto msg = error_of(CaseText(), {"impeller.5.type=rushton"});
  EXPECT_THAT(msg, HasSubstr("--set 'impeller.5.type=rushton'"));
  EXPECT_THAT(msg, HasSubstr("'impeller.5' does not exist; the case has 2 entries (0 to 1)"));
}

TEST(CaseOverride, ListWithoutIndexIsRefused) {
  EXPECT_THAT(error_of(CaseText(), {"impeller.type=rushton"}), HasSubstr("--set 'impeller.type=rushton': "));
  EXPECT_THAT(error_of(CaseText(), {"impeller.type.x=1"}), HasSubstr("--set 'impeller.type.x=1': "));
  EXPECT_THAT(error_of(CaseText(), {"impeller.type.x=1"}), HasSubstr("is a list; give an index (0-based)"));
}

// Regression test for a fixed bug (toml_source.cpp, TomlSource::apply): a list reached without an index is reported wrongly.
//  - line 107: when the list is the last container ("impeller.type=rushton") the message is
//    "cannot set an element of a list by value", which does not say that the index is missing;
//  - line 92: deeper down ("impeller.type.x=1") the path quoted is the child, "'impeller.type' is
//    a list", because `walked` already holds the part being looked up (line 90).
// Expected in both: "'impeller' is a list; give an index (0-based)".
TEST(CaseOverride, ListWithoutIndexAsksForTheIndex) {
  EXPECT_THAT(error_of(CaseText(), {"impeller.type=rushton"}),
              HasSubstr("--set 'impeller.type=rushton': 'impeller' is a list; give an index (0-based)"));
  EXPECT_THAT(error_of(CaseText(), {"impeller.type.x=1"}),
              HasSubstr("--set 'impeller.type.x=1': 'impeller' is a list; give an index (0-based)"));
}

TEST(CaseOverride, ThroughAValueIsRefused) {
  EXPECT_THAT(error_of(CaseText(), {"vessel.diameter.inner=1 m"}), HasSubstr("--set 'vessel.diameter.inner=1 m': "));
  EXPECT_THAT(error_of(CaseText(), {"vessel.diameter.inner.x=1 m"}),
              HasSubstr("--set 'vessel.diameter.inner.x=1 m': "));
  EXPECT_THAT(error_of(CaseText(), {"vessel.diameter.inner.x=1 m"}), HasSubstr("is a value, not a table"));
}

// Regression test for a fixed bug (toml_source.cpp, TomlSource::apply): a path through a value (vessel.diameter is the string
// "1.0 m") is reported wrongly.
//  - line 107: "vessel.diameter.inner=1 m" gives "cannot set an element of a list by value",
//    although no list is involved;
//  - line 103: "vessel.diameter.inner.x=1 m" gives "'vessel.diameter.inner' is a value", naming
//    a key that does not exist (see line 90).
// Expected in both: "'vessel.diameter' is a value, not a table".
TEST(CaseOverride, ThroughAValueNamesTheValue) {
  EXPECT_THAT(error_of(CaseText(), {"vessel.diameter.inner=1 m"}),
              HasSubstr("--set 'vessel.diameter.inner=1 m': 'vessel.diameter' is a value, not a table"));
  EXPECT_THAT(error_of(CaseText(), {"vessel.diameter.inner.x=1 m"}),
              HasSubstr("--set 'vessel.diameter.inner.x=1 m': 'vessel.diameter' is a value, not a table"));
}

TEST(CaseOverride, WholeListElement) {
  EXPECT_THAT(error_of(CaseText(), {"impeller.0=1"}), HasSubstr("--set 'impeller.0=1': cannot set an element"));
}

TEST(CaseOverride, BadValueNamesTheArgument) {
  const auto msg = error_of(CaseText(), {"operation.speed=110 rpx"});
  EXPECT_THAT(msg, HasSubstr("--set 'operation.speed=110 rpx': unknown unit 'rpx'"));
  EXPECT_THAT(msg, testing::Not(HasSubstr(kCaseFile + ":")));
}

TEST(CaseOverride, OutOfRangeNamesTheArgument) {
  EXPECT_THAT(error_of(CaseText(), {"grid.axial=0"}), HasSubstr("--set 'grid.axial=0': out of range: allowed 1 to 20000"));
}

TEST(CaseOverride, GeometryErrorNamesTheArgument) {
  const auto msg = error_of(CaseText(), {"impeller.0.elevation=0.04 m"});
  EXPECT_THAT(msg, HasSubstr("--set 'impeller.0.elevation=0.04 m': the impeller blades reach down"));
}

TEST(CaseOverride, UnknownKeyNamesTheArgument) {
  const auto msg = error_of(CaseText(), {"operation.sped=110 rpm"});
  EXPECT_THAT(msg, HasSubstr("--set 'operation.sped=110 rpm': unknown key; did you mean operation.speed?"));
}

}  // namespace
}  // namespace oxystrat::test
