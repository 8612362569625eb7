#include <charconv>

#include "config/config_reader.h"

namespace plateau {

std::optional<EmailConfig> ConfigReader::LoadEmail(const YAML::Node& node) {
  if (!node.IsMap()) {
    Error(node, "email must be a map with host, from and to");
    return std::nullopt;
  }
  CheckKeys(node,
            {"host", "port", "from", "to", "starttls", "username", "password_file", "password_env",
             "ca_file", "timeout"},
            "email");
  EmailConfig e;
  bool ok = true;
  for (const char* required : {"host", "from", "to"}) {
    if (!node[required]) {
      Error(node, std::string("email needs ") + required);
      ok = false;
    }
  }
  if (node["host"]) ok = (e.host = Text(node["host"], "host").value_or("")).size() > 0 && ok;
  if (node["from"]) ok = (e.from = Text(node["from"], "from").value_or("")).size() > 0 && ok;
  if (node["to"]) {
    e.to = TextList(node["to"], "to");
    ok = ok && !e.to.empty();
  }
  if (node["port"]) {
    if (auto p = Number(node["port"], "port", 1, 65535, false, "a port number from 1 to 65535")) {
      e.port = static_cast<int>(*p);
    } else {
      ok = false;
    }
  }
  if (node["starttls"]) ok = Flag(node["starttls"], "starttls", &e.starttls) && ok;
  if (node["username"]) e.username = Text(node["username"], "username").value_or("");
  if (node["password_file"]) {
    if (auto f = Text(node["password_file"], "password_file")) e.password_file = Resolve(*f);
  }
  if (node["password_env"])
    e.password_env = Text(node["password_env"], "password_env").value_or("");
  if (node["ca_file"]) {
    if (auto f = Text(node["ca_file"], "ca_file")) e.ca_file = Resolve(*f);
  }
  if (!e.username.empty() && e.password_file.empty() && e.password_env.empty()) {
    Error(node,
          "email has a username but no password_file or password_env (the password never "
          "goes in the config itself)");
    ok = false;
  }
  if (node["timeout"]) {
    auto t = Number(node["timeout"], "timeout", 0.0, 3600, true, "seconds above 0");
    ok = ok && t.has_value();
    if (t) e.timeout = *t;
  }
  return ok ? std::optional<EmailConfig>(e) : std::nullopt;
}

std::optional<CommandConfig> ConfigReader::LoadCommand(const YAML::Node& node) {
  CommandConfig c;
  const YAML::Node argv = node.IsMap() ? node["argv"] : node;
  if (node.IsMap()) CheckKeys(node, {"argv", "timeout"}, "command");
  if (!argv || !argv.IsSequence() || argv.size() == 0) {
    Error(node,
          "command must be a list of program and arguments, e.g. [/usr/bin/logger, -t, "
          "plateau], or a map with argv");
    return std::nullopt;
  }
  c.argv = TextList(argv, "argv");
  if (node.IsMap() && node["timeout"]) {
    auto t = Number(node["timeout"], "timeout", 0.0, 86400, true, "seconds above 0");
    if (!t) return std::nullopt;
    c.timeout = *t;
  }
  return c;
}

void ConfigReader::LoadAlerts(const YAML::Node& node, AlertsConfig& a) {
  if (!node.IsMap()) {
    Error(node, "alerts must be a map");
    return;
  }
  CheckKeys(node,
            {"events", "stall_after", "bad_lines_per_minute", "max_attempts", "email", "command",
             "stop_file", "syslog"},
            "alerts");
  if (node["events"]) {
    std::vector<std::string> kinds;
    for (const EventKind k : AllEventKinds()) kinds.emplace_back(EventKindName(k));
    a.events.clear();
    for (const std::string& e : TextList(node["events"], "events")) {
      if (const std::optional<EventKind> kind = EventKindFromName(e)) {
        a.events.push_back(*kind);
      } else {
        Error(node["events"], "event '" + e + "' is not known; expected " + Join(kinds));
      }
    }
  }
  if (node["stall_after"]) {
    if (auto v = Number(node["stall_after"], "stall_after", 0.0, 1e9, true, "seconds above 0")) {
      a.stall_after = *v;
    }
  }
  if (node["bad_lines_per_minute"]) {
    if (auto v = Number(node["bad_lines_per_minute"], "bad_lines_per_minute", 0.0, 1e12, false,
                        "a rate, 0 or more")) {
      a.bad_lines_per_minute = *v;
    }
  }
  if (node["max_attempts"]) {
    if (auto v = Number(node["max_attempts"], "max_attempts", 1, 100, false,
                        "a whole number from 1 to 100")) {
      a.max_attempts = static_cast<int>(*v);
    }
  }
  if (node["email"]) a.email = LoadEmail(node["email"]);
  if (node["command"]) a.command = LoadCommand(node["command"]);
  if (node["stop_file"]) {
    if (auto f = Text(node["stop_file"], "stop_file")) a.stop_file = Resolve(*f);
  }
  if (node["syslog"]) Flag(node["syslog"], "syslog", &a.syslog);
}

void ConfigReader::LoadMetrics(const YAML::Node& node, RunConfig& c) {
  if (!node.IsMap()) {
    Error(node, "metrics must be a map such as {listen: 127.0.0.1:9464}");
    return;
  }
  CheckKeys(node, {"listen"}, "metrics");
  if (!node["listen"]) {
    Error(node, "metrics needs listen: HOST:PORT, such as 127.0.0.1:9464");
    return;
  }
  const auto listen = Text(node["listen"], "listen");
  if (!listen) return;
  const std::size_t colon = listen->rfind(':');
  int port = 0;
  const std::string port_text = colon == std::string::npos ? "" : listen->substr(colon + 1);
  const auto [ptr, ec] =
      std::from_chars(port_text.data(), port_text.data() + port_text.size(), port);
  if (colon == 0 || colon == std::string::npos || ec != std::errc() ||
      ptr != port_text.data() + port_text.size() || port < 1 || port > 65535) {
    Error(node["listen"],
          "listen must be HOST:PORT, such as 127.0.0.1:9464, got '" + *listen + "'");
    return;
  }
  c.metrics_listen = *listen;
}

}  // namespace plateau
