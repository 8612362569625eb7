#include "core/series_segment.h"

#include <gtest/gtest.h>

#include <cmath>

namespace plateau {
namespace {

TEST(SeriesSegment, StartTimeFolderIsAbstractedAndTheSeriesFolderNamesIt) {
  const SeriesSegment s = SeriesSegment::Of("output/wallShearLower/2000/surfaceFieldValue.dat");
  EXPECT_EQ(s.series, "output/wallShearLower/*/surfaceFieldValue.dat");
  EXPECT_EQ(s.series_folder, "wallShearLower");
  EXPECT_EQ(s.file_name, "surfaceFieldValue.dat");
  EXPECT_EQ(s.file_stem, "surfaceFieldValue");
  EXPECT_EQ(s.start_time, 2000.0);
  EXPECT_EQ(s.folder, SeriesSegment::Folder::kStartTime);
}

TEST(SeriesSegment, StartTimesInEveryWayASolverWritesThem) {
  EXPECT_EQ(SeriesSegment::Of("/runs/c/probes/0/U").start_time, 0.0);
  EXPECT_EQ(SeriesSegment::Of("/runs/c/probes/1.5e+03/U").start_time, 1500.0);
  EXPECT_EQ(SeriesSegment::Of("/runs/c/probes/0.25/U").start_time, 0.25);
  EXPECT_EQ(SeriesSegment::Of("/runs/c/probes/0.25/U").series, "/runs/c/probes/*/U");
  EXPECT_EQ(SeriesSegment::Of("/runs/c/probes/0.25/U").file_stem, "U");
}

TEST(SeriesSegment, TwoSeriesWithTheSameFileNameStayApart) {
  EXPECT_NE(SeriesSegment::Of("out/wallShearLower/0/surfaceFieldValue.dat").series,
            SeriesSegment::Of("out/wallShearUpper/0/surfaceFieldValue.dat").series);
  EXPECT_EQ(SeriesSegment::Of("out/wallShearUpper/0/surfaceFieldValue.dat").series,
            SeriesSegment::Of("out/wallShearUpper/37.5/surfaceFieldValue.dat").series);
}

TEST(SeriesSegment, NumberedRestartFoldersAreSegmentsToo) {
  const SeriesSegment s = SeriesSegment::Of("demo/out/run2/wall.dat");
  EXPECT_EQ(s.series, "demo/out/run*/wall.dat");
  EXPECT_EQ(s.folder, SeriesSegment::Folder::kNumberedRestart);
  EXPECT_TRUE(std::isnan(s.start_time));
  EXPECT_EQ(s.series_folder, "out");
  EXPECT_EQ(SeriesSegment::Of("run1/wall.dat").series, "run*/wall.dat");
  EXPECT_EQ(SeriesSegment::Of("run1/wall.dat").series_folder, "");
}

TEST(SeriesSegment, AFileInAPlainFolderIsASeriesOfItsOwn) {
  const SeriesSegment s = SeriesSegment::Of("probes/wall.dat");
  EXPECT_EQ(s.series, "probes/wall.dat");
  EXPECT_EQ(s.folder, SeriesSegment::Folder::kNone);
  EXPECT_EQ(SeriesSegment::Of("wall.dat").series, "wall.dat");
  EXPECT_EQ(SeriesSegment::Of("2d/wall.dat").series, "2d/wall.dat");  // not a number, no prefix
}

}  // namespace
}  // namespace plateau
