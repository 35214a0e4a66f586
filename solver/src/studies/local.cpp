#include "flapline/studies/local.hpp"

#include <cmath>
#include <limits>

#include "flapline/simulation/summary_keys.hpp"

namespace flapline::studies {

std::vector<Parameter> Parameter::flight_state() {
  std::vector<Parameter> out;
  const char* names[6] = {"u", "v", "w", "p", "q", "r"};
  for (int i = 0; i < 6; ++i) {
    Parameter p;
    p.name = names[i];
    p.kind = i < 3 ? Kind::velocity : Kind::rate;
    p.axis = i % 3;
    out.push_back(p);
  }
  return out;
}

CaseSpec case_at(const std::vector<Parameter>& params, const Eigen::VectorXd& x,
                 const CaseSpec& base) {
  CaseSpec c = base;
  for (std::size_t i = 0; i < params.size(); ++i) {
    const Parameter& p = params[i];
    const double v = x(static_cast<Eigen::Index>(i));
    switch (p.kind) {
      case Parameter::Kind::key:
        c.overrides.push_back({p.name, shortest(v), false});
        break;
      case Parameter::Kind::velocity:
        c.velocity_offset[static_cast<std::size_t>(p.axis)] += v;
        break;
      case Parameter::Kind::rate:
        c.rates_offset[static_cast<std::size_t>(p.axis)] += v;
        break;
    }
  }
  return c;
}

std::vector<RunSummary> evaluate(const std::vector<CaseSpec>& cases,
                                 const CaseBuilderFactory& factory, const RunnerOptions& options) {
  std::vector<RunSummary> out(cases.size());
  std::vector<std::size_t> all(cases.size());
  for (std::size_t i = 0; i < all.size(); ++i) all[i] = i;
  std::size_t done = 0;
  run_cases(cases, all, factory, options, [&](std::size_t i, const RunSummary& s) {
    out[i] = s;
    ++done;
  });
  if (done < cases.size()) throw Interrupted();  // stopped: a partial set is no result
  return out;
}

double summary_value(const RunSummary& s, const std::string& path) {
  const SummaryKey* k = find_summary_key(path);
  if (!k) return std::numeric_limits<double>::quiet_NaN();
  const std::optional<double> v = k->value(s);
  return v ? *v : std::numeric_limits<double>::quiet_NaN();
}

QuantityKind quantity_kind(const std::string& path) {
  auto ends = [&path](const char* suffix) {
    const std::string s(suffix);
    return path.size() >= s.size() && path.compare(path.size() - s.size(), s.size(), s) == 0;
  };
  if (ends("_Nm")) return QuantityKind::moment;
  if (ends("_N")) return QuantityKind::force;
  return QuantityKind::other;
}

}  // namespace flapline::studies
