// Number formatting and parsing must not depend on the locale the program runs in.
#include <gtest/gtest.h>

#include <clocale>
#include <cstdlib>
#include <string>

#include "util/text.hpp"

using namespace coursewarden;

TEST(Locale, DecimalCommaRunReallyHasADecimalComma) {
  const char* lc = std::getenv("LC_ALL");
  if (!lc || std::string(lc).rfind("de_DE", 0) != 0) GTEST_SKIP() << "not the de_DE run";
  // The suite's support code adopts the environment's locale, so C functions now use ','.
  EXPECT_STREQ(std::localeconv()->decimal_point, ",");
}

TEST(Locale, FormattingAndParsingAlwaysUseAPoint) {
  EXPECT_EQ(fmt_fixed(1234.5678, 2), "1234.57");
  EXPECT_EQ(fmt_fixed(-0.0001, 2), "0.00");
  EXPECT_EQ(fmt_fixed(NAN, 1), "-");
  EXPECT_EQ(parse_number(" 2.5 ").value(), 2.5);
  EXPECT_FALSE(parse_number("2,5").has_value());
  EXPECT_FALSE(parse_number("").has_value());
  EXPECT_EQ(parse_number("+1e3").value(), 1000.0);
}

TEST(CsvField, QuotesOnlyWhenNeeded) {
  // RFC 4180, section 2: fields with commas, quotes or line breaks are quoted, quotes doubled.
  EXPECT_EQ(csv_field("plain"), "plain");
  EXPECT_EQ(csv_field("a,b"), "\"a,b\"");
  EXPECT_EQ(csv_field("say \"hi\""), "\"say \"\"hi\"\"\"");
  EXPECT_EQ(csv_field("two\nlines"), "\"two\nlines\"");
}
