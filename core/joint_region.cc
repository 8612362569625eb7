#include "core/joint_region.h"

#include <algorithm>
#include <cmath>

#include "core/combination_rule.h"
#include "core/message_number.h"
#include "core/multivariate_batch_means.h"
#include "core/run_verdict.h"
#include "core/student_t.h"

namespace plateau {
namespace {

// Why the members cannot be joined, or "" when they can.
std::string Misalignment(const std::vector<JointRegionMember>& members) {
  const BlockHistory& first = members.front().statistic->history();
  for (const JointRegionMember& m : members) {
    const BlockHistory& h = m.statistic->history();
    if (m.estimate->state != EstimateState::kEstimated) {
      return m.estimate->name + " has no interval yet (" + m.estimate->state_reason + ")";
    }
    if (h.sample_count() != first.sample_count() || h.block_length() != first.block_length()) {
      return m.estimate->name + " and " + members.front().estimate->name +
             " are not fed by the same rows (" + std::to_string(h.sample_count()) + " and " +
             std::to_string(first.sample_count()) + " samples)";
    }
    if (!(m.target_half_width > 0.0)) {
      return m.estimate->name + "'s target half-width is " + MessageNumber(m.target_half_width) +
             " (a relative target of a value near zero?)";
    }
  }
  return "";
}

// Member ratios at the group's confidence and at Bonferroni's member confidence.
void MemberRatios(const std::vector<JointRegionMember>& members, double confidence,
                  JointRegion& region) {
  const double bonferroni = BonferroniMemberConfidence(confidence, members.size());
  region.members_ratio = 0.0;
  region.bonferroni_ratio = 0.0;
  for (const JointRegionMember& m : members) {
    const StatisticEstimate& e = *m.estimate;
    const double widening =
        TwoSidedStudentQuantile(bonferroni, e.decision.degrees_of_freedom) / e.quantile;
    region.members_ratio = std::max(region.members_ratio, e.half_width / m.target_half_width);
    region.bonferroni_ratio =
        std::max(region.bonferroni_ratio, widening * e.half_width / m.target_half_width);
  }
}

// The members' shortest averaging time (simulated time after each one's cut); NaN if any is unknown.
double ShortestAveraging(const std::vector<JointRegionMember>& members) {
  double shortest = members.front().estimate->averaging_time;
  for (const JointRegionMember& m : members) {
    shortest = std::isnan(m.estimate->averaging_time) ? JointRegion::kNaN
                                                      : std::min(shortest, m.estimate->averaging_time);
  }
  return shortest;
}

}  // namespace

JointRegion EvaluateJointRegion(const std::vector<JointRegionMember>& members,
                                const EvaluationOptions& options) {
  JointRegion region;
  region.members = static_cast<int>(members.size());
  if (members.empty()) {
    region.reason = "the group has no members";
    return region;
  }
  if (std::string why = Misalignment(members); !why.empty()) {
    region.reason = "no joint region: " + why;
    return region;
  }
  const int p = region.members;
  int cut = 0;
  double longest_tau = 0.0;
  for (const JointRegionMember& m : members) {
    cut = std::max(cut, m.statistic->WarmupBlocks(options));
    longest_tau = std::max(longest_tau, m.estimate->integrated_time);
  }
  std::vector<std::vector<double>> series;
  series.reserve(members.size());
  for (const JointRegionMember& m : members) series.push_back(m.statistic->LinearisedBlockSeries(cut));
  const int batches = std::max(options.batches, p + kJointExtraBatches);
  const MultivariateBatchMeansResult mbm = MultivariateBatchMeans(series, batches);
  if (mbm.batches == 0) {
    region.reason = "no joint region yet: " + std::to_string(p) + " members need " +
                    std::to_string(2 * batches) + " blocks after the warm-up, " +
                    std::to_string(series.front().size()) + " so far";
    return region;
  }
  region.batches = mbm.batches;
  region.batch_length =
      static_cast<double>(mbm.batch_size) * members.front().statistic->history().block_length();
  MemberRatios(members, options.confidence, region);

  // The region in target units: M = D^-1 (Sigma / n) D^-1 with D = diag(h_i); the box is then
  // [-1, 1]^p of volume 2^p.
  SquareMatrix scaled = mbm.long_run_covariance;
  for (int i = 0; i < p; ++i) {
    for (int j = 0; j < p; ++j) {
      scaled[i * p + j] /= mbm.values * members[i].target_half_width * members[j].target_half_width;
    }
  }
  const double log_det = LogDeterminant(scaled, p);
  const double t2 = HotellingQuantile(options.confidence, p, mbm.batches);
  if (std::isnan(log_det)) {
    region.reason = "no joint region: the members' covariance is singular (a member repeats "
                    "another, or a linear combination of others)";
    return region;
  }
  const double log_volume = LogUnitBallVolume(p) + 0.5 * p * std::log(t2) + 0.5 * log_det;
  region.volume_ratio = std::exp(log_volume / p - std::log(2.0));
  region.joint_time_factor = std::pow(std::max(region.volume_ratio, region.members_ratio), 2);
  region.bonferroni_time_factor = std::pow(region.bonferroni_ratio, 2);
  region.available = true;
  region.small_enough = region.volume_ratio <= 1.0;
  region.remaining_time =
      region.small_enough
          ? 0.0
          : ShortestAveraging(members) * (region.volume_ratio * region.volume_ratio - 1.0);
  if (region.batch_length < kBatchesPerTau * longest_tau) {
    // Batch means biased low would make the region look smaller than it is.
    region.small_enough = false;
    region.remaining_time = JointRegion::kNaN;
    region.reason = "joint region not trusted yet: its " + std::to_string(mbm.batches) +
                    " batches of " + MessageNumber(region.batch_length) +
                    " samples are shorter than " + MessageNumber(kBatchesPerTau) +
                    " integrated times of the slowest member (" + MessageNumber(longest_tau) + ")";
    return region;
  }
  region.reason = "joint " + MessageNumber(100.0 * options.confidence) + " % region of " +
                  std::to_string(p) + " members: " + MessageNumber(region.volume_ratio) +
                  " of the targets' size; it needs " + MessageNumber(region.joint_time_factor) +
                  " of the present averaging, Bonferroni " +
                  MessageNumber(region.bonferroni_time_factor) + " (" +
                  MessageNumber(region.bonferroni_time_factor / region.joint_time_factor) +
                  "× as long)";
  return region;
}

}  // namespace plateau
