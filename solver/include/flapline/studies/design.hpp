#pragma once
/// \file
/// Designs of a study (DESIGN §9): which cases to run, each as a list of key-path overrides of
/// one base configuration (the `--set` grammar). Nothing here reads files or YAML: the io layer
/// turns an override list into a Model (studies/runner.hpp, CaseBuilder).
///
/// VALUES grammar of `--vary KEY=VALUES`:
///   a,b,c                      a list (the texts are kept as typed)
///   start:stop:count           inclusive linear range, vᵢ = start + i·(stop − start)/(count − 1)
///   log:start:stop:count       inclusive geometric range, vᵢ = start·(stop/start)^(i/(count − 1))
/// A latin design uses only a range's bounds; there `start:stop` and `log:start:stop` may omit
/// the count. Generated numbers are written in shortest round-trip form, so the text a case
/// carries parses back to exactly the double the design computed.

#include <array>
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "flapline/common/enum_names.hpp"

namespace flapline::studies {

/// One override of a case: `key=text` (text in YAML flow syntax), or the removal of the key.
struct Override {
  std::string key;
  std::string text;
  bool remove = false;
  bool operator==(const Override& o) const {
    return key == o.key && text == o.text && remove == o.remove;
  }
};

/// One case of a study: its overrides of the base configuration, in column order.
struct CaseSpec {
  std::vector<Override> overrides;
  std::size_t source = 0;  ///< which base configuration (a comparison of several files)
  /// Added to the body's velocity (m/s) and rates (rad/s) after they are resolved (stability
  /// derivatives perturb the flight state even when a flight condition derives it).
  std::array<double, 3> velocity_offset{0, 0, 0}, rates_offset{0, 0, 0};
};

/// The values one key takes.
struct KeyValues {
  enum class Kind { list, linear, log };
  std::string key;
  Kind kind = Kind::list;
  std::vector<std::string> texts;  ///< the values as they go into the config
  std::vector<double> numbers;     ///< the same as numbers
  double low = 0, high = 0;        ///< bounds of a range (start, stop as given)
  int count = 0;                   ///< points of a range (0: not given; latin only)
};

/// Parse `KEY=VALUES` (`what` names the option in messages, e.g. "--vary"). Throws InputError
/// with key `what` naming the problem: no '=', an empty key, a malformed number, count < 2 (1
/// for a single point is refused: use --set), log bounds not both positive.
KeyValues parse_vary(const std::string& spec, const std::string& what = "--vary");

enum class DesignKind { grid, one_at_a_time, latin, table };
}  // namespace flapline::studies

namespace flapline {
template <>
struct EnumNames<studies::DesignKind> {
  static constexpr std::array<std::pair<studies::DesignKind, std::string_view>, 4> items{
      {{studies::DesignKind::grid, "grid"},
       {studies::DesignKind::one_at_a_time, "one_at_a_time"},
       {studies::DesignKind::latin, "latin"},
       {studies::DesignKind::table, "table"}}};
};
}  // namespace flapline

namespace flapline::studies {

/// A study design over the varied keys.
struct Design {
  DesignKind kind = DesignKind::grid;
  std::vector<KeyValues> keys;
  int samples = 0;         ///< latin: number of samples N
  std::uint64_t seed = 1;  ///< latin: seed of the generator
};

/// The most cases a design may hold.
inline constexpr std::size_t kMaxCases = 100000000;

/// The cases of a design, in case order:
/// - grid: every combination, the last key varying fastest;
/// - one_at_a_time: each key in turn through its values, the others at their base values (their
///   cells stay empty);
/// - latin: N samples of a Latin hypercube over the ranges' bounds (every stratum of every key
///   holds exactly one sample), reproducible on every platform from the seed.
/// Throws InputError for a latin design with a list or without samples.
std::vector<CaseSpec> make_cases(const Design& design);

/// The column keys of a study's table: the varied keys in order.
std::vector<std::string> varied_keys(const Design& design);

/// Shortest text that parses back to exactly `v` (std::to_chars); never "-0".
std::string shortest(double v);

/// Latin hypercube on [0, 1)^dims with `samples` points from `seed`: row i, column j. Uses
/// std::mt19937_64's raw output (the standard's distributions differ between libraries) with
/// u = (x >> 11)·2⁻⁵³ and a Fisher–Yates permutation per column.
std::vector<std::vector<double>> latin_hypercube(int samples, int dims, std::uint64_t seed);

/// 64-bit FNV-1a hash, hex (fingerprints of study inputs).
class Fingerprint {
 public:
  void add(const std::string& text);
  std::string hex() const;

 private:
  std::uint64_t h_ = 14695981039346656037ull;
};

}  // namespace flapline::studies
