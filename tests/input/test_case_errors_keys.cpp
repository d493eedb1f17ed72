// Errors about keys: unknown (with a suggestion), missing, wrong type, not TOML at all.
// Each message must name the file and line (where a line exists), the key, and what was expected.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "case_text.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

// A missing key has no line of its own: the message starts with the file name (and may add the
// line of the table the key belongs in), then names the key.
testing::Matcher<const std::string&> MissingKey(const std::string& key_and_detail) {
  return testing::AllOf(testing::StartsWith(kCaseFile), HasSubstr(": missing key " + key_and_detail));
}

TEST(CaseUnknownKey, MisspelledKeyGetsASuggestion) {
  const CaseText c = CaseText().insert_after("baffles = 4", "baffel_width = \"0.1 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("baffel_width") + ": vessel.baffel_width = \"0.1 m\""));
  EXPECT_THAT(msg, HasSubstr("unknown key; did you mean vessel.baffle_width?"));
}

TEST(CaseUnknownKey, FarFromAnyKeyHasNoSuggestion) {
  const CaseText c = CaseText().insert_after("speed = \"150 rpm\"", "colour = \"blue\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("colour") + ": operation.colour"));
  EXPECT_THAT(msg, HasSubstr("unknown key"));
  EXPECT_THAT(msg, testing::Not(HasSubstr("did you mean")));
}

TEST(CaseUnknownKey, UnknownTableIsReported) {
  const CaseText c = CaseText().insert_after("axial = 12", "[grids]\nradial = 3");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("[grids]") + ": grids"));
  EXPECT_THAT(msg, HasSubstr("unknown key; did you mean grid?"));
}

TEST(CaseUnknownKey, InsideAnImpellerNamesTheElement) {
  const CaseText c = CaseText().insert_after("elevation = \"1.0 m\"", "blade_hieght = \"0.05 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("blade_hieght") + ": impeller.1.blade_hieght = \"0.05 m\""));
  EXPECT_THAT(msg, HasSubstr("unknown key; did you mean"));
  EXPECT_THAT(msg, HasSubstr("blade_height"));
}

// Regression test for a fixed bug (toml_source.cpp:290-299, walk_unknown): the suggestion is built from the generic key
// pattern, so the user is told "did you mean impeller.#.blade_height?" — '#' is not a valid key
// part. Expected: the real path of the element, "impeller.1.blade_height".
TEST(CaseUnknownKey, SuggestionInsideAListUsesTheRealIndex) {
  const CaseText c = CaseText().insert_after("elevation = \"1.0 m\"", "blade_hieght = \"0.05 m\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr("did you mean impeller.1.blade_height?"));
  EXPECT_THAT(msg, testing::Not(HasSubstr("#")));
}

TEST(CaseMissingKey, VesselDiameter) {
  const auto msg = error_of(CaseText().remove_line("diameter = \"1.0 m\""));
  EXPECT_THAT(msg, MissingKey("vessel.diameter"));
  EXPECT_THAT(msg, HasSubstr("diameter = \"3.2 m\""));  // the example
  EXPECT_THAT(msg, HasSubstr("0.05 m to 20 m"));        // the range
}

TEST(CaseMissingKey, VesselTable) {
  const CaseText c(std::string("title = \"x\"\n[operation]\nspeed = \"1 rpm\"\n"));
  EXPECT_THAT(error_of(c), MissingKey("vessel (the [vessel] table)"));
}

TEST(CaseMissingKey, LiquidHeightOrWorkingVolume) {
  const auto msg = error_of(CaseText().remove_line("liquid_height ="));
  EXPECT_THAT(msg, MissingKey("vessel.liquid_height"));
  EXPECT_THAT(msg, HasSubstr("or vessel.working_volume"));
}

TEST(CaseMissingKey, ImpellerTables) {
  CaseText c;
  c.replace("[[impeller]]\ntype = \"rushton\"\ndiameter = \"0.35 m\"\nelevation = \"0.4 m\"\n", "");
  c.replace("[[impeller]]\ntype = \"pitched-blade-down\"\ndiameter = \"0.30 m\"\nelevation = \"1.0 m\"\n", "");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, MissingKey("impeller"));
  EXPECT_THAT(msg, HasSubstr("[[impeller]]"));
  EXPECT_THAT(msg, HasSubstr("bottom to top"));
}

TEST(CaseMissingKey, ImpellerTypeListsTheChoices) {
  const auto msg = error_of(CaseText().remove_line("type = \"pitched-blade-down\""));
  EXPECT_THAT(msg, MissingKey("impeller.1.type"));
  EXPECT_THAT(msg, HasSubstr("rushton | pitched-blade-down"));
}

