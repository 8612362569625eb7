#include "config/config_loader.h"

#include <gtest/gtest.h>

#include <string>
#include <vector>

namespace plateau {
namespace {

// Loads `text` as /runs/ch420/run.yaml and returns the errors as strings.
std::vector<std::string> Errors(const std::string& text) {
  std::vector<ConfigError> errors;
  EXPECT_FALSE(ParseRunConfig(text, "/runs/ch420/run.yaml", &errors).has_value());
  std::vector<std::string> out;
  for (const ConfigError& e : errors) out.push_back(e.ToString());
  return out;
}

const char* kValid = R"(run: ch420
sources:
  - name: wall
    files: probes/*/wall.dat
statistics:
  - name: tau_lower
    kind: mean
    columns: [tau_lower]
    target: {relative: 0.01}
  - kind: covariance
    columns: [u, v]
    target: {absolute: 2.0e-6, confidence: 0.99}
    minimum_time: 20
    reference: -2.8e-4
)";

TEST(ConfigLoader, ValidConfigGivesPlainStructsWithDefaults) {
  std::vector<ConfigError> errors;
  const auto c = ParseRunConfig(kValid, "/runs/ch420/run.yaml", &errors);
  ASSERT_TRUE(c.has_value()) << (errors.empty() ? "" : errors.front().ToString());
  EXPECT_EQ(c->run_name, "ch420");
  EXPECT_EQ(c->store_path, "/runs/ch420/plateau.db");  // beside the config
  EXPECT_EQ(c->sources.at(0).files, "/runs/ch420/probes/*/wall.dat");
  EXPECT_EQ(c->evaluate_every, 60.0);
  EXPECT_EQ(c->stop_rule.confirmations, 3);
  ASSERT_EQ(c->statistics.size(), 2u);
  EXPECT_EQ(c->statistics[0].source, "wall");  // the only source
  EXPECT_EQ(c->statistics[0].target->kind, Target::Kind::kRelative);
  EXPECT_EQ(c->statistics[0].target->confidence, 0.95);
  EXPECT_EQ(c->statistics[1].request.name, "cov(u,v)");
  EXPECT_EQ(c->statistics[1].target->kind, Target::Kind::kAbsolute);
  EXPECT_EQ(c->statistics[1].target->confidence, 0.99);
  EXPECT_EQ(c->statistics[1].minimum_time, 20.0);
  EXPECT_EQ(*c->statistics[1].reference, -2.8e-4);
}

TEST(ConfigLoader, UnknownKeyIsAnErrorAtItsLineAndColumn) {
  const auto errors = Errors("run: x\nevaluate_evry: 5\nsources: [{name: a, files: f}]\n"
                             "statistics: [{columns: t}]\n");
  ASSERT_EQ(errors.size(), 1u);
  EXPECT_EQ(errors[0].substr(0, 98),
            "/runs/ch420/run.yaml:2:1: unknown key 'evaluate_evry' in the run settings; expected "
            "one of run, st");
  EXPECT_NE(errors[0].find(", evaluate_every,"), std::string::npos);  // the key meant is offered
}

TEST(ConfigLoader, TypoInsideAStatisticPointsAtTheKey) {
  const auto errors = Errors(
      "sources:\n  - name: wall\n    files: w.dat\nstatistics:\n  - kind: mean\n"
      "    columns: [u]\n    taget: {relative: 0.01}\n");
  ASSERT_EQ(errors.size(), 1u);
  EXPECT_EQ(errors[0].substr(0, 61),
            "/runs/ch420/run.yaml:7:5: unknown key 'taget' in a statistic;");
}

TEST(ConfigLoader, WrongValuesSayWhatWasExpected) {
  const auto errors = Errors(
      "poll_every: soon\nconfidence: 95\nsources:\n  - name: wall\n    files: w.dat\n"
      "statistics:\n  - kind: avg\n    columns: [u]\n  - kind: covariance\n    columns: [u]\n"
      "  - columns: [v]\n    source: wal\n    target: {relative: -1}\n");
  ASSERT_EQ(errors.size(), 6u);
  EXPECT_EQ(errors[0],
            "/runs/ch420/run.yaml:1:13: poll_every must be a number of seconds above 0, got "
            "'soon'");
  EXPECT_EQ(errors[1],
            "/runs/ch420/run.yaml:2:13: confidence must be a fraction between 0 and 1, such as "
            "0.95, got '95'");
  EXPECT_EQ(errors[2],
            "/runs/ch420/run.yaml:7:11: kind 'avg' is not known; expected mean, variance, rms, "
            "covariance, third_moment, tke or average");
  EXPECT_EQ(errors[3], "/runs/ch420/run.yaml:10:14: covariance takes 2 columns, got 1");
  EXPECT_EQ(errors[4],
            "/runs/ch420/run.yaml:12:13: statistic 'v' names source 'wal', which is not defined; "
            "sources: wall");
  EXPECT_EQ(errors[5],
            "/runs/ch420/run.yaml:13:24: relative must be a fraction of the value above 0, such "
            "as 0.01 for 1 %, got '-1'");
}

TEST(ConfigLoader, BrokenYamlIsReportedWithItsPlace) {
  const auto errors = Errors("sources:\n  - name: [wall\n");
  ASSERT_EQ(errors.size(), 1u);
  EXPECT_EQ(errors[0].substr(0, 25), "/runs/ch420/run.yaml:3:1:");
  EXPECT_NE(errors[0].find("not valid YAML"), std::string::npos);
}

TEST(ConfigLoader, MissingPartsAndRepeatedNames) {
  const auto errors = Errors(
      "sources:\n  - name: a\n    files: a.dat\n  - name: a\n    files: b.dat\n"
      "statistics:\n  - source: a\n    columns: [u]\n  - source: a\n    columns: [u]\n"
      "  - columns: [w]\n");
  ASSERT_EQ(errors.size(), 3u);
  EXPECT_EQ(errors[0], "/runs/ch420/run.yaml:4:5: source name 'a' repeats");
  EXPECT_EQ(errors[1], "/runs/ch420/run.yaml:9:5: statistic name 'u' repeats; give one a name");
  EXPECT_EQ(errors[2], "/runs/ch420/run.yaml:11:5: statistic 'w' needs a source (there are "
                       "several)");
}

TEST(ConfigLoader, AlertsAreReadAndThePasswordNeverSitsInTheConfig) {
  std::vector<ConfigError> errors;
  const std::string alerts = std::string(kValid) +
                             "planned_end_time: 400\ncores: 512\nmetrics: {listen: 127.0.0.1:9464}\n"
                             "alerts:\n  stop_file: STOP\n  command: [/usr/bin/logger, -t, plateau]\n"
                             "  email:\n    host: localhost\n    port: 2525\n    from: p@x\n"
                             "    to: [a@x, b@x]\n    username: alice\n"
                             "    password_env: PLATEAU_SMTP_PASSWORD\n";
  const auto c = ParseRunConfig(alerts, "/runs/ch420/run.yaml", &errors);
  ASSERT_TRUE(c.has_value()) << errors.front().ToString();
  EXPECT_EQ(c->alerts.stop_file, "/runs/ch420/STOP");
  EXPECT_EQ(c->alerts.command->argv.size(), 3u);
  EXPECT_EQ(c->alerts.email->to.size(), 2u);
  EXPECT_EQ(c->alerts.email->port, 2525);
  EXPECT_EQ(c->planned_end_time, 400.0);
  EXPECT_EQ(c->metrics_listen, "127.0.0.1:9464");
  EXPECT_EQ(c->socket_path, "/runs/ch420/plateau.db.sock");
  const auto e = Errors(std::string(kValid) +
                        "alerts:\n  email: {host: h, from: f, to: t, username: u}\n"
                        "  events: [met, converged]\n");
  ASSERT_EQ(e.size(), 2u);
  EXPECT_NE(e[0].find("event 'converged' is not known"), std::string::npos);
  EXPECT_NE(e[1].find("the password never goes in the config itself"), std::string::npos);
}

TEST(ConfigLoader, GroupsNameTheirMembersWhichNeedTargets) {
  std::vector<ConfigError> errors;
  const auto c = ParseRunConfig(std::string(kValid) +
                                    "groups:\n  - name: wall\n    members: [tau_lower, \""
                                    "cov(u,v)\"]\n    bonferroni: true\n",
                                "/runs/ch420/run.yaml", &errors);
  ASSERT_TRUE(c.has_value()) << errors.front().ToString();
  EXPECT_TRUE(c->groups.at(0).bonferroni);
  EXPECT_EQ(c->groups.at(0).confidence, 0.95);
  const auto e = Errors(std::string(kValid) + "  - kind: rms\n    columns: [u]\n"
                                              "groups:\n  - name: g\n    members: [tau, rms(u)]\n");
  ASSERT_EQ(e.size(), 2u);
  EXPECT_NE(e[0].find("names statistic 'tau', which is not defined"), std::string::npos);
  EXPECT_NE(e[1].find("member 'rms(u)' has no target"), std::string::npos);
}

TEST(ConfigLoader, AGroupCanStopOnOneJointRegionOverMembersOfOneSource) {
  std::vector<ConfigError> errors;
  const std::string group = "groups:\n  - name: wall\n    members: [tau_lower, \"cov(u,v)\"]\n";
  const auto c = ParseRunConfig(std::string(kValid) + group + "    joint: multivariate\n",
                                "/runs/ch420/run.yaml", &errors);
  ASSERT_TRUE(c.has_value()) << errors.front().ToString();
  EXPECT_TRUE(c->groups.at(0).multivariate);
  EXPECT_FALSE(c->groups.at(0).bonferroni);
  const auto bonferroni = ParseRunConfig(std::string(kValid) + group + "    joint: bonferroni\n",
                                         "/runs/ch420/run.yaml", &errors);
  ASSERT_TRUE(bonferroni.has_value());
  EXPECT_TRUE(bonferroni->groups.at(0).bonferroni);

  auto e = Errors(std::string(kValid) + group + "    joint: jointly\n");
  ASSERT_EQ(e.size(), 1u);
  EXPECT_NE(e[0].find("joint must be separate"), std::string::npos) << e[0];
  e = Errors(std::string(kValid) + group + "    joint: multivariate\n    bonferroni: true\n");
  ASSERT_EQ(e.size(), 1u);
  EXPECT_NE(e[0].find("either bonferroni or joint: multivariate"), std::string::npos) << e[0];
}

TEST(ConfigLoader, MultivariateMembersFromTwoSourcesAreNamed) {
  const auto e = Errors(
      "run: r\nsources:\n  - {name: wall, files: w.dat}\n  - {name: forces, files: f.dat}\n"
      "statistics:\n  - {name: tau, source: wall, kind: mean, columns: [tau], target: {relative: "
      "0.01}}\n  - {name: cd, source: forces, kind: mean, columns: [cd], target: {relative: "
      "0.01}}\ngroups:\n  - {name: g, members: [tau, cd], joint: multivariate}\n");
  ASSERT_EQ(e.size(), 1u);
  EXPECT_NE(e[0].find("'cd' comes from 'forces', 'tau' from 'wall'"), std::string::npos) << e[0];
}

TEST(ConfigLoader, AJointProfileMakesOneGroupPerQuantityWithATarget) {
  std::vector<ConfigError> errors;
  const auto c = ParseRunConfig(
      std::string(kValid) +
          "profiles:\n  - name: line\n    positions: [0.001, 0.002, 0.004]\n"
          "    columns: {u: \"u{i}\", v: \"v{i}\", w: \"w{i}\"}\n"
          "    quantities: [U, uv, k]\n    targets: {U: {relative: 0.02}, k: {relative: 0.1}}\n"
          "    joint: multivariate\n",
      "/runs/ch420/run.yaml", &errors);
  ASSERT_TRUE(c.has_value()) << errors.front().ToString();
  ASSERT_EQ(c->groups.size(), 2u);  // uv has no target: monitored, no group
  EXPECT_EQ(c->groups[0].name, "line/U");
  EXPECT_EQ(c->groups[0].members,
            (std::vector<std::string>{"line[0]/U", "line[1]/U", "line[2]/U"}));
  EXPECT_TRUE(c->groups[0].multivariate);
  EXPECT_EQ(c->groups[1].name, "line/k");
  const auto e = Errors(std::string(kValid) +
                        "profiles:\n  - name: line\n    positions: [0.001, 0.002]\n"
                        "    columns: {u: \"u{i}\", v: \"v{i}\", w: \"w{i}\"}\n    joint: yes\n");
  ASSERT_EQ(e.size(), 1u);
  EXPECT_NE(e[0].find("a profile's joint must be separate"), std::string::npos) << e[0];
}

TEST(ConfigLoader, ProfileExpandsIntoPointStatisticsSharingAHistoryPerPoint) {
  std::vector<ConfigError> errors;
  const auto c = ParseRunConfig(
      std::string(kValid) +
          "wall_units: {viscosity: 1.0e-6, density: 998, wall_shear: tau_lower, half_height: "
          "0.025}\nprofiles:\n  - name: line\n    positions: [0.001, 0.002, 0.004]\n"
          "    columns: {u: \"u{i}\", v: \"v{i}\", w: \"w{i}\"}\n    first_index: 1\n"
          "    quantities: [U, uv, k, uuv]\n    target: {relative: 0.02}\n"
          "    targets: {uv: {absolute: 0.001}}\n"
          "    reference: {U: dns/u_plus.dat}\n    momentum_balance: true\n",
      "/runs/ch420/run.yaml", &errors);
  ASSERT_TRUE(c.has_value()) << errors.front().ToString();
  ASSERT_EQ(c->statistics.size(), 2u + 3u * 4u);
  const StatisticConfig& uv = c->statistics[2 + 4 + 1];  // point 1, second quantity
  EXPECT_EQ(uv.request.name, "line[1]/uv");
  EXPECT_EQ(uv.request.kind, StatisticKind::kCovariance);
  EXPECT_EQ(uv.request.columns, (std::vector<std::string>{"u2", "v2"}));  // first_index 1
  EXPECT_EQ(uv.request.shared_history, "line[1]");
  EXPECT_EQ(uv.request.shared_columns, (std::vector<std::string>{"u2", "v2", "w2"}));
  EXPECT_EQ(uv.position, 0.002);
  EXPECT_EQ(uv.target->kind, Target::Kind::kAbsolute);  // its own target beats the profile's
  EXPECT_EQ(c->statistics.back().request.kind, StatisticKind::kThirdMoment);
  EXPECT_EQ(c->statistics.back().target->value, 0.02);
  EXPECT_EQ(c->profiles.at(0).references.at(0).second, "/runs/ch420/dns/u_plus.dat");
  EXPECT_EQ(c->wall_units->wall_shear, "tau_lower");
  const auto bad = Errors(std::string(kValid) +
                          "profiles:\n  - name: p\n    positions: [0.2, 0.1]\n"
                          "    columns: {u: u, v: \"v{i}\", w: \"w{i}\"}\n");
  ASSERT_EQ(bad.size(), 2u);
  EXPECT_NE(bad[0].find("positions must increase away from the wall"), std::string::npos);
  EXPECT_NE(bad[1].find("a column pattern needs {i}"), std::string::npos);
}

TEST(ConfigLoader, ReferenceSeriesInTheSameSourceGetsItsJointDifference) {
  std::vector<ConfigError> errors;
  const auto c = ParseRunConfig(R"(sources:
  - name: walls
    files: "out/walls/*/balance.dat"
    scale: {"tau_lo.x": -1, "tau_up.x": -1}
  - name: other
    files: "out/gradient/*/dpdx.dat"
statistics:
  - {name: dpdx, source: walls, kind: mean, columns: [dpdx]}
  - name: tau_w
    source: walls
    kind: average
    columns: [tau_lo.x, tau_up.x]
    reference: {statistic: dpdx, factor: -0.025}
  - {name: dpdx_apart, source: other, kind: mean, columns: [g]}
  - {name: tau_lo, source: walls, kind: mean, columns: [tau_lo.x], reference: {statistic: dpdx_apart}}
)",
                                "/runs/ch420/run.yaml", &errors);
  ASSERT_TRUE(c.has_value()) << errors.front().ToString();
  ASSERT_EQ(c->sources[0].scales.size(), 2u);
  EXPECT_EQ(c->sources[0].scales[1].column, "tau_up.x");
  EXPECT_EQ(c->sources[0].scales[1].factor, -1.0);
  ASSERT_EQ(c->statistics.size(), 5u);  // the four, and the joint difference of tau_w
  const StatisticConfig& tau_w = c->statistics[1];
  EXPECT_EQ(tau_w.reference_statistic, "dpdx");
  EXPECT_EQ(tau_w.reference_factor, -0.025);
  EXPECT_EQ(tau_w.reference_difference, "tau_w - reference");
  const StatisticConfig& difference = c->statistics[4];
  EXPECT_EQ(difference.request.name, "tau_w - reference");
  EXPECT_EQ(difference.request.kind, StatisticKind::kWeightedSum);
  EXPECT_EQ(difference.request.columns,
            (std::vector<std::string>{"tau_lo.x", "tau_up.x", "dpdx"}));
  EXPECT_EQ(difference.request.weights, (std::vector<double>{0.5, 0.5, 0.025}));
  EXPECT_FALSE(difference.target.has_value());
  // Another source: compared as if independent, no joint statistic.
  EXPECT_EQ(c->statistics[3].reference_factor, 1.0);
  EXPECT_TRUE(c->statistics[3].reference_difference.empty());
}

