#include "daemon/commands/command_line.h"

#include <charconv>
#include <cmath>

namespace plateau {
namespace {

// The usage line first, then what the command does, then the options.
class UsageFirst : public CLI::Formatter {
 public:
  std::string make_description(const CLI::App*) const override { return ""; }
  std::string make_usage(const CLI::App* app, std::string name) const override {
    const std::string summary = app->get_description();
    return CLI::Formatter::make_usage(app, name) + (summary.empty() ? "" : "\n" + summary + "\n");
  }
};

std::string CommandName(const CLI::App& app) {
  const std::string& name = app.get_name();  // "plateau analyze"
  return name.substr(name.find(' ') + 1);
}

}  // namespace

std::unique_ptr<CLI::App> MakeCommandLine(const std::string& name, const std::string& summary,
                                          const std::string& footer) {
  auto app = std::make_unique<CLI::App>(summary, "plateau " + name);
  app->allow_extras(true);
  app->footer(footer);
  auto formatter = std::make_shared<UsageFirst>();
  formatter->column_width(28);
  app->formatter(formatter);
  return app;
}

std::optional<int> ParseCommandLine(CLI::App& app, const std::vector<std::string>& args,
                                    std::ostream& out, std::ostream& err) {
  const std::string prefix = "plateau " + CommandName(app) + ": ";
  const std::string see = " (see plateau " + CommandName(app) + " --help)\n";
  try {
    app.parse(std::vector<std::string>(args.rbegin(), args.rend()));  // CLI11 wants them reversed
  } catch (const CLI::CallForHelp&) {
    out << app.help();
    return 0;
  } catch (const CLI::ParseError& e) {
    err << prefix << e.what() << see;
    return 2;
  }
  // Extras are what no declaration took: an option we do not know, or one argument too many. The
  // first is named.
  const std::vector<std::string> extras = app.remaining();
  if (extras.empty()) return std::nullopt;
  const std::string& extra = extras.front();
  err << prefix << (extra.rfind('-', 0) == 0 ? "unknown option " : "unexpected argument ") << extra
      << see;
  return 2;
}

CLI::Validator ValueCheck(const std::function<bool(const std::string&)>& accept,
                          const std::string& expected) {
  return CLI::Validator(
      [accept, expected](std::string& value) {
        return accept(value) ? std::string() : expected + "; got '" + value + "'";
      },
      "", "");
}

std::optional<double> FiniteNumber(const std::string& text) {
  double value = 0.0;
  const auto [ptr, ec] = std::from_chars(text.data(), text.data() + text.size(), value);
  if (ec != std::errc() || ptr != text.data() + text.size() || !std::isfinite(value)) {
    return std::nullopt;
  }
  return value;
}

}  // namespace plateau
