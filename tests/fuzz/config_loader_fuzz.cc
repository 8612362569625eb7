// libFuzzer target for the run configuration loader (config/, yaml-cpp inside): any text gives a
// config or at least one located error, never an exception across the border, never a crash. A
// refusal without errors, or an error whose line or column is negative, aborts.
#include <cstdint>
#include <string>
#include <vector>

#include "config/config_loader.h"
#include "tests/fuzz/fuzz_checks.h"

namespace plateau::fuzz {

int ConfigLoaderOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string text(reinterpret_cast<const char*>(data), size);
  std::vector<plateau::ConfigError> errors;
  const auto config = plateau::ParseRunConfig(text, "/nonexistent/fuzz/run.yaml", &errors);
  if (!config && errors.empty()) ContractBroken("config loader", "refused without an error");
  for (const plateau::ConfigError& e : errors) {
    if (e.line < 0 || e.column < 0 || e.message.empty()) {
      ContractBroken("config loader", "an error without a place or a message");
    }
  }
  return 0;
}

}  // namespace plateau::fuzz

#ifdef PLATEAU_LIBFUZZER
extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return plateau::fuzz::ConfigLoaderOneInput(data, size);
}
#endif
