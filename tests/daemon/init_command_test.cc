#include "daemon/commands/init_command.h"

#include <gtest/gtest.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <sstream>

#include "config/config_loader.h"
#include "tests/core/synthetic_series.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;

class InitCommand : public ::testing::Test {
 protected:
  void SetUp() override {
    dir_ = fs::temp_directory_path() / ("plateau_init_" + std::to_string(::getpid()) + "_" +
                                        ::testing::UnitTest::GetInstance()->current_test_info()->name());
    fs::create_directories(dir_ / "run1");
    fs::create_directories(dir_ / "run2");
  }
  void TearDown() override { fs::remove_all(dir_); }

  void Probe(const std::string& name, const std::string& header, double mean) {
    std::ofstream out(dir_ / name);
    out << "# " << header << "\n";
    const std::vector<double> x = testing::Ar1(500, 0.5, 1, mean);
    for (std::size_t t = 0; t < x.size(); ++t) out << t * 0.1 << " " << x[t] << " " << -x[t] << "\n";
  }

  fs::path dir_;
};

TEST_F(InitCommand, OneSourcePerLayoutAndAMeanPerColumn) {
  Probe("run1/wall.dat", "time tau_lower tau_upper", 5.0);
  Probe("run2/wall.dat", "time tau_lower tau_upper", 5.0);
  Probe("run1/line.dat", "t u v", 0.0);  // zero-mean columns
  std::ostringstream out, err;
  ASSERT_EQ(RunInitCommand({(dir_ / "run*/*.dat").string(), "--relative", "0.02"}, out, err), 0)
      << err.str();
  const std::string yaml = out.str();
  EXPECT_NE(yaml.find("files: \"" + (dir_ / "run*/wall.dat").string() + "\""), std::string::npos)
      << yaml;
  EXPECT_NE(yaml.find("files: \"" + (dir_ / "run*/line.dat").string() + "\""), std::string::npos);
  EXPECT_NE(yaml.find("target: {relative: 0.02, confidence: 0.95}"), std::string::npos);
  EXPECT_NE(yaml.find("# mean about zero"), std::string::npos);
  EXPECT_NE(yaml.find("target: {absolute: "), std::string::npos);
  std::vector<ConfigError> errors;
  const auto config = ParseRunConfig(yaml, (dir_ / "run.yaml").string(), &errors);
  ASSERT_TRUE(config.has_value()) << errors.front().ToString() << "\n" << yaml;
  EXPECT_EQ(config->sources.size(), 2u);
  EXPECT_EQ(config->statistics.size(), 4u);
}

TEST_F(InitCommand, NothingMatchedIsAnError) {
  std::ostringstream out, err;
  EXPECT_EQ(RunInitCommand({(dir_ / "nothing*.dat").string()}, out, err), 2);
  EXPECT_NE(err.str().find("no probe file with data matched"), std::string::npos);
}

TEST_F(InitCommand, ValidateListsEveryProblem) {
  std::ofstream(dir_ / "bad.yaml") << "sources: []\nstatistics: []\n";
  std::ostringstream out, err;
  EXPECT_EQ(RunValidateCommand({(dir_ / "bad.yaml").string()}, out, err), 2);
  EXPECT_NE(err.str().find("bad.yaml:1:10: sources must be a list with at least one source"),
            std::string::npos)
      << err.str();
  EXPECT_NE(err.str().find("2 problems"), std::string::npos);
}

}  // namespace
}  // namespace plateau
