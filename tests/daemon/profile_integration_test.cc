// A probe line through the real daemon, checked against published DNS: the synthetic solver output
// has the means and Reynolds stresses of Moser, Kim & Mansour (1999), Re_tau = 178.12
// (tests/core/fixtures/channel_dns_re180), in an invented air channel. What plateau reports in wall
// units must give back the DNS profile within its own sampling uncertainty.
#include <gtest/gtest.h>

#include <cmath>
#include <fstream>
#include <random>

#include "daemon/presentation/json_document.h"
#include "tests/core/channel_dns.h"
#include "tests/daemon/run_folder.h"

namespace plateau {
namespace {

using testing::WaitFor;
using testing::WatchDaemon;

// The invented case: air (nu = 1.5e-5 m^2/s, rho = 1.2 kg/m^3) in a channel of half-height
// 20 mm at the DNS's Re_tau, so u_tau = Re_tau nu / delta.
constexpr double kNu = 1.5e-5, kRho = 1.2, kDelta = 0.02, kReTau = 178.12;
constexpr double kUTau = kReTau * kNu / kDelta;
constexpr std::size_t kRows = 30000;

class ProfileIntegration : public testing::RunFolder {
 protected:
  void SetUp() override {
    RunFolder::SetUp();
    dns_ = testing::ReadChannelDns();
    for (std::size_t i = 1; i < dns_.y_over_h.size(); i += 4) points_.push_back(i);
  }

  // time, tau_w, then u{i} v{i} w{i} per point: the DNS mean plus fluctuations with the DNS
  // stresses, each point's u and v correlated as R_uv says, AR(1) in time (phi 0.5).
  void WriteProbes() {
    std::ofstream out(Path("probes.dat"));
    out << "# time tau_w";
    for (std::size_t p = 0; p < points_.size(); ++p) out << " u" << p << " v" << p << " w" << p;
    out << "\n";
    std::mt19937_64 rng(178);
    std::normal_distribution<double> normal;
    const double phi = 0.5, scale = std::sqrt(1 - phi * phi);
    std::vector<double> state(1 + 3 * points_.size(), 0.0);
    char value[96];
    for (std::size_t t = 0; t < kRows; ++t) {
      for (double& s : state) s = phi * s + scale * normal(rng);
      std::snprintf(value, sizeof value, "%.4f %.8g", 0.001 * t,
                    kRho * kUTau * kUTau * (1.0 + 0.4 * state[0]));
      out << value;
      for (std::size_t p = 0; p < points_.size(); ++p) {
        const std::size_t k = points_[p];
        const double a = state[1 + 3 * p], b = state[2 + 3 * p], c = state[3 + 3 * p];
        const double ruu = dns_.r_uu[k], rvv = dns_.r_vv[k];
        const double rho_uv = ruu > 0 && rvv > 0 ? dns_.r_uv[k] / std::sqrt(ruu * rvv) : 0.0;
        const double u = dns_.u_plus[k] + std::sqrt(ruu) * a;
        const double v = std::sqrt(rvv) * (rho_uv * a + std::sqrt(1 - rho_uv * rho_uv) * b);
        const double w = std::sqrt(dns_.r_ww[k]) * c;
        std::snprintf(value, sizeof value, " %.8g %.8g %.8g", u * kUTau, v * kUTau, w * kUTau);
        out << value;
      }
      out << "\n";
    }
  }

  void WriteReference(const std::string& name, double factor) {
    std::ofstream out(Path(name));
    out << "# y+ U+ from Moser, Kim & Mansour (1999), Re_tau = 178.12\n";
    for (std::size_t i = 0; i < dns_.y_plus.size(); ++i) {
      out << dns_.y_plus[i] << " " << factor * dns_.u_plus[i] << "\n";
    }
  }

  void WriteConfig(const std::string& reference) {
    std::ofstream out(Path("run.yaml"));
    out << "run: dns-check\nsources:\n  - name: probes\n    files: probes.dat\nstatistics:\n"
           "  - {name: tau_w, kind: mean, columns: [tau_w], target: {relative: 0.01}}\n"
           "wall_units: {viscosity: 1.5e-5, density: 1.2, wall_shear: tau_w, half_height: 0.02}\n"
           "profiles:\n  - name: line\n    positions: [";
    for (std::size_t p = 0; p < points_.size(); ++p) {
      out << (p ? ", " : "") << dns_.y_over_h[points_[p]] * kDelta;
    }
    out << "]\n    columns: {u: \"u{i}\", v: \"v{i}\", w: \"w{i}\"}\n"
           "    quantities: [U, uu, vv, ww, uv, k]\n    reference: {U: "
        << reference << "}\n    momentum_balance: true\n";
  }

