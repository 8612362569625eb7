#include "daemon/monitoring/run_fingerprint.h"

namespace plateau {

std::string RunFingerprint(const RunConfig& config) {
  std::string f = "blocks=" + std::to_string(config.blocks);
  for (const SourceConfig& s : config.sources) {
    f += "|source=" + s.name + ";" + s.files + ";" + s.time_column + ";";
    for (const std::string& c : s.columns) f += c + ",";
  }
  for (const StatisticConfig& s : config.statistics) {
    f += "|statistic=" + s.request.name + ";" + s.source + ";" +
         std::string(KindName(s.request.kind)) + ";" + s.request.shared_history + ";";
    for (const std::string& c : s.request.columns) f += c + ",";
  }
  return f;
}

}  // namespace plateau
