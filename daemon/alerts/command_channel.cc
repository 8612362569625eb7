#include "daemon/alerts/command_channel.h"

#include "daemon/alerts/alert_message.h"
#include "daemon/alerts/command_runner.h"

namespace plateau {
namespace {

// The output on one log line: at most 500 bytes, line ends shown as '|'.
std::string FirstLines(const std::string& output) {
  std::string shown = output.substr(0, 500);
  for (char& c : shown) c = c == '\n' ? '|' : c;
  return shown;
}

}  // namespace

void CommandChannel::Deliver(const std::vector<EventRow>& events,
                             std::function<void(const Status&)> done) {
  const EventRow& event = events.front();
  const AlertMessage message = ComposeAlert(event, config_);
  RunAlertCommand(io_, *config_.alerts.command, message.environment,
                  [log = log_, id = event.id, kind = event.kind,
                   done = std::move(done)](const CommandResult& result) {
                    log->info("alert command for event {} ({}): {}{}", id, EventKindName(kind),
                              result.status.ok() ? "exit status 0" : result.status.message(),
                              result.output.empty() ? "" : "; output: " + FirstLines(result.output));
                    done(result.status);
                  });
}

}  // namespace plateau
