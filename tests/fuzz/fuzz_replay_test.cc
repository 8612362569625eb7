// Replays the fuzz targets' committed seed corpus and every regression input (a crash once found by
// fuzzing, kept under tests/fuzz/regressions/<target>/) through the same checks, in every ordinary
// build: the release suite and ASan+UBSan. A broken contract aborts the test binary.
#include <gtest/gtest.h>

#include <cstdint>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <vector>

#include "tests/fuzz/fuzz_checks.h"

namespace plateau::fuzz {
namespace {

namespace fs = std::filesystem;
using Check = int (*)(const std::uint8_t*, std::size_t);

// Runs `check` on every file of corpus/<target> and regressions/<target>; returns how many.
int Replay(const std::string& target, Check check) {
  int replayed = 0;
  for (const char* folder : {"corpus", "regressions"}) {
    const fs::path dir = fs::path(PLATEAU_TEST_DATA_DIR) / "fuzz" / folder / target;
    if (!fs::is_directory(dir)) continue;
    for (const fs::directory_entry& entry : fs::directory_iterator(dir)) {
      if (!entry.is_regular_file()) continue;
      std::ifstream in(entry.path(), std::ios::binary);
      const std::string bytes((std::istreambuf_iterator<char>(in)),
                              std::istreambuf_iterator<char>());
      SCOPED_TRACE(entry.path().string());
      check(reinterpret_cast<const std::uint8_t*>(bytes.data()), bytes.size());
      ++replayed;
    }
  }
  return replayed;
}

TEST(FuzzReplay, RowParserSeedsAndRegressionsKeepTheParserContracts) {
  EXPECT_GE(Replay("row_parser", RowParserOneInput), 5);
}

TEST(FuzzReplay, ConfigSeedsAndRegressionsGiveAConfigOrLocatedErrors) {
  EXPECT_GE(Replay("config_loader", ConfigLoaderOneInput), 5);
}

TEST(FuzzReplay, QuerySeedsAndRegressionsGiveARequestOrAReason) {
  EXPECT_GE(Replay("query_request", QueryRequestOneInput), 5);
}

}  // namespace
}  // namespace plateau::fuzz
