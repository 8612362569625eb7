#include "demo/channel_profile_model.h"

#include <algorithm>
#include <cmath>

#include "demo/channel_case.h"

namespace plateau_demo {
namespace {

constexpr double kKappa = 0.41;
constexpr double kReichardtC = 7.8;
constexpr double kReichardtChi = 11.0;
constexpr double kBias = 0.04;
constexpr double kBiasLength = 60.0;

double ReichardtGradientPlus(double y) {
  return 1.0 / (1.0 + kKappa * y) + kReichardtC * (std::exp(-y / kReichardtChi) / kReichardtChi -
                                                   std::exp(-y / 3.0) / kReichardtChi +
                                                   y / (3.0 * kReichardtChi) * std::exp(-y / 3.0));
}

double BiasFactor(double y) { return 1.0 + kBias * (1.0 - std::exp(-y / kBiasLength)); }

double BiasFactorGradient(double y) { return kBias / kBiasLength * std::exp(-y / kBiasLength); }

}  // namespace

double ChannelProfileModel::ReichardtPlus(double y) {
  return std::log(1.0 + kKappa * y) / kKappa +
         kReichardtC *
             (1.0 - std::exp(-y / kReichardtChi) - y / kReichardtChi * std::exp(-y / 3.0));
}

double ChannelProfileModel::MeanVelocityPlus(double y) { return BiasFactor(y) * ReichardtPlus(y); }

double ChannelProfileModel::MeanVelocityGradientPlus(double y) {
  return BiasFactorGradient(y) * ReichardtPlus(y) + BiasFactor(y) * ReichardtGradientPlus(y);
}

double ChannelProfileModel::ShearStressPlus(double y) {
  const double total = 1.0 - y / kReTau;
  return -std::max(0.0, total - MeanVelocityGradientPlus(y));
}

double ChannelProfileModel::UrmsPlus(double y) {
  if (y <= 15.0) return 2.7 * (y / 15.0) * std::exp(1.0 - y / 15.0);
  return 0.9 + 1.8 * std::exp(-(y - 15.0) / 120.0);
}

double ChannelProfileModel::VrmsPlus(double y) {
  return 0.95 * std::pow(1.0 - std::exp(-y / 12.0), 1.5) * (1.0 - 0.4 * y / kReTau);
}

double ChannelProfileModel::WrmsPlus(double y) {
  return 1.25 * (1.0 - std::exp(-y / 12.0)) * (1.0 - 0.45 * y / kReTau);
}

double ChannelProfileModel::IntegralTime(double y) { return 0.01 * (1.0 + y / 80.0); }

}  // namespace plateau_demo