TEST(ConfigLoader, WeightingPerSourceAndFlowThroughTimeAreRead) {
  std::vector<ConfigError> errors;
  const auto c = ParseRunConfig(R"(flow_through_time: 12.5
sources:
  - {name: wake, files: "out/wake/*/U", weighting: time}
  - {name: walls, files: "out/walls/*/tau.dat", weighting: samples}
  - {name: bulk, files: "out/bulk/*/Ub.dat"}
statistics:
  - {name: u, source: wake, kind: mean, columns: [u]}
)",
                                "/runs/ch420/run.yaml", &errors);
  ASSERT_TRUE(c.has_value()) << errors.front().ToString();
  EXPECT_EQ(c->flow_through_time, 12.5);
  EXPECT_EQ(c->sources[0].weighting, Weighting::kTime);
  EXPECT_EQ(c->sources[1].weighting, Weighting::kSamples);
  EXPECT_EQ(c->sources[2].weighting, Weighting::kAuto);  // the default
  const auto bad = Errors(R"(flow_through_time: -1
sources:
  - {name: s, files: a.dat, weighting: seconds}
statistics:
  - {name: u, kind: mean, columns: [u]}
)");
  // The statistic names no source, and the only one failed: no "needs a source" on top.
  ASSERT_EQ(bad.size(), 2u);
  EXPECT_NE(bad[0].find("flow_through_time"), std::string::npos) << bad[0];
  EXPECT_EQ(bad[1], "/runs/ch420/run.yaml:3:40: weighting must be auto, time or samples, not "
                    "'seconds'");
}

