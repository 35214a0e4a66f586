#include "flapline/common/errors.hpp"

#include <cstdio>

namespace flapline {

InputError::InputError(std::string key, std::string value, std::string allowed, std::string hint)
    : std::runtime_error(key),
      key_(std::move(key)),
      value_(std::move(value)),
      allowed_(std::move(allowed)),
      hint_(std::move(hint)) {
  compose();
}

void InputError::locate(std::string file, int line) {
  file_ = std::move(file);
  line_ = line;
  compose();
}

void InputError::compose() {
  message_.clear();
  if (!file_.empty()) {
    message_ += file_;
    if (line_ > 0) message_ += ":" + std::to_string(line_);
    message_ += ": ";
  }
  if (key_ == "(file)" && !file_.empty()) {  // the file itself: its name says it all
    message_ += allowed_;
    if (!hint_.empty()) message_ += " (" + hint_ + ")";
    return;
  }
  message_ += "key '" + key_ + "'";
  if (!value_.empty()) message_ += " = " + value_;
  message_ += ": " + allowed_;
  if (!hint_.empty()) message_ += " (" + hint_ + ")";
}

namespace {
std::string numerical_message(double time, const std::string& where, const std::string& quantity) {
  return "non-finite " + quantity + " at t = " + format_number(time) + " s, " + where +
         " (reduce the time step, check the gait for very fast motion, or choose a start from "
         "rest)";
}
}  // namespace

NumericalError::NumericalError(double time, std::string where, std::string quantity)
    : std::runtime_error(numerical_message(time, where, quantity)),
      time_(time),
      where_(std::move(where)),
      quantity_(std::move(quantity)) {}

std::string format_number(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

}  // namespace flapline
