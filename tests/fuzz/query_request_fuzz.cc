// libFuzzer target for the query socket's request parser (daemon/serving/query_request, on nlohmann-json):
// whatever arrives on the socket, it returns a request or an error message, never crashes, never
// recurses without bound. A request without an error, or an error without a message, aborts.
#include <cstdint>
#include <string>
#include <string_view>

#include "daemon/serving/query_request.h"
#include "tests/fuzz/fuzz_checks.h"

namespace plateau::fuzz {

int QueryRequestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view line(reinterpret_cast<const char*>(data), size);
  const auto request = plateau::ParseQueryRequest(line);
  if (!request.ok() && request.error().empty()) {
    ContractBroken("query request", "refused without a reason");
  }
  return 0;
}

}  // namespace plateau::fuzz

#ifdef PLATEAU_LIBFUZZER
extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  return plateau::fuzz::QueryRequestOneInput(data, size);
}
#endif
