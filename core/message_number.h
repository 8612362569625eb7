// How core's messages (warnings, reasons, descriptions) write a number: three significant digits,
// enough to read and short enough for one line. Pure; no state.
#ifndef PLATEAU_CORE_MESSAGE_NUMBER_H_
#define PLATEAU_CORE_MESSAGE_NUMBER_H_

#include <string>

namespace plateau {

// `value` with three significant digits (0.0123, 1.5e+03); nan and inf as the stream writes them.
std::string MessageNumber(double value);

}  // namespace plateau

#endif  // PLATEAU_CORE_MESSAGE_NUMBER_H_
