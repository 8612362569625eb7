// End-to-end checks of `plateau analyze`: what a user types, what they read, what a script parses.
#include "daemon/commands/analyze_command.h"

#include <gtest/gtest.h>
#include <sys/wait.h>

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>

#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;

class AnalyzeCommand : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() /
           ("plateau_analyze_" + std::to_string(::getpid()) + "_" +
            ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::create_directories(dir_);
  }
  void TearDown() override { fs::remove_all(dir_); }

  // A probe file: time, then u (AR(1) about 2), v (correlated with u), w; `rows` rows from t0.
  std::string WriteProbe(const std::string& name, std::size_t rows, double t0 = 0.0,
                         std::uint64_t seed = 1, const std::string& extra = "") {
    const std::vector<double> a = testing::Ar1(rows, 0.8, seed);
    const std::vector<double> b = testing::Ar1(rows, 0.5, seed + 99);
    const fs::path path = dir_ / name;
    fs::create_directories(path.parent_path());
    std::ofstream out(path);
    out << "# invented test probe\n# time u v w\n";
    for (std::size_t t = 0; t < rows; ++t) {
      out << t0 + 0.01 * t << " " << 2.0 + a[t] << " " << -0.3 * a[t] + b[t] << " " << b[t]
          << "\n";
      if (t == rows / 2) out << extra;
    }
    return path.string();
  }

  int Run(const std::vector<std::string>& args) {
    out_.str("");
    err_.str("");
    return RunAnalyzeCommand(args, out_, err_);
  }

  fs::path dir_;
  std::ostringstream out_;
  std::ostringstream err_;
};

TEST_F(AnalyzeCommand, DefaultTableHasAMeanPerDataColumn) {
  const std::string file = WriteProbe("wall.dat", 5000);
  ASSERT_EQ(Run({file}), 0) << err_.str();
  const std::string table = out_.str();
  EXPECT_NE(table.find("statistic"), std::string::npos);
  for (const char* row : {"\nu ", "\nv ", "\nw "}) EXPECT_NE(table.find(row), std::string::npos);
  EXPECT_EQ(table.find("\ntime "), std::string::npos);
  EXPECT_EQ(table.find("nan"), std::string::npos);
}

TEST_F(AnalyzeCommand, JsonCarriesTheStableKeys) {
  const std::string file = WriteProbe("line.dat", 8000);
  ASSERT_EQ(Run({file, "--covariance", "u,v", "--confidence", "0.99", "--json"}), 0)
      << err_.str();
  const std::string json = out_.str();
  for (const char* key :
       {"\"statistics\":[", "\"name\":\"cov(u,v)\"", "\"kind\":\"covariance\"", "\"samples_used\":",
        "\"warmup_end_time\":", "\"mean\":", "\"std_error\":{\"batch_means\":",
        "\"overlapping_batch_means\":", "\"autocorrelation\":", "\"integrated_time\":",
        "\"effective_samples\":", "\"confidence\":0.99", "\"half_width\":",
        "\"relative_half_width\":", "\"drift\":{\"tested\":true,\"detected\":", "\"p_value\":",
        "\"bad_lines\":0", "\"decided_by\":"}) {
    EXPECT_NE(json.find(key), std::string::npos) << key;
  }
  EXPECT_EQ(json.find("nan"), std::string::npos);
}

TEST_F(AnalyzeCommand, BadLinesAreReportedWithFileAndLineAndNeverFatal) {
  const std::string file = WriteProbe("wall.dat", 3000, 0.0, 1, "12.5 oops 1 2\n");
  ASSERT_EQ(Run({file}), 0);
  EXPECT_NE(out_.str().find("1 bad line"), std::string::npos);
  // Two header lines, rows 0..1500 on lines 3..1503, the bad line next.
  EXPECT_NE(out_.str().find(file + ":1504: value 2 (u): 'oops' is not a number"),
            std::string::npos)
      << out_.str();
}

