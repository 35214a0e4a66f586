#pragma once
/// \file
/// to_string / from_string for every enum that appears in YAML or in reports.
///
/// Each enum specialises EnumNames<E> with a table of {value, name}; the free templates below do
/// the rest, so adding an option value is one line in its table.

#include <array>
#include <optional>
#include <string>
#include <string_view>
#include <utility>

namespace flapline {

template <class E>
struct EnumNames;  // specialise: static constexpr std::array<std::pair<E, std::string_view>, N>
                   // items

/// Name of an enum value as written in YAML and reports.
template <class E>
constexpr std::string_view to_string(E value) {
  for (const auto& item : EnumNames<E>::items)
    if (item.first == value) return item.second;
  return "?";
}

/// Parse a name; nullopt when the name is not one of the allowed ones.
template <class E>
std::optional<E> from_string(std::string_view name) {
  for (const auto& item : EnumNames<E>::items)
    if (item.second == name) return item.first;
  return std::nullopt;
}

/// "a | b | c": the allowed names, for error messages and docs.
template <class E>
std::string allowed_names() {
  std::string out;
  for (const auto& item : EnumNames<E>::items) {
    if (!out.empty()) out += " | ";
    out += item.second;
  }
  return out;
}

}  // namespace flapline
