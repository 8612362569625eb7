// The Moser, Kim & Mansour (1999) Re_tau = 178 channel profiles of tests/core/fixtures/
// channel_dns_re180, read for tests. Test-only.
#ifndef PLATEAU_TESTS_CORE_CHANNEL_DNS_H_
#define PLATEAU_TESTS_CORE_CHANNEL_DNS_H_

#include <fstream>
#include <sstream>
#include <string>
#include <vector>

namespace plateau::testing {

struct ChannelDns {
  std::vector<double> y_over_h, y_plus, u_plus, r_uu, r_vv, r_ww, r_uv;
};

inline std::vector<std::vector<double>> ReadColumns(const std::string& path) {
  std::ifstream in(path);
  std::string line;
  std::vector<std::vector<double>> rows;
  while (std::getline(in, line)) {
    if (line.empty() || line[0] == '#') continue;
    std::istringstream fields(line);
    std::vector<double> row;
    double v;
    while (fields >> v) row.push_back(v);
    if (!row.empty()) rows.push_back(row);
  }
  return rows;
}

inline ChannelDns ReadChannelDns() {
  const std::string dir = PLATEAU_TEST_DATA_DIR "/core/fixtures/channel_dns_re180/";
  ChannelDns d;
  for (const auto& r : ReadColumns(dir + "chan180.means")) {
    d.y_over_h.push_back(r[0]);
    d.y_plus.push_back(r[1]);
    d.u_plus.push_back(r[2]);
  }
  for (const auto& r : ReadColumns(dir + "chan180.reystress")) {
    d.r_uu.push_back(r[2]);
    d.r_vv.push_back(r[3]);
    d.r_ww.push_back(r[4]);
    d.r_uv.push_back(r[5]);
  }
  return d;
}

}  // namespace plateau::testing

#endif  // PLATEAU_TESTS_CORE_CHANNEL_DNS_H_
