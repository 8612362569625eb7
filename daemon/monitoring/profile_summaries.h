// What a cycle says about profiles and wall units beyond the single statistics: u_tau and Re_tau
// derived from the wall shear statistic (with their uncertainty), per profile and quantity the
// share of points that meet the target, the worst point, the values in wall units and their
// verdicts against a reference profile, and the momentum balance of a channel. Builds status rows;
// formatting and arithmetic only. Immutable after construction; one per daemon.
#ifndef PLATEAU_DAEMON_MONITORING_PROFILE_SUMMARIES_H_
#define PLATEAU_DAEMON_MONITORING_PROFILE_SUMMARIES_H_

#include <spdlog/spdlog.h>

#include <map>
#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "config/run_config.h"
#include "core/statistic_estimate.h"
#include "store/run_store.h"

namespace plateau {

class ProfileSummaries {
 public:
  // One statistic of the cycle: what it is, what it estimates, how it stands.
  struct Entry {
    const StatisticConfig* config;
    const StatisticEstimate* estimate;
    const SnapshotRow* row;
  };

  // Reads the profiles' reference tables; a table that cannot be read is logged and left out.
  ProfileSummaries(const RunConfig& config, const std::shared_ptr<spdlog::logger>& log);

  // The u_tau and Re_tau rows (with wall units), then a row per profile and quantity, then a
  // momentum-balance row per profile that asks for one.
  std::vector<SnapshotRow> Rows(const std::vector<Entry>& entries) const;

 private:
  // u_tau of this cycle, or an estimate in state kNoData when it cannot be had.
  StatisticEstimate FrictionVelocityOf(const std::vector<Entry>& entries) const;
  SnapshotRow QuantityRow(const ProfileConfig& profile, const std::string& quantity,
                          const std::vector<Entry>& points, const StatisticEstimate& u_tau) const;
  SnapshotRow MomentumRow(const ProfileConfig& profile, const std::vector<Entry>& entries,
                          const StatisticEstimate& u_tau) const;

  const RunConfig& config_;
  std::map<std::string, std::vector<std::pair<double, double>>> references_;  // "profile/quantity"
};

}  // namespace plateau

#endif  // PLATEAU_DAEMON_MONITORING_PROFILE_SUMMARIES_H_
