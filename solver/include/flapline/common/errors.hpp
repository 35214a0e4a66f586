#pragma once
/// \file
/// The two error channels of flapline (see DEVELOPERS.md): a user's input that breaks a documented
/// rule raises InputError; a run whose numbers blow up raises NumericalError. Broken internal
/// invariants are `assert`s, never exceptions.

#include <stdexcept>
#include <string>

namespace flapline {

/// A value given by the user broke a documented rule.
///
/// The core fills `key` (the dotted key path, the same one the YAML file uses, e.g. `wing.span`),
/// `value`, `allowed` and an optional `hint`; the io layer adds the file and line with locate().
class InputError : public std::runtime_error {
 public:
  InputError(std::string key, std::string value, std::string allowed, std::string hint = {});

  const std::string& key() const noexcept { return key_; }
  const std::string& value() const noexcept { return value_; }
  const std::string& allowed() const noexcept { return allowed_; }
  const std::string& hint() const noexcept { return hint_; }
  const std::string& file() const noexcept { return file_; }
  /// 1-based line number in `file`, 0 when unknown (a key given on the command line).
  int line() const noexcept { return line_; }

  /// Record where the offending key was written; updates what().
  void locate(std::string file, int line);

  /// Mark the error as a rule between keys (the value is fine alone but not with the others':
  /// e.g. r̂₂ against r̂₁, a key that does not apply to the chosen shape). Studies check each
  /// value alone before any case runs and leave such rules to the cases.
  InputError& between_keys() {
    between_keys_ = true;
    return *this;
  }
  bool is_between_keys() const noexcept { return between_keys_; }
  /// The same error under another key path (keeps the between-keys mark; not the location).
  InputError rekeyed(std::string key) const {
    InputError e(std::move(key), value_, allowed_, hint_);
    e.between_keys_ = between_keys_;
    return e;
  }

  /// The one-line message: `file:line: key: value V; allowed: A (hint)`.
  const char* what() const noexcept override { return message_.c_str(); }

 private:
  void compose();
  std::string key_, value_, allowed_, hint_, file_, message_;
  int line_ = 0;
  bool between_keys_ = false;
};

/// A NaN or an infinity appeared during a run: names the time, the wing and strip and the quantity.
class NumericalError : public std::runtime_error {
 public:
  NumericalError(double time, std::string where, std::string quantity);
  double time() const noexcept { return time_; }
  const std::string& where() const noexcept { return where_; }
  const std::string& quantity() const noexcept { return quantity_; }

 private:
  double time_;
  std::string where_, quantity_;
};

/// Format a double for messages with up to 6 significant digits.
std::string format_number(double v);

}  // namespace flapline
