// The fuzz targets' checks as plain functions: each takes one input, exercises one parser of bad
// input (probe rows, the run config, socket requests) and aborts when a contract breaks. libFuzzer
// calls them through LLVMFuzzerTestOneInput (built with PLATEAU_LIBFUZZER); the replay test calls
// them on the committed corpus and the regressions under every ordinary build. Single-threaded.
#ifndef PLATEAU_TESTS_FUZZ_FUZZ_CHECKS_H_
#define PLATEAU_TESTS_FUZZ_FUZZ_CHECKS_H_

#include <cstddef>
#include <cstdint>
#include <cstdio>
#include <cstdlib>

namespace plateau::fuzz {

// A contract broke: says which on stderr and aborts, which libFuzzer reports as a crash and the
// replay test as a dead test binary.
[[noreturn]] inline void ContractBroken(const char* target, const char* what) {
  std::fprintf(stderr, "%s contract broken: %s\n", target, what);
  std::abort();
}

int RowParserOneInput(const std::uint8_t* data, std::size_t size);
int ConfigLoaderOneInput(const std::uint8_t* data, std::size_t size);
int QueryRequestOneInput(const std::uint8_t* data, std::size_t size);

}  // namespace plateau::fuzz

#endif  // PLATEAU_TESTS_FUZZ_FUZZ_CHECKS_H_
