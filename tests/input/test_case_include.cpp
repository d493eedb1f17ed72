// include = ["file.toml"]: [model] keys from another file (the fragment `oxystrat calibrate`
// writes), relative to the case file, as defaults the case's own keys and --set override; errors
// name the file and line they concern.
#include <unistd.h>

#include <filesystem>
#include <fstream>

#include "case_text.hpp"

namespace oxystrat::test {
namespace {

using testing::HasSubstr;
namespace fs = std::filesystem;

class CaseInclude : public testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() /
           ("oxystrat-include-" + std::string(testing::UnitTest::GetInstance()->current_test_info()->name()) + "-" +
            std::to_string(::getpid()));
    fs::remove_all(dir_);
    fs::create_directories(dir_ / "cal");
  }
  void TearDown() override {
    std::error_code ec;
    fs::remove_all(dir_, ec);
  }
  void write(const std::string& name, const std::string& text) const { std::ofstream(dir_ / name) << text; }
  // The base case with `head` before its first line and `tail` after its last, as case.toml.
  std::string case_with(const std::string& head, const std::string& tail = "") const {
    write("case.toml", head + kBaseCase + tail);
    return (dir_ / "case.toml").string();
  }
  std::string error(const std::string& path, const std::vector<Override>& o = {}) const {
    try {
      read_case_file(path, o);
    } catch (const CaseError& e) {
      return e.what();
    }
    return "no error";
  }
  fs::path dir_;
};

TEST_F(CaseInclude, IncludedModelKeysAreDefaults) {
  write("cal/calibration.toml", "# fitted\n[model]\nkla_prefactor = 0.0123\nkla_power_exponent = 0.55\n"
                                "exchange_constant = 0.02\n");
  const auto path = case_with("include = [\"cal/calibration.toml\"]\n");
  const auto loaded = read_case_file(path);
  EXPECT_DOUBLE_EQ(loaded.data.model.kla_prefactor, 0.0123);
  EXPECT_DOUBLE_EQ(loaded.data.model.kla_power_exponent, 0.55);
  EXPECT_DOUBLE_EQ(loaded.data.model.exchange_constant, 0.02);
  // The effective case is self-contained: the included keys, no include.
  EXPECT_THAT(loaded.effective_text, HasSubstr("kla_prefactor = 0.0123"));
  EXPECT_THAT(loaded.effective_text, testing::Not(HasSubstr("include")));
  // --set overrides an included key.
  const auto set = read_case_file(path, {parse_override("model.kla_prefactor=0.03")});
  EXPECT_DOUBLE_EQ(set.data.model.kla_prefactor, 0.03);
  EXPECT_DOUBLE_EQ(set.data.model.kla_power_exponent, 0.55);
}

TEST_F(CaseInclude, TheCasesOwnKeysWin) {
  write("calibration.toml", "[model]\nkla_prefactor = 0.0123\nkla_gas_exponent = 0.3\n");
  const auto path = case_with("include = [\"calibration.toml\"]\n", "\n[model]\nkla_prefactor = 0.04\n");
  // kBaseCase has no [model] table, so the one at its end is the only one.
  const auto c = read_case_file(path).data;
  EXPECT_DOUBLE_EQ(c.model.kla_prefactor, 0.04);
  EXPECT_DOUBLE_EQ(c.model.kla_gas_exponent, 0.3);
}

TEST_F(CaseInclude, ErrorsNameTheFilesAndLines) {
  const auto missing = case_with("include = [\"nowhere.toml\"]\n");
  EXPECT_THAT(error(missing), HasSubstr("case.toml:1: include = \"nowhere.toml\": cannot open"));
  EXPECT_THAT(error(case_with("include = [\"cal\"]\n")), HasSubstr("it is a folder; name the file in it"));

  write("other.toml", "[model]\nkla_prefactor = 0.02\n\n[operation]\nspeed = \"100 rpm\"\n");
  EXPECT_THAT(error(case_with("include = [\"other.toml\"]\n")),
              HasSubstr("other.toml:4: operation: an included file may hold only a [model] table"));

  write("nested.toml", "include = [\"case.toml\"]\n[model]\nkla_prefactor = 0.02\n");
  EXPECT_THAT(error(case_with("include = [\"nested.toml\"]\n")), HasSubstr("includes do not nest"));

  write("range.toml", "[model]\n\nkla_prefactor = 50.0\n");
  const auto msg = error(case_with("include = [\"range.toml\"]\n"));
  EXPECT_THAT(msg, HasSubstr("range.toml:3: model.kla_prefactor = 50.0: out of range"));

  write("typo.toml", "[model]\nkla_prefator = 0.02\n");
  EXPECT_THAT(error(case_with("include = [\"typo.toml\"]\n")), HasSubstr("typo.toml:2: model.kla_prefator"));

  write("broken.toml", "[model\n");
  EXPECT_THAT(error(case_with("include = [\"broken.toml\"]\n")), HasSubstr("broken.toml:1: not valid TOML"));

  EXPECT_THAT(error(case_with("include = 3\n")), HasSubstr("case.toml:1: include: expected a list of file names"));
  write("twice.toml", "[model]\nkla_prefactor = 0.02\n");
  EXPECT_THAT(error(case_with("include = [\"twice.toml\", \"./twice.toml\"]\n")), HasSubstr("listed twice"));
}

}  // namespace
}  // namespace oxystrat::test
