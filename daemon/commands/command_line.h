// The command line of every subcommand, through CLI11: one declaration per command gives both its
// parser and its --help text, and every command answers a bad command line the same way.
// Owns no command's options; used on the calling thread only.
#ifndef PLATEAU_DAEMON_COMMANDS_COMMAND_LINE_H_
#define PLATEAU_DAEMON_COMMANDS_COMMAND_LINE_H_

#include <CLI/CLI.hpp>
#include <functional>
#include <memory>
#include <optional>
#include <ostream>
#include <string>
#include <vector>

namespace plateau {

// An empty declaration for `plateau NAME` ("analyze"): `summary` goes above the option list,
// `footer` (exit statuses, examples) below it. Unknown options are collected, not thrown, so
// that ParseCommandLine can name them in our own words.
std::unique_ptr<CLI::App> MakeCommandLine(const std::string& name, const std::string& summary,
                                          const std::string& footer);

// Parses `args` (without the command's name) into the variables `app` declares. Returns nullopt
// when the command should go on; otherwise the exit status to return: 0 after printing the help
// to `out` (-h, --help), 2 after one line on `err`, always of the shape
//   plateau NAME: unknown option --x (see plateau NAME --help)
//   plateau NAME: --confidence: takes a fraction ... (see plateau NAME --help)
std::optional<int> ParseCommandLine(CLI::App& app, const std::vector<std::string>& args,
                                    std::ostream& out, std::ostream& err);

// A check for an option's value: passes when `accept` holds, else refuses with
// "<expected>; got '<value>'" (e.g. expected = "takes a fraction between 0 and 1").
CLI::Validator ValueCheck(const std::function<bool(const std::string&)>& accept,
                          const std::string& expected);

// Whole text to a finite number; nullopt for anything else ("1e3" yes, "1e3x", "nan" no).
std::optional<double> FiniteNumber(const std::string& text);

}  // namespace plateau

#endif  // PLATEAU_DAEMON_COMMANDS_COMMAND_LINE_H_
