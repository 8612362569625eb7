#include "core/message_number.h"

#include <sstream>

namespace plateau {

std::string MessageNumber(double value) {
  std::ostringstream out;
  out.precision(3);
  out << value;
  return out.str();
}

}  // namespace plateau
