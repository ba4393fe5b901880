// The progress line: silent when not a terminal, and only after about a second.
#include <gtest/gtest.h>

#include <sstream>

#include "cli/progress.hpp"
#include "cli/run.hpp"

using coursewarden::cli::Progress;

TEST(Progress, SilentForTheFirstSecondThenOneRewrittenLine) {
  std::ostringstream err;
  double now = 100.0;
  {
    Progress p(err, true, [&now] { return now; });
    p.step("reading the DEM");
    EXPECT_EQ(err.str(), "");  // under a second: nothing
    now = 101.4;
    p.step("simulating 8 rider classes");
    EXPECT_EQ(err.str(), "\rcoursewarden: simulating 8 rider classes (1 s)");
    now = 103.0;
    p.step("hazards");
    EXPECT_NE(err.str().find("\rcoursewarden: hazards (3 s)"), std::string::npos);
  }
  // On destruction the line is blanked so the next output starts clean.
  EXPECT_EQ(err.str().back(), '\r');
}

TEST(Progress, NothingWhenNotATerminal) {
  std::ostringstream err;
  double now = 0.0;
  Progress p(err, false, [&now] { return now; });
  now = 50.0;
  p.step("anything");
  EXPECT_EQ(err.str(), "");
  EXPECT_FALSE(Progress::for_terminal(err));  // a string stream is never the terminal
  // A whole check through the CLI writes nothing to stderr when it succeeds.
  std::ostringstream out, err2;
  const std::string sample = std::string(COURSEWARDEN_SOURCE_DIR) + "/sample_courses/ronde-orvalune";
  ASSERT_EQ(coursewarden::cli::run({"coursewarden", "check", sample + "/course.gpx", "--dem", sample + "/dem.tif"}, out, err2), 0);
  EXPECT_EQ(err2.str(), "");
}
