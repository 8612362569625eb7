// The fuzz targets' checks as plain functions: each takes one input, exercises one parser of bad
// input (probe rows, the run config, socket requests) and aborts when a contract breaks. libFuzzer
// calls them through LLVMFuzzerTestOneInput (built with PLATEAU_LIBFUZZER); the replay test calls
// them on the committed corpus and the regressions under every ordinary build. Single-threaded.
#ifndef PLATEAU_TESTS_FUZZ_FUZZ_CHECKS_H_
#define PLATEAU_TESTS_FUZZ_FUZZ_CHECKS_H_

#include <cstddef>
#include <cstdint>

namespace plateau::fuzz {

int RowParserOneInput(const std::uint8_t* data, std::size_t size);
int ConfigLoaderOneInput(const std::uint8_t* data, std::size_t size);
int QueryRequestOneInput(const std::uint8_t* data, std::size_t size);

}  // namespace plateau::fuzz

#endif  // PLATEAU_TESTS_FUZZ_FUZZ_CHECKS_H_
