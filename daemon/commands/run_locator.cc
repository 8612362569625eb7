#include "daemon/commands/run_locator.h"

#include <filesystem>
#include <vector>

#include "config/config_loader.h"

namespace plateau {
namespace {

namespace fs = std::filesystem;

bool IsConfigName(const fs::path& p) {
  return p.extension() == ".yaml" || p.extension() == ".yml";
}

LocatedRun FromConfig(const std::string& path) {
  std::vector<ConfigError> errors;
  const auto config = LoadRunConfig(path, &errors);
  if (!config) return {"", "", errors.front().ToString()};
  return {config->store_path, config->socket_path, ""};
}

LocatedRun FromStore(const std::string& store) { return {store, store + ".sock", ""}; }

}  // namespace

LocatedRun LocateRun(const std::string& argument) {
  const fs::path given = argument.empty() ? fs::current_path() : fs::path(argument);
  std::error_code ec;
  if (fs::is_directory(given, ec)) {
    if (fs::exists(given / "plateau.db", ec)) return FromStore((given / "plateau.db").string());
    std::vector<fs::path> configs;
    for (const auto& entry : fs::directory_iterator(given, ec)) {
      if (entry.is_regular_file() && IsConfigName(entry.path())) configs.push_back(entry.path());
    }
    if (configs.size() == 1) return FromConfig(configs.front().string());
    return {"", "", "no plateau.db in " + given.string() +
                        (configs.empty() ? "" : " and more than one config there") +
                        "; name the config or the store"};
  }
  if (IsConfigName(given)) return FromConfig(given.string());
  if (!fs::exists(given, ec)) return {"", "", "no store at " + given.string()};
  return FromStore(given.string());
}

}  // namespace plateau
