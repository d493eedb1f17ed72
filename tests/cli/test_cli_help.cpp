// --version and --help of the program and of each command. The commands are taken from the
// program's own help, so a new command is covered without touching this file.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <sstream>
#include <string>
#include <vector>

#include "cli_runner.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;
using CliHelp = CliTest;

//! Command names listed under "Subcommands:" in the program help (CLI11 layout: two-space indent,
//! name, then the description).
std::vector<std::string> commands_in_help(const std::string& help) {
  std::vector<std::string> names;
  std::istringstream in(help);
  std::string line;
  bool in_list = false;
  while (std::getline(in, line)) {
    if (line.rfind("Subcommands:", 0) == 0) {
      in_list = true;
      continue;
    }
    if (!in_list) continue;
    if (line.empty() || line[0] != ' ') break;
    std::istringstream words(line);
    std::string name;
    if (words >> name) names.push_back(name);
  }
  return names;
}

TEST_F(CliHelp, Version) {
  const auto r = oxystrat({"--version"});
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_EQ(r.out, std::string("oxystrat ") + OXYSTRAT_EXPECTED_VERSION + "\n");
}

TEST_F(CliHelp, ProgramHelpListsTheCommands) {
  const auto r = oxystrat({"--help"});
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_THAT(r.out, HasSubstr("Usage:"));
  EXPECT_THAT(r.out, HasSubstr("--version"));
  const auto commands = commands_in_help(r.out);
  EXPECT_THAT(commands, testing::IsSupersetOf({"run", "check"}));
}

TEST_F(CliHelp, EveryCommandHasHelp) {
  const auto commands = commands_in_help(oxystrat({"--help"}).out);
  ASSERT_FALSE(commands.empty());
  for (const auto& command : commands) {
    SCOPED_TRACE(command);
    const auto r = oxystrat({command, "--help"});
    EXPECT_EQ(r.exit_code, 0) << r.err;
    EXPECT_THAT(r.out, HasSubstr("Usage:"));
    EXPECT_THAT(r.out, HasSubstr(command));
    if (command == "validate" || command == "kla-fit") continue;  // these work on no case file
    EXPECT_THAT(r.out, HasSubstr("CASE"));   // every other command works on a case
    EXPECT_THAT(r.out, HasSubstr("--set"));  // ... with overrides
  }
  EXPECT_TRUE(work_listing().empty());
}

TEST_F(CliHelp, RunHelpListsItsOutputOptions) {
  const auto r = oxystrat({"run", "--help"});
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_THAT(r.out, HasSubstr("--out"));
  EXPECT_THAT(r.out, HasSubstr("--force"));
}

TEST_F(CliHelp, CheckWritesNothingSoHasNoOutputOption) {
  const auto r = oxystrat({"check", "--help"});
  EXPECT_EQ(r.exit_code, 0);
  EXPECT_THAT(r.out, testing::Not(HasSubstr("--out")));
}

}  // namespace
}  // namespace oxystrat::test