TEST(CaseMissingKey, ImpellerDiameterAndElevation) {
  EXPECT_THAT(error_of(CaseText().remove_line("diameter = \"0.35 m\"")),
              MissingKey("impeller.0.diameter"));
  EXPECT_THAT(error_of(CaseText().remove_line("elevation = \"1.0 m\"")),
              MissingKey("impeller.1.elevation"));
}

TEST(CaseMissingKey, SpargerKeys) {
  EXPECT_THAT(error_of(CaseText().remove_line("type = \"ring\"")),
              MissingKey("sparger.type (ring | pipe | porous)"));
  EXPECT_THAT(error_of(CaseText().remove_line("elevation = \"0.25 m\"")),
              MissingKey("sparger.elevation"));
  EXPECT_THAT(error_of(CaseText().remove_line("diameter = \"0.28 m\"")),
              MissingKey("sparger.diameter"));
}

TEST(CaseMissingKey, OperationAndSpeed) {
  EXPECT_THAT(error_of(CaseText().remove_line("speed = \"150 rpm\"")),
              MissingKey("operation.speed (e.g. speed = \"120 rpm\""));
  CaseText no_operation;
  no_operation.replace("[operation]\nspeed = \"150 rpm\"\ngas_flow = \"0.5 vvm\"\n", "");
  EXPECT_THAT(error_of(no_operation), MissingKey("operation"));
}

TEST(CaseMissingKey, CultureKeys) {
  EXPECT_THAT(error_of(CaseText().remove_line("biomass =")), MissingKey("culture.biomass"));
  EXPECT_THAT(error_of(CaseText().remove_line("q_o2_max =")), MissingKey("culture.q_o2_max"));
  EXPECT_THAT(error_of(CaseText().remove_line("k_o2 =")),
              MissingKey("culture.k_o2 (e.g. k_o2 = \"0.003 mmol/L\")"));
  EXPECT_THAT(error_of(CaseText().remove_line("critical_do =")),
              MissingKey("culture.critical_do"));
}

TEST(CaseWrongType, NumberWhereAWholeNumberIsExpected) {
  const CaseText c = CaseText().replace("baffles = 4", "baffles = \"4\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("baffles =") + ": vessel.baffles = \"4\""));
  EXPECT_THAT(msg, HasSubstr("must be a whole number from 0 to 8"));
  EXPECT_THAT(error_of(CaseText().replace("axial = 12", "axial = 12.5")),
              HasSubstr("must be a whole number from 1 to 20000"));
}

TEST(CaseWrongType, StringExpected) {
  const CaseText c = CaseText().replace("title = \"test vessel\"", "title = 5");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("title") + ": title = 5: must be a string"));
}

TEST(CaseWrongType, UnknownChoice) {
  const CaseText c = CaseText().replace("bottom = \"ellipsoidal\"", "bottom = \"conical\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("bottom") + ": vessel.bottom = \"conical\""));
  EXPECT_THAT(msg, HasSubstr("expected one of flat | ellipsoidal | hemispherical"));
  const CaseText t = CaseText().replace("type = \"rushton\"", "type = \"paddle\"");
  EXPECT_THAT(error_of(t), HasSubstr(t.where("paddle") + ": impeller.0.type = \"paddle\": unknown value"));
}

TEST(CaseWrongType, ImpellerMustBeAListOfTables) {
  CaseText c;
  c.replace("[[impeller]]\ntype = \"pitched-blade-down\"\ndiameter = \"0.30 m\"\nelevation = \"1.0 m\"\n", "");
  c.replace("[[impeller]]", "[impeller]");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("[impeller]") + ": impeller"));
  EXPECT_THAT(msg, HasSubstr("must be a list of tables, written [[impeller]]"));
}

TEST(CaseWrongType, TooManyImpellers) {
  std::string text = kBaseCase;
  for (int i = 0; i < 11; ++i) text += "[[impeller]]\ntype = \"rushton\"\ndiameter = \"0.3 m\"\nelevation = \"1.2 m\"\n";
  EXPECT_THAT(error_of(CaseText(text)), HasSubstr("13 impellers; at most 12 are supported"));
}

TEST(CaseWrongType, UnknownIon) {
  const CaseText c = CaseText().insert_after("viscosity =", "[broth.ions]\n\"Xx+\" = \"0.1 mol/L\"");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("\"Xx+\"") + ": broth.ions.Xx+"));
  EXPECT_THAT(msg, HasSubstr("unknown ion; known ions are"));
}

TEST(CaseNotToml, ReportsTheLine) {
  const CaseText c = CaseText().replace("baffles = 4", "baffles = = 4");
  const auto msg = error_of(c);
  EXPECT_THAT(msg, HasSubstr(c.where("baffles") + ": not valid TOML"));
}

}  // namespace
}  // namespace oxystrat::test
