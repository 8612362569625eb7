#include "core/row_parser.h"

#include <gtest/gtest.h>

#include <array>
#include <string>
#include <vector>

namespace plateau {
namespace {

struct Collected : RowSink {
  std::vector<std::string> names;
  std::vector<std::vector<double>> rows;
  std::vector<std::uint64_t> row_lines;
  std::vector<std::string> bad;
  void OnColumns(const std::vector<std::string>& n) override { names = n; }
  void OnRow(std::uint64_t line, const double* values) override {
    rows.emplace_back(values, values + names.size());
    row_lines.push_back(line);
  }
  void OnBadLine(std::uint64_t line, std::string_view reason) override {
    bad.push_back(std::to_string(line) + ": " + std::string(reason));
  }
};

Collected Parse(const std::string& text) {
  RowParser parser;
  Collected sink;
  parser.Feed(text, sink);
  return sink;
}

TEST(RowParser, AnySeparatorAndHeaderFromTheLastCommentLine) {
  const Collected c = Parse(
      "# channel probe, invented case\n"
      "# time  u  v\n"
      "#\n"
      "0.1 1.5 -2\n"
      "0.2,1.25,-1\n"
      "0.3;1e-1;+3\n"
      "0.4\t2.0D+00\t1\n");
  EXPECT_EQ(c.names, (std::vector<std::string>{"time", "u", "v"}));
  ASSERT_EQ(c.rows.size(), 4u);
  EXPECT_EQ(c.rows[1], (std::vector<double>{0.2, 1.25, -1}));
  EXPECT_EQ(c.rows[2], (std::vector<double>{0.3, 0.1, 3}));
  EXPECT_EQ(c.rows[3], (std::vector<double>{0.4, 2.0, 1}));  // Fortran D exponent
  EXPECT_TRUE(c.bad.empty());
}

TEST(RowParser, CsvFirstLineOfNamesWithoutHash) {
  const Collected c = Parse("t,Cd,Cl\r\n0,1.2,0.1\r\n1,1.3,-0.1\r\n");
  EXPECT_EQ(c.names, (std::vector<std::string>{"t", "Cd", "Cl"}));
  EXPECT_EQ(c.rows.size(), 2u);
}

TEST(RowParser, VectorGroupsExpandAndTakeComponentNames) {
  const Collected c = Parse("# Time U p\n0.5 (1 2 3) 7\n");
  EXPECT_EQ(c.names, (std::vector<std::string>{"Time", "U.x", "U.y", "U.z", "p"}));
  EXPECT_EQ(c.rows[0], (std::vector<double>{0.5, 1, 2, 3, 7}));
  const Collected named = Parse("# t (ux uy uz)\n0.5 (1 2 3)\n");
  EXPECT_EQ(named.names, (std::vector<std::string>{"t", "ux", "uy", "uz"}));
}

TEST(RowParser, SymmetricTensorGroupsTakeTheirSixComponents) {
  const Collected c = Parse("# t R\n0.5 (1 2 3 4 5 6)\n");
  EXPECT_EQ(c.names,
            (std::vector<std::string>{"t", "R.xx", "R.xy", "R.xz", "R.yy", "R.yz", "R.zz"}));
}

// The probe layout: a location line per probe, the probe-number list, a line naming the time
// column only, then the time and one (x y z) group per probe. Our own invented numbers.
constexpr const char* kVectorProbes =
    "# Probe 0 (2.05 0.0048 1.0333)\n"
    "# Probe 1 (2.05 0.0120 1.0333)\n"
    "# Probe 2 (2.05 0.0310 1.0333)\n"
    "#           Probe             0             1             2\n"
    "#            Time\n"
    "0.002   (0.41 0.002 -0.01)   (0.63 0.004 0.02)   (0.80 -0.003 0.00)\n"
    "0.004   (0.42 0.001 -0.02)   (0.64 0.005 0.01)   (0.81 -0.002 0.01)\n";

TEST(RowParser, ProbeHeaderNamesEachProbeAndComponentAndKeepsLocations) {
  RowParser parser;
  parser.set_field_name("U");
  Collected c;
  parser.Feed(kVectorProbes, c);
  EXPECT_EQ(c.names, (std::vector<std::string>{"Time", "U[0].x", "U[0].y", "U[0].z", "U[1].x",
                                               "U[1].y", "U[1].z", "U[2].x", "U[2].y",
                                               "U[2].z"}));
  ASSERT_EQ(c.rows.size(), 2u);
  EXPECT_EQ(c.rows[1][4], 0.64);
  ASSERT_EQ(parser.probes().size(), 3u);
  EXPECT_EQ(parser.probes()[1].id, 1);
  EXPECT_EQ(parser.probes()[1].position, (std::array<double, 3>{2.05, 0.0120, 1.0333}));
  EXPECT_EQ(parser.probes()[2].position[1], 0.0310);
  EXPECT_TRUE(c.bad.empty());
}

TEST(RowParser, ScalarProbesAreNamedByProbeNumber) {
  RowParser parser;
  parser.set_field_name("p");
  Collected c;
  parser.Feed(
      "# Probe 4 (0.5 0.01 0)\n# Probe 7 (0.5 0.02 0)\n#  Probe  4  7\n#  Time\n"
      "0.1  -1.5e-02  3.25e-03\n",
      c);
  EXPECT_EQ(c.names, (std::vector<std::string>{"Time", "p[4]", "p[7]"}));
  ASSERT_EQ(parser.probes().size(), 2u);
  EXPECT_EQ(parser.probes()[1].id, 7);
  EXPECT_EQ(parser.probes()[1].position[1], 0.02);
}

TEST(RowParser, ProbeListWithoutATimeLineNamesTheTimeColumnTime) {
  RowParser parser;
  parser.set_field_name("T");
  Collected c;
  parser.Feed("# Probe 0 (0 0 0)\n# Probe 1 (0 1 0)\n# Probe 0 1\n0.1 300 301\n", c);
  EXPECT_EQ(c.names, (std::vector<std::string>{"Time", "T[0]", "T[1]"}));
}

TEST(RowParser, ProbeHeaderThatDoesNotFitTheRowsFallsBackToPlainNames) {
  RowParser parser;
  Collected c;
  parser.Feed("# Probe 0 (0 0 0)\n# Probe 1 (0 1 0)\n# Time\n0.1 300 301 302\n", c);
  EXPECT_EQ(c.names, (std::vector<std::string>{"col1", "col2", "col3", "col4"}));
  EXPECT_TRUE(parser.probes().empty());
}

// Found by fuzzing: a "time" line that reads like a probe column gave two columns one name.
TEST(RowParser, ProbeHeaderThatWouldRepeatAColumnNameFallsBackToPlainNames) {
  RowParser parser;
  parser.set_field_name("U");
  Collected c;
  parser.Feed("# Probe 4 (0 0.01 0)\n# Probe 7 (0 0.02 0)\n#  Probe  4  7\n#  U[7]\n0.1 1 2\n", c);
  EXPECT_EQ(c.names, (std::vector<std::string>{"col1", "col2", "col3"}));
  RowParser repeated;
  Collected r;
  repeated.Feed("# Probe 1 (0 0 0)\n# Probe 1 (0 1 0)\n# Time\n0.1 1 2\n", r);
  EXPECT_EQ(r.names, (std::vector<std::string>{"col1", "col2", "col3"}));
}

// Found by fuzzing: an empty group `()` in the first row left a probe without a column.
TEST(RowParser, ProbeRowWithAnEmptyGroupIsNotTakenForTheProbeLayout) {
  RowParser parser;
  parser.set_field_name("U");
  Collected c;
  parser.Feed("# Probe 0 (0 0 0)\n# Probe 1 (0 1 0)\n#  Probe 0 1\n#  Time\n0.1 () 2.5\n", c);
  EXPECT_EQ(c.names, (std::vector<std::string>{"col1", "col2"}));
  EXPECT_TRUE(parser.probes().empty());
}

TEST(RowParser, ProbesWithoutLocationsCompareEqualAndAMovedProbeDoesNot) {
  RowParser a, b, moved;
  Collected ca, cb, cm;
  a.Feed("# Probe 0 1\n# Time\n0.1 1 2\n", ca);  // numbers, no locations: NaN coordinates
  b.Feed("# Probe 0 1\n# Time\n0.2 3 4\n", cb);
  EXPECT_TRUE(SameProbes(a.probes(), b.probes()));
  moved.Feed("# Probe 0 (0 0 0)\n# Probe 1 (0 1 0)\n# Time\n0.1 1 2\n", cm);
  RowParser same;
  Collected cs;
  same.Feed("# Probe 0 (0 0 0)\n# Probe 1 (0 2 0)\n# Time\n0.1 1 2\n", cs);
  EXPECT_EQ(cm.names, cs.names);
  EXPECT_FALSE(SameProbes(moved.probes(), same.probes()));
  EXPECT_FALSE(SameProbes(a.probes(), moved.probes()));
}

TEST(RowParser, SurfaceAverageHeaderNamesTheThreeComponentsOfItsOneField) {
  const Collected c = Parse(
      "# Region type : patch lowerWall\n"
      "# Faces       : 1200\n"
      "# Area        : 8.000000e+00\n"
      "# Time        \tareaAverage(wallShearStress)\n"
      "0.002\t(-2.813000e-04 1.250000e-07 -3.500000e-08)\n");
  EXPECT_EQ(c.names,
            (std::vector<std::string>{"Time", "areaAverage(wallShearStress).x",
                                      "areaAverage(wallShearStress).y",
                                      "areaAverage(wallShearStress).z"}));
  ASSERT_EQ(c.rows.size(), 1u);
  EXPECT_EQ(c.rows[0][1], -2.813e-04);
}

TEST(RowParser, NestedCallsInAHeaderNameStayOneName) {
  const Collected c = Parse("# Time max(mag(U)) volAverage(p)\n1 2 3\n");
  EXPECT_EQ(c.names, (std::vector<std::string>{"Time", "max(mag(U))", "volAverage(p)"}));
}

TEST(RowParser, DefaultNamesWhenNoHeaderFits) {
  const Collected c = Parse("# a comment that is not a header\n1 2 3\n");
  EXPECT_EQ(c.names, (std::vector<std::string>{"col1", "col2", "col3"}));
}

TEST(RowParser, BadLinesAreSkippedCountedAndSayWhy) {
  RowParser parser;
  Collected c;
  parser.Feed("# t u\n0 1\n1 abc\n2 nan\n3 1 2\n4 inf\n5 1e999\n6 2\n", c);
  EXPECT_EQ(c.rows.size(), 2u);
  EXPECT_EQ(parser.bad_lines(), 5u);
  ASSERT_EQ(c.bad.size(), 5u);
  EXPECT_EQ(c.bad[0], "3: value 2 (u): 'abc' is not a number");
  EXPECT_EQ(c.bad[1], "4: value 2 (u): 'nan' is not a finite number");
  EXPECT_EQ(c.bad[2], "5: expected 2 values, found 3");
  EXPECT_EQ(c.bad[3], "6: value 2 (u): 'inf' is not a finite number");
  EXPECT_EQ(c.bad[4], "7: value 2 (u): '1e999' is out of the range of a double");
  EXPECT_EQ(c.row_lines, (std::vector<std::uint64_t>{2, 8}));
}

TEST(RowParser, PartialLastLineWaitsForItsNewline) {
  RowParser parser;
  Collected c;
  parser.Feed("# t u\n0 1\n1 2", c);
  EXPECT_EQ(c.rows.size(), 1u);
  EXPECT_EQ(parser.pending_bytes(), 3u);
  EXPECT_EQ(parser.consumed_bytes(), 10u);
  parser.Feed(".5\n", c);
  ASSERT_EQ(c.rows.size(), 2u);
  EXPECT_EQ(c.rows[1], (std::vector<double>{1, 2.5}));
  EXPECT_EQ(parser.consumed_bytes(), 16u);
}

TEST(RowParser, ByteByByteFeedingGivesTheSameRows) {
  const std::string text = "# t u v\n0 1 2\n\n1,(2 3)\n# mid comment\n2 3 4\n";
  const Collected whole = Parse(text);
  RowParser parser;
  Collected pieces;
  for (char ch : text) parser.Feed(std::string_view(&ch, 1), pieces);
  EXPECT_EQ(pieces.rows, whole.rows);
  EXPECT_EQ(pieces.row_lines, whole.row_lines);
  EXPECT_EQ(parser.consumed_bytes(), text.size());
}

TEST(RowParser, EndlessLineIsBoundedAndSkipped) {
  RowParser parser;
  Collected c;
  parser.Feed("# t u\n0 1\n", c);
  const std::string junk(1 << 20, 'x');
  for (int i = 0; i < 5; ++i) parser.Feed(junk, c);
  EXPECT_LE(parser.pending_bytes(), 5u << 20);
  parser.Feed("\n1 2\n", c);
  EXPECT_EQ(c.rows.size(), 2u);
  EXPECT_EQ(parser.bad_lines(), 1u);
  EXPECT_EQ(parser.consumed_bytes(), 10u + (5u << 20) + 1u + 4u);
}

TEST(RowParser, ResumedParserContinuesLineNumbersAndLayout) {
  RowParser parser;
  Collected c;
  parser.Resume({"t", "u"}, 41, 1000);
  parser.Feed("7 8\nbad\n", c);
  EXPECT_EQ(c.row_lines, (std::vector<std::uint64_t>{42}));
  EXPECT_EQ(c.bad, (std::vector<std::string>{"43: value 1 (t): 'bad' is not a number"}));
  EXPECT_EQ(parser.consumed_bytes(), 1008u);
}

}  // namespace
}  // namespace plateau
