#include "flapline/studies/design.hpp"

#include <charconv>
#include <cmath>
#include <cstdio>
#include <random>
#include <sstream>

#include "flapline/common/errors.hpp"

namespace flapline::studies {
namespace {

std::string trim(const std::string& s) {
  const auto a = s.find_first_not_of(" \t"), b = s.find_last_not_of(" \t");
  return a == std::string::npos ? std::string() : s.substr(a, b - a + 1);
}

std::vector<std::string> split(const std::string& s, char sep) {
  std::vector<std::string> out;
  std::stringstream ss(s);
  std::string part;
  while (std::getline(ss, part, sep)) out.push_back(trim(part));
  if (!s.empty() && s.back() == sep) out.emplace_back();
  return out;
}

/// A finite number, or an InputError naming the option and the key.
double number(const std::string& text, const std::string& what, const std::string& key,
              const std::string& spec) {
  double v = 0;
  const char* end = text.data() + text.size();
  const auto r = std::from_chars(text.data(), end, v);
  if (text.empty() || r.ec != std::errc() || r.ptr != end || !std::isfinite(v))
    throw InputError(what + " " + key, "'" + spec + "'",
                     "'" + text +
                         "' is not a number; VALUES is a list a,b,c, a range "
                         "start:stop:count or log:start:stop:count");
  return v;
}

int whole(const std::string& text, const std::string& what, const std::string& key,
          const std::string& spec) {
  const double v = number(text, what, key, spec);
  if (v != std::floor(v) || v < 2 || v > 1e7)
    throw InputError(what + " " + key, "'" + spec + "'",
                     "the count of a range must be a whole number in [2, 10000000]");
  return static_cast<int>(v);
}

}  // namespace

std::string shortest(double v) {
  if (v == 0.0) return "0";  // never "-0"
  char buf[32];
  const auto r = std::to_chars(buf, buf + sizeof buf, v);
  return std::string(buf, r.ptr);
}

KeyValues parse_vary(const std::string& spec, const std::string& what) {
  const auto eq = spec.find('=');
  if (eq == std::string::npos || trim(spec.substr(0, eq)).empty())
    throw InputError(what, "'" + spec + "'", "must be KEY=VALUES, e.g. gait.frequency=20:30:6");
  KeyValues kv;
  kv.key = trim(spec.substr(0, eq));
  const std::string values = trim(spec.substr(eq + 1));
  if (values.empty()) throw InputError(what + " " + kv.key, "'" + spec + "'", "VALUES is empty");
  const std::vector<std::string> parts = split(values, ':');
  const bool log = parts.size() > 1 && parts[0] == "log";
  if (parts.size() == 1) {  // a list
    kv.kind = KeyValues::Kind::list;
    for (const std::string& t : split(values, ',')) {
      kv.numbers.push_back(number(t, what, kv.key, spec));
      kv.texts.push_back(t);
    }
    kv.low = kv.high = kv.numbers.front();
    for (double v : kv.numbers) kv.low = std::min(kv.low, v), kv.high = std::max(kv.high, v);
    return kv;
  }
  const std::size_t first = log ? 1 : 0;
  const std::size_t n = parts.size() - first;
  if (n != 2 && n != 3)
    throw InputError(what + " " + kv.key, "'" + spec + "'",
                     "a range is start:stop:count or log:start:stop:count");
  kv.kind = log ? KeyValues::Kind::log : KeyValues::Kind::linear;
  kv.low = number(parts[first], what, kv.key, spec);
  kv.high = number(parts[first + 1], what, kv.key, spec);
  if (log && !(kv.low > 0 && kv.high > 0))
    throw InputError(what + " " + kv.key, "'" + spec + "'",
                     "both bounds of a log range must be positive");
  if (n == 3) {
    kv.count = whole(parts[first + 2], what, kv.key, spec);
    for (int i = 0; i < kv.count; ++i) {
      const double v =
          log ? kv.low * std::pow(kv.high / kv.low, static_cast<double>(i) / (kv.count - 1))
              : kv.low + static_cast<double>(i) * (kv.high - kv.low) / (kv.count - 1);
      // The bounds themselves, exactly (a rounded last point could leave the key's range).
      const double exact = i == 0 ? kv.low : i == kv.count - 1 ? kv.high : v;
      kv.numbers.push_back(exact);
      kv.texts.push_back(shortest(exact));
    }
  }
  return kv;
}

std::vector<std::string> varied_keys(const Design& design) {
  std::vector<std::string> out;
  for (const KeyValues& k : design.keys) out.push_back(k.key);
  return out;
}

std::vector<std::vector<double>> latin_hypercube(int samples, int dims, std::uint64_t seed) {
  std::mt19937_64 gen(seed);
  auto uniform = [&gen] { return static_cast<double>(gen() >> 11) * 0x1.0p-53; };  // [0, 1)
  std::vector<std::vector<double>> out(static_cast<std::size_t>(samples),
                                       std::vector<double>(static_cast<std::size_t>(dims)));
  std::vector<int> perm(static_cast<std::size_t>(samples));
  for (int j = 0; j < dims; ++j) {
    for (int i = 0; i < samples; ++i) perm[static_cast<std::size_t>(i)] = i;
    for (int i = samples - 1; i > 0; --i) {  // Fisher–Yates
      const int r = std::min(i, static_cast<int>(uniform() * (i + 1)));
      std::swap(perm[static_cast<std::size_t>(i)], perm[static_cast<std::size_t>(r)]);
    }
    for (int i = 0; i < samples; ++i)
      out[static_cast<std::size_t>(i)][static_cast<std::size_t>(j)] =
          (perm[static_cast<std::size_t>(i)] + uniform()) / samples;
  }
  return out;
}

std::vector<CaseSpec> make_cases(const Design& design) {
  std::vector<CaseSpec> cases;
  const std::size_t dims = design.keys.size();
  if (design.kind == DesignKind::grid || design.kind == DesignKind::one_at_a_time)
    for (const KeyValues& k : design.keys)
      if (k.texts.empty())
        throw InputError("--vary " + k.key, shortest(k.low) + ":" + shortest(k.high),
                         "a range needs a count here: start:stop:count");
  switch (design.kind) {
    case DesignKind::grid: {
      std::size_t total = dims == 0 ? 0 : 1;
      for (const KeyValues& k : design.keys) {
        if (total > kMaxCases / std::max<std::size_t>(k.texts.size(), 1))
          throw InputError(
              "--vary", "a grid of more than " + std::to_string(kMaxCases) + " cases",
              "a sweep holds at most " + std::to_string(kMaxCases) +
                  " cases; use fewer values, shards of a latin design, or several sweeps");
        total *= k.texts.size();
      }
      cases.reserve(total);
      std::vector<std::size_t> idx(dims, 0);
      for (std::size_t c = 0; c < total; ++c) {
        CaseSpec cs;
        for (std::size_t j = 0; j < dims; ++j)
          cs.overrides.push_back({design.keys[j].key, design.keys[j].texts[idx[j]], false});
        cases.push_back(std::move(cs));
        for (std::size_t j = dims; j-- > 0;) {  // the last key varies fastest
          if (++idx[j] < design.keys[j].texts.size()) break;
          idx[j] = 0;
        }
      }
      break;
    }
    case DesignKind::one_at_a_time:
      for (const KeyValues& k : design.keys)
        for (const std::string& t : k.texts) cases.push_back({{{k.key, t, false}}});
      break;
    case DesignKind::latin: {
      if (design.samples < 1)
        throw InputError("--samples", std::to_string(design.samples),
                         "a latin design needs --samples N with N >= 1");
      for (const KeyValues& k : design.keys)
        if (k.kind == KeyValues::Kind::list)
          throw InputError("--vary " + k.key, "'" + k.texts.front() + ",...'",
                           "a latin design samples ranges: give start:stop or log:start:stop");
      const auto u = latin_hypercube(design.samples, static_cast<int>(dims), design.seed);
      for (const auto& row : u) {
        CaseSpec cs;
        for (std::size_t j = 0; j < dims; ++j) {
          const KeyValues& k = design.keys[j];
          const double v = k.kind == KeyValues::Kind::log ? k.low * std::pow(k.high / k.low, row[j])
                                                          : k.low + row[j] * (k.high - k.low);
          cs.overrides.push_back({k.key, shortest(v), false});
        }
        cases.push_back(std::move(cs));
      }
      break;
    }
    case DesignKind::table:
      break;  // explicit cases come from a table, not from here
  }
  return cases;
}

void Fingerprint::add(const std::string& text) {
  for (unsigned char c : text) {
    h_ ^= c;
    h_ *= 1099511628211ull;
  }
  // A separator, so that ("ab", "c") and ("a", "bc") differ.
  h_ ^= 0xff;
  h_ *= 1099511628211ull;
}

std::string Fingerprint::hex() const {
  char buf[20];
  std::snprintf(buf, sizeof buf, "%016llx", static_cast<unsigned long long>(h_));
  return buf;
}

}  // namespace flapline::studies