  // The status document, once the daemon has read every row and stopped.
  JsonDocument RunToTheEnd() {
    WatchDaemon daemon(Path("run.yaml"), Path("watch.log"));
    EXPECT_TRUE(WaitFor([&] { return Samples() == static_cast<std::int64_t>(kRows); }, 60))
        << testing::ReadAll(Path("watch.log"));
    daemon.Signal(SIGTERM);
    EXPECT_EQ(daemon.Wait(20), 0);
    const testing::CommandResult status = Plateau({"status", "--json", Path("run.yaml")});
    auto document = ParseJsonDocument(status.out);
    EXPECT_TRUE(document.ok()) << document.error();
    return document.ok() ? *document : JsonDocument();
  }

  static const JsonDocument* Named(const JsonDocument& document, const std::string& name) {
    for (const JsonDocument& s : document.at("statistics")) {
      if (s.at("name").get<std::string>() == name) return &s;
    }
    return nullptr;
  }

  testing::ChannelDns dns_;
  std::vector<std::size_t> points_;
};

TEST_F(ProfileIntegration, WallUnitProfilesGiveBackThePublishedDns) {
  WriteProbes();
  WriteReference("dns_u_plus.dat", 1.0);
  WriteConfig("dns_u_plus.dat");
  const JsonDocument status = RunToTheEnd();
  ASSERT_TRUE(status.is_object());

  const JsonDocument* u_tau = Named(status, "u_tau");
  ASSERT_NE(u_tau, nullptr);
  EXPECT_NEAR(u_tau->at("mean").get<double>(), kUTau, 0.01 * kUTau);
  EXPECT_LT(std::fabs(u_tau->at("mean").get<double>() - kUTau), 3 * u_tau->at("half_width").get<double>());
  EXPECT_NEAR(Named(status, "Re_tau")->at("mean").get<double>(), kReTau, 0.01 * kReTau);

  const JsonDocument* u = Named(status, "line:U");
  ASSERT_NE(u, nullptr);
  const auto& points = u->at("points");
  ASSERT_EQ(points.size(), points_.size());
  for (std::size_t p = 0; p < points.size(); ++p) {
    EXPECT_NEAR(points[p].at("y_plus").get<double>(), dns_.y_plus[points_[p]],
                0.01 * dns_.y_plus[points_[p]] + 1e-9)
        << p;
  }
  // Each point's 95 % interval in wall units covers the DNS U+: allow two misses in 16.
  const std::string summary = u->at("reference_summary").get<std::string>();
  int consistent = 0, compared = 0;
  std::sscanf(summary.c_str(), "vs reference: consistent at %d of %d", &consistent, &compared);
  EXPECT_EQ(compared, static_cast<int>(points_.size())) << summary;
  EXPECT_GE(consistent, compared - 2) << summary;

  // Common-practice checks on what plateau reports (the DNS itself: 2.66 near y+ 15, -0.72).
  double peak = 0.0, peak_y = 0.0, lowest = 0.0;
  for (const JsonDocument& p : Named(status, "line:uu")->at("points")) {
    if (p.at("value_plus").get<double>() > peak) {
      peak = p.at("value_plus").get<double>();
      peak_y = p.at("y_plus").get<double>();
    }
  }
  for (const JsonDocument& p : Named(status, "line:uv")->at("points")) {
    lowest = std::min(lowest, p.at("value_plus").get<double>());
  }
  EXPECT_NEAR(std::sqrt(peak), 2.66, 0.1);
  EXPECT_NEAR(peak_y, 15.0, 3.0);
  EXPECT_LT(lowest, -0.6);

  // The total shear stress line: 0.034 from the three-point derivative on these 16 points, the
  // rest sampling noise of <u'v'>+ (about 0.025 a point).
  const JsonDocument* balance = Named(status, "line:momentum_balance");
  ASSERT_NE(balance, nullptr);
  ASSERT_NE(FindMember(*balance, "largest"), nullptr) << balance->at("state_reason").get<std::string>();
  EXPECT_LT(balance->at("largest").get<double>(), 0.15);
}

TEST_F(ProfileIntegration, AReferenceTenPercentOffIsABiasNotSamplingError) {
  WriteProbes();
  WriteReference("shifted.dat", 1.1);
  WriteConfig("shifted.dat");
  const JsonDocument status = RunToTheEnd();
  ASSERT_TRUE(status.is_object());
  const JsonDocument* u = Named(status, "line:U");
  ASSERT_NE(u, nullptr);
  const std::string summary = u->at("reference_summary").get<std::string>();
  int consistent = -1, compared = 0;
  std::sscanf(summary.c_str(), "vs reference: consistent at %d of %d", &consistent, &compared);
  EXPECT_LE(consistent, 2) << summary;  // the points at the wall, where U+ and its 10 % are tiny
  EXPECT_NE(summary.find("a bias that more averaging will not remove"), std::string::npos);
  const testing::CommandResult table = Plateau({"status", Path("run.yaml")});
  EXPECT_NE(table.out.find("profile line:U:"), std::string::npos) << table.out;
}

}  // namespace
}  // namespace plateau
