// Reading DO traces: units, comments and separators; errors that name the file, line, column and
// what was expected; the DO values and uptake rates given beside a trace.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cstdio>
#include <string>
#include <vector>

#include "input/errors.hpp"
#include "solver/fit/do_trace.hpp"

namespace oxystrat {
namespace {

using ::testing::HasSubstr;

std::string rows(int n, const std::string& sep = ",") {
  std::string s;
  for (int i = 0; i < n; ++i) s += std::to_string(i) + sep + std::to_string(10 + 8 * i) + "\n";
  return s;
}

TEST(KlaFitTrace, ReadsUnitsCommentsAndSeparators) {
  const auto a = parse_do_trace("# exported trace\n\n\"time [min]\";\"DO [mg/L]\"\n" + [] {
    std::string s;
    for (int i = 0; i < 10; ++i) s += std::to_string(i) + ",5;6,4\n";
    return s;
  }(), "a.csv");
  ASSERT_EQ(a.time_s.size(), 10u);
  EXPECT_EQ(a.scale, DoScale::concentration);
  EXPECT_DOUBLE_EQ(a.time_s[1], 90.0);  // 1.5 min
  // 6.4 mg/L / 31.9988 g/mol = 0.2000075 mol/m3
  EXPECT_NEAR(a.value[0], 6.4e-3 / 31.9988e-3, 1e-15);
  EXPECT_EQ(a.line[0], 4);

  const auto b = parse_do_trace("t h,DO mmol/L\n" + rows(10), "b.csv");
  EXPECT_DOUBLE_EQ(b.time_s[2], 7200.0);
  EXPECT_DOUBLE_EQ(b.value[1], 18.0);

  const auto c = parse_do_trace("\xEF\xBB\xBFtime (s),DO [% air saturation]\n" + rows(12), "c.csv");
  EXPECT_EQ(c.scale, DoScale::saturation);
  EXPECT_DOUBLE_EQ(c.value[0], 0.10);
  EXPECT_EQ(c.do_unit, "% air saturation");

  const auto d = parse_do_trace("time [s],DO [mol/m3]\n" + rows(10), "d.csv");
  EXPECT_DOUBLE_EQ(d.value[0], 10.0);
}

void expect_trace_error(const std::string& text, const std::vector<std::string>& parts) {
  try {
    parse_do_trace(text, "trace.csv");
    FAIL() << "accepted:\n" << text;
  } catch (const CaseError& e) {
    for (const auto& p : parts) EXPECT_THAT(e.what(), HasSubstr(p));
  }
}

TEST(KlaFitTrace, ClockTimesOfALoggerAreSecondsFromTheFirstRow) {
  // A logger's export: clock times, no time unit; one trace crosses midnight without a date,
  // the other with one.
  std::string bare = "time,DO [%]\n", dated = "timestamp;DO [%]\n";
  for (int i = 0; i < 12; ++i) {
    const int t = 23 * 3600 + 59 * 60 + 30 + 10 * i, day = t / 86400, s = t % 86400;
    const auto hms = [](int x) {
      char b[16];
      std::snprintf(b, sizeof b, "%02d:%02d:%02d", x / 3600, x % 3600 / 60, x % 60);
      return std::string(b);
    };
    bare += hms(s) + "," + std::to_string(10 + 5 * i) + "\n";
    dated += std::string(day == 0 ? "2026-12-05 " : "2026-12-06T") + hms(s) + ";" + std::to_string(10 + 5 * i) + "\n";
  }
  for (const auto& text : {bare, dated}) {
    const auto tr = parse_do_trace(text, "logger.csv");
    ASSERT_EQ(tr.time_s.size(), 12u);
    for (size_t i = 0; i < tr.time_s.size(); ++i) EXPECT_DOUBLE_EQ(tr.time_s[i], 10.0 * static_cast<double>(i));
  }
  expect_trace_error("time,DO [%]\n10:00:00,5\n10:00:10,6\nlater,7\n" + rows(10),
                     {"trace.csv:4", "'later' is not a clock time like the first row's ('10:00:00'"});
}

TEST(KlaFitTrace, ErrorsNameFileLineColumnAndExpectation) {
  expect_trace_error("# c\ntime,DO [%]\n" + rows(10), {"trace.csv:2:", "column 1 'time'", "missing unit", "s, min or h"});
  expect_trace_error("time [s],DO\n" + rows(10), {"trace.csv:1:", "column 2 'DO'", "missing unit", "mg/L"});
  expect_trace_error("time [s],DO [ppm]\n" + rows(10), {"trace.csv:1:", "unknown DO unit 'ppm'", "% air saturation"});
  expect_trace_error("time [d],DO [%]\n" + rows(10), {"unknown time unit 'd'", "s, min or h"});
  expect_trace_error("time [s],DO [%]\n" + rows(4) + "4,abc\n" + rows(6),
                     {"trace.csv:6:", "column 2 'DO [%]'", "'abc' is not a number", "DO in %"});
  expect_trace_error("time [s],DO [%]\n1,2\nx1,3\n", {"trace.csv:3:", "column 1 'time [s]'", "'x1' is not a number"});
  expect_trace_error("time [s],DO [%]\n" + rows(5), {"trace.csv:", "too few points: 5 rows", "at least 10"});
  expect_trace_error("time [s],DO [%]\n0,1\n1,2\n1,3\n", {"trace.csv:4:", "not after the previous row's (line 3)"});
  expect_trace_error("time [s],DO [%]\n0,1,2\n", {"trace.csv:2:", "3 cells; the header has 2 columns"});
  expect_trace_error("time [s],DO [%],T [degC]\n", {"trace.csv:1:", "header has 3 columns"});
  expect_trace_error("0,1\n1,2\n", {"trace.csv:1:", "expected a header row"});
  expect_trace_error("# only comments\n", {"trace.csv: no header row"});
}

TEST(KlaFitTrace, UptakeAndSaturationUnits) {
  EXPECT_NEAR(parse_uptake_rate("36 mmol/L/h", DoScale::concentration, "--our"), 0.01, 1e-15);
  EXPECT_NEAR(parse_uptake_rate("0.01 mol/(m3 s)", DoScale::concentration, "--our"), 0.01, 1e-15);
  EXPECT_NEAR(parse_uptake_rate("360 %/h", DoScale::saturation, "--our"), 1e-3, 1e-15);
  EXPECT_NEAR(parse_do_value("100 %", DoScale::saturation, "--saturation"), 1.0, 1e-15);
  EXPECT_NEAR(parse_do_value("0.21 mmol/L", DoScale::concentration, "--saturation"), 0.21, 1e-15);
  auto message = [](auto f) {
    try {
      f();
    } catch (const CaseError& e) {
      return std::string(e.what());
    }
    return std::string("no error");
  };
  EXPECT_THAT(message([] { parse_uptake_rate("20", DoScale::concentration, "--our"); }), HasSubstr("--our '20': missing unit"));
  EXPECT_THAT(message([] { parse_uptake_rate("20 mmol/L/h", DoScale::saturation, "--our"); }), HasSubstr("%/h"));
  EXPECT_THAT(message([] { parse_uptake_rate("-2 mmol/L/h", DoScale::concentration, "--our"); }), HasSubstr("negative"));
  EXPECT_THAT(message([] { parse_do_value("100 %", DoScale::concentration, "--saturation"); }),
              HasSubstr("the trace is a concentration"));
  EXPECT_THAT(message([] { parse_do_value("7 mg/L", DoScale::saturation, "--saturation"); }),
              HasSubstr("the trace is in % air saturation"));
}

}  // namespace
}  // namespace oxystrat