TEST_F(AnalyzeCommand, RestartedRunIsReadInTimeOrderWithOverlapSkipped) {
  const std::string first = WriteProbe("run1/wall.dat", 4000, 0.0, 1);
  const std::string restart = WriteProbe("run2/wall.dat", 4000, 35.0, 2);  // overlaps 35..39.99
  ASSERT_EQ(Run({restart, first, "--json"}), 0) << err_.str();
  const std::string json = out_.str();
  EXPECT_LT(json.find("run1/wall.dat"), json.find("run2/wall.dat"));
  EXPECT_NE(json.find("\"restart_overlap\":500"), std::string::npos);
  EXPECT_NE(json.find("\"samples_total\":7500"), std::string::npos);
  EXPECT_NE(json.find("restart overlap: 500 rows with times 35 to 39.99"), std::string::npos);
}

TEST_F(AnalyzeCommand, UnknownColumnNamesTheFileAndTheKnownColumns) {
  const std::string file = WriteProbe("wall.dat", 100);
  EXPECT_EQ(Run({file, "--covariance", "u,q"}), 2);
  EXPECT_EQ(err_.str(), "plateau analyze: " + file + ": no column 'q' (columns: time, u, v, w)\n");
}

TEST_F(AnalyzeCommand, MissingFileIsAClearErrorNotACrash) {
  EXPECT_EQ(Run({(dir_ / "nope.dat").string()}), 2);
  EXPECT_NE(err_.str().find("cannot open"), std::string::npos);
  EXPECT_NE(err_.str().find("No such file or directory"), std::string::npos);
}

TEST_F(AnalyzeCommand, UnreadableFileIsAClearError) {
  // A file that opens but cannot be read, also as root: the process's own memory at offset 0.
  EXPECT_EQ(Run({"/proc/self/mem"}), 2);
  EXPECT_NE(err_.str().find("left out /proc/self/mem: cannot read"), std::string::npos)
      << err_.str();
  EXPECT_NE(err_.str().find("Input/output error"), std::string::npos);
}

TEST_F(AnalyzeCommand, EmptyFolderSaysItNamesNoFile) {
  fs::create_directories(dir_ / "nothing_yet");
  EXPECT_EQ(Run({(dir_ / "nothing_yet").string()}), 2);
  EXPECT_NE(err_.str().find("nothing_yet names no file"), std::string::npos) << err_.str();
}

TEST_F(AnalyzeCommand, EmptyFileSaysThereAreNoDataRows) {
  const fs::path path = dir_ / "empty.dat";
  std::ofstream(path) << "# time u\n";
  EXPECT_EQ(Run({path.string()}), 2);
  EXPECT_EQ(err_.str(), "plateau analyze: left out " + path.string() +
                            ": no data rows yet\nplateau analyze: no time series to analyze in "
                            "what was given\n");
}

TEST_F(AnalyzeCommand, TooFewSamplesIsAStateNotANumber) {
  const std::string file = WriteProbe("short.dat", 20);
  ASSERT_EQ(Run({file}), 0);
  EXPECT_NE(out_.str().find("not enough data"), std::string::npos);
  EXPECT_EQ(out_.str().find("nan"), std::string::npos);
  ASSERT_EQ(Run({file, "--json"}), 0);
  EXPECT_NE(out_.str().find("\"estimate_state\":\"not_enough_data\""), std::string::npos);
  EXPECT_NE(out_.str().find("\"half_width\":null"), std::string::npos);
}

TEST_F(AnalyzeCommand, BadOptionsAreRefusedWithWhatWasExpected) {
  const std::string file = WriteProbe("wall.dat", 100);
  EXPECT_EQ(Run({file, "--confidence", "95"}), 2);
  EXPECT_NE(err_.str().find("between 0 and 1"), std::string::npos);
  EXPECT_EQ(Run({file, "--warmup", "soon"}), 2);
  EXPECT_NE(err_.str().find("auto, none or a time"), std::string::npos);
  EXPECT_EQ(Run({file, "--frobnicate"}), 2);
  EXPECT_NE(err_.str().find("unknown option --frobnicate"), std::string::npos);
  EXPECT_EQ(Run({}), 2);
}

TEST_F(AnalyzeCommand, BinaryRunsAndExitsZero) {
  const std::string file = WriteProbe("wall.dat", 2000);
  const std::string command = std::string(PLATEAU_BINARY) + " analyze " + file + " > /dev/null";
  const int status = std::system(command.c_str());
  ASSERT_TRUE(WIFEXITED(status));
  EXPECT_EQ(WEXITSTATUS(status), 0);
}

}  // namespace
}  // namespace plateau
