#include "flapline/io/comparison.hpp"

#include <cmath>
#include <cstdio>
#include <limits>

#include "flapline/io/plots.hpp"
#include "flapline/io/run_plots.hpp"

namespace flapline::io {
namespace {

double or_nan(const std::optional<double>& v) {
  return v ? *v : std::numeric_limits<double>::quiet_NaN();
}

std::string cell(double v) {
  if (!std::isfinite(v)) return "n/a";
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

Series last_cycle_series(const RunSummary& s, const std::string& title, bool power) {
  Series out;
  out.title = title;
  const double start = (s.cycles - 1) / s.frequency;
  for (const HistoryRow& r : s.history) {
    const double phase = (r.loads.time - start) * s.frequency;
    if (phase < -1e-9 || phase >= 1.0 - 1e-9) continue;
    out.x.push_back(std::max(0.0, phase));
    out.y.push_back(power ? r.loads.power_air : -r.loads.total.force.z());
  }
  return out;
}

}  // namespace

const std::vector<ComparedQuantity>& compared_quantities() {
  static const std::vector<ComparedQuantity> q{
      {"mean lift (N)", [](const RunSummary& s) { return s.shown_force(s.mean_lift()); }},
      {"mean thrust (N)", [](const RunSummary& s) { return s.shown_force(s.mean_thrust()); }},
      {"mean side force (N)",
       [](const RunSummary& s) { return s.shown_force(s.mean_side_force()); }},
      {"mean roll moment L (N m)",
       [](const RunSummary& s) { return s.shown_moment(s.averages.mean.moment.x()); }},
      {"mean pitch moment M (N m)",
       [](const RunSummary& s) { return s.shown_moment(s.averages.mean.moment.y()); }},
      {"mean yaw moment N (N m)",
       [](const RunSummary& s) { return s.shown_moment(s.averages.mean.moment.z()); }},
      {"mean power to the air (W)", [](const RunSummary& s) { return s.averages.power_air_mean; }},
      {"mean actuator power (W)",
       [](const RunSummary& s) { return s.averages.power_actuator_mean; }},
      {"mean mechanical power, perfect storage (W)",
       [](const RunSummary& s) { return s.averages.power_mechanical_storage_perfect; }},
      {"mean mechanical power, no storage (W)",
       [](const RunSummary& s) { return s.averages.power_mechanical_storage_none; }},
      {"lift / drive power, no storage (N/W)",
       [](const RunSummary& s) { return or_nan(s.derived.lift_per_power_storage_none); }},
      {"mean lift coefficient",
       [](const RunSummary& s) { return or_nan(s.derived.mean_lift_coefficient); }},
      {"aspect ratio of the pair", [](const RunSummary& s) { return s.derived.aspect_ratio; }},
      {"r2 hat", [](const RunSummary& s) { return s.derived.r2; }},
      {"Reynolds number", [](const RunSummary& s) { return or_nan(s.derived.reynolds_number); }},
      {"reduced frequency",
       [](const RunSummary& s) { return or_nan(s.derived.reduced_frequency); }},
      {"cycles to converge", [](const RunSummary& s) { return static_cast<double>(s.cycles); }}};
  return q;
}

std::string comparison_csv(const std::vector<ComparedCase>& cases) {
  std::string out = "quantity";
  for (const auto& c : cases) out += "," + c.name;
  out += "\n";
  for (const auto& q : compared_quantities()) {
    out += "\"" + q.label + "\"";
    for (const auto& c : cases) out += "," + cell(q.value(c.summary));
    out += "\n";
  }
  return out;
}

std::string comparison_markdown(const std::vector<ComparedCase>& cases,
                                const std::string& settings) {
  std::string out = "# flapline comparison\n\n" + settings + "\n\n| quantity |";
  for (const auto& c : cases) out += " " + c.name + " |";
  out += "\n|---|";
  for (std::size_t i = 0; i < cases.size(); ++i) out += "---:|";
  out += "\n";
  for (const auto& q : compared_quantities()) {
    out += "| " + q.label + " |";
    for (const auto& c : cases) out += " " + cell(q.value(c.summary)) + " |";
    out += "\n";
  }
  out += "\nCases: ";
  for (std::size_t i = 0; i < cases.size(); ++i)
    out += (i ? "; " : "") + cases[i].name + " = " + cases[i].summary.title;
  out += ".\n\nBody axes: x forward, y right wing, z down; lift = -Z, thrust = X. " +
         std::string(kCautions) + "\n";
  return out;
}

std::map<std::string, std::string> comparison_plots(const std::vector<ComparedCase>& cases) {
  std::map<std::string, std::string> files;
  Plot lift{"Lift over the last cycle",
            "phase of the wing-beat (cycle fraction)",
            "lift = -Z (N)",
            "",
            kAxesNote,
            {}};
  Plot power{"Power to the air over the last cycle",
             "phase of the wing-beat (cycle fraction)",
             "power (W)",
             "",
             "P = -sum(F . (v - wind) + C . omega)",
             {}};
  for (const auto& c : cases) {
    lift.series.push_back(last_cycle_series(c.summary, c.name, false));
    power.series.push_back(last_cycle_series(c.summary, c.name, true));
  }
  auto a = render(lift, "lift_overlay");
  auto b = render(power, "power_overlay");
  files.insert(a.begin(), a.end());
  files.insert(b.begin(), b.end());
  return files;
}

}  // namespace flapline::io