TEST(ConfigLoader, ReferenceSeriesAndScaleMistakesSayWhatIsWrong) {
  const auto errors = Errors(R"(sources:
  - {name: s, files: a.dat, scale: {u: 0}}
statistics:
  - {name: u, kind: mean, columns: [u], reference: {statistic: nowhere}}
  - {name: v, kind: mean, columns: [v], reference: {factor: 2}}
)");
  ASSERT_FALSE(errors.empty());
  EXPECT_EQ(errors.front(), "/runs/ch420/run.yaml:2:40: a scale factor of 0 would erase the column");
  EXPECT_EQ(errors.back().rfind("/runs/ch420/run.yaml:5:52: a reference map names a statistic", 0), 0u)
      << errors.back();
  const auto unknown = Errors(R"(sources:
  - {name: s, files: a.dat}
statistics:
  - {name: u, kind: mean, columns: [u], reference: {statistic: nowhere}}
)");
  ASSERT_EQ(unknown.size(), 1u);
  EXPECT_EQ(unknown[0],
            "/runs/ch420/run.yaml:4:52: reference statistic 'nowhere' is not defined");
}

TEST(ConfigLoader, ProfileWallAtTurnsCoordinatesIntoWallDistances) {
  std::vector<ConfigError> errors;
  const auto c = ParseRunConfig(R"(sources:
  - {name: probes, files: "out/probes/*/U"}
statistics:
  - {kind: mean, columns: ["U[0].x"]}
profiles:
  - name: upper
    positions: [1.9, 1.95, 1.99]     # y coordinates of probes near the upper wall at y = 2
    wall_at: 2
    columns: {u: "U[{i}].x", v: "U[{i}].y", w: "U[{i}].z"}
    quantities: [U]
)",
                                "/runs/ch420/run.yaml", &errors);
  EXPECT_FALSE(c.has_value());  // distances 0.1, 0.05, 0.01 shrink: listed the wrong way round
  ASSERT_FALSE(errors.empty());
  EXPECT_NE(errors[0].message.find("positions must increase away from the wall"),
            std::string::npos);
  errors.clear();
  const auto ok = ParseRunConfig(R"(sources:
  - {name: probes, files: "out/probes/*/U"}
statistics:
  - {kind: mean, columns: ["U[0].x"]}
profiles:
  - name: upper
    positions: [1.99, 1.95, 1.9]
    wall_at: 2
    columns: {u: "U[{i}].x", v: "U[{i}].y", w: "U[{i}].z"}
    quantities: [U]
)",
                                 "/runs/ch420/run.yaml", &errors);
  ASSERT_TRUE(ok.has_value()) << errors.front().ToString();
  ASSERT_EQ(ok->profiles[0].positions.size(), 3u);
  EXPECT_NEAR(ok->profiles[0].positions[0], 0.01, 1e-15);
  EXPECT_NEAR(ok->profiles[0].positions[2], 0.1, 1e-15);
  EXPECT_EQ(ok->statistics[1].request.columns[0], "U[0].x");
}

