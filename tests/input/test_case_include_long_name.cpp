// Regression (found while fuzzing the reader, fuzz/RESULTS.md): an include whose file name is too
// long for the system (ENAMETOOLONG) used to escape as std::filesystem::filesystem_error from the
// folder test of the error message, instead of the CaseError "cannot open".
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <string>

#include "case_text.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;

TEST(CaseIncludeLongName, FileNameTooLongIsAnInputError) {
  // 300 characters in one path component: over NAME_MAX (255) on Linux file systems.
  const std::string name = "fragments/model." + std::string(300, '|') + ".toml";
  const auto msg = error_of(CaseText("include = [\"" + name + "\"]\n" + kBaseCase), {});
  EXPECT_THAT(msg, HasSubstr("include = \"" + name + "\": cannot open"));
  EXPECT_THAT(msg, HasSubstr("relative path is taken from the case file's folder"));
}

TEST(CaseIncludeLongName, PathTooLongIsAnInputErrorToo) {
  // Many short components, over PATH_MAX (4096) in all.
  std::string name;
  for (int i = 0; i < 900; ++i) name += "abcd/";
  name += "model.toml";
  EXPECT_THAT(error_of(CaseText("include = [\"" + name + "\"]\n" + kBaseCase), {}), HasSubstr("cannot open"));
}

}  // namespace
}  // namespace oxystrat::test