TEST(ConfigLoader, ShippedExampleIsValid) {
  std::vector<ConfigError> errors;
  const auto c = LoadRunConfig(PLATEAU_SOURCE_DIR "/config/example.yaml", &errors);
  ASSERT_TRUE(c.has_value()) << errors.front().ToString();
  // Seven statistics, the joint difference of tau_w's reference series, six points of six
  // quantities.
  EXPECT_EQ(c->statistics.size(), 7u + 1u + 6u * 6u);
  EXPECT_EQ(c->statistics[6].request.name, "m3(u,u,v)");
  EXPECT_EQ(c->statistics[7].request.name, "tau_w - reference");
  // The joint profile's six quantities all have targets: six groups of six points, then walls.
  ASSERT_EQ(c->groups.size(), 6u + 1u);
  EXPECT_EQ(c->groups.at(0).name, "line/U");
  EXPECT_EQ(c->groups.at(0).members.size(), 6u);
  EXPECT_EQ(c->groups.at(6).members.size(), 2u);
  EXPECT_TRUE(c->groups.at(6).bonferroni);
  EXPECT_EQ(c->wall_units->wall_shear, "tau_w");
  EXPECT_EQ(c->sources[1].columns.size(), 4u);
  EXPECT_EQ(c->sources[0].weighting, Weighting::kAuto);
  EXPECT_EQ(c->flow_through_time, 8.0);
}

TEST(ConfigLoader, UnreadableFileHasNoLineNumber) {
  std::vector<ConfigError> errors;
  EXPECT_FALSE(LoadRunConfig("/nonexistent/run.yaml", &errors).has_value());
  ASSERT_EQ(errors.size(), 1u);
  EXPECT_EQ(errors[0].ToString(), "/nonexistent/run.yaml: cannot read the config file");
}

}  // namespace
}  // namespace plateau
