#include "flapline/io/resolved.hpp"

#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "flapline/common/math.hpp"
#include "flapline/studies/design.hpp"
#include "flapline/version.hpp"

namespace flapline::io {
namespace {

using json = nlohmann::ordered_json;

/// A value stored in SI as typed in `unit` (1/kDegree for degrees): the shortest decimal in that
/// unit that converts back to exactly the stored double, so 60° reads 60 rather than
/// 59.99999999999999 and reloading gives the same bits.
double typed(double si, double per_unit) {
  if (per_unit == 1.0 || !std::isfinite(si)) return si;
  const double unit_value = si / per_unit;
  char buf[40];
  for (int digits = 1; digits <= 17; ++digits) {
    std::snprintf(buf, sizeof buf, "%.*g", digits, unit_value);
    const double v = std::strtod(buf, nullptr);
    if (v * per_unit == si) return v;
  }
  return unit_value;
}

/// `per_unit`: SI value of one typed unit (kDegree for deg/s).
json vec(const Eigen::Vector3d& v, double per_unit = 1.0) {
  return json::array({typed(v.x(), per_unit), typed(v.y(), per_unit), typed(v.z(), per_unit)});
}

/// One waveform in the grammar of configs/README.md ("Waveforms"); `scale` converts to the
/// value's unit as typed (deg for angles).
json waveform(const WaveformSpec& w, double scale) {
  json j;
  j["shape"] = std::string(to_string(w.shape));
  switch (w.shape) {
    case WaveShape::harmonic:
      j["mean"] = typed(w.mean, scale);
      j["amplitude"] = typed(w.amplitude, scale);
      j["phase"] = typed(w.phase, kDegree);
      break;
    case WaveShape::fourier: {
      j["mean"] = typed(w.mean, scale);
      j["phase"] = typed(w.phase, kDegree);
      json h = json::array();
      for (std::size_t n = 0; n < w.harmonic_amplitudes.size(); ++n)
        h.push_back(json{{"amplitude", typed(w.harmonic_amplitudes[n], scale)},
                         {"phase", typed(w.harmonic_phases[n], kDegree)}});
      j["harmonics"] = h;
      break;
    }
    case WaveShape::smoothed_triangle:
    case WaveShape::smoothed_square:
      j["mean"] = typed(w.mean, scale);
      j["amplitude"] = typed(w.amplitude, scale);
      j["phase"] = typed(w.phase, kDegree);
      j["sharpness"] = w.sharpness;
      break;
    case WaveShape::table: {
      j["phase"] = typed(w.phase, kDegree);
      json rows = json::array();
      for (std::size_t i = 0; i < w.table_fraction.size(); ++i)
        rows.push_back(json::array({w.table_fraction[i], typed(w.table_value[i], scale)}));
      j["points"] = rows;
      break;
    }
    case WaveShape::step:
      j["mean"] = typed(w.mean, scale);
      j["amplitude"] = typed(w.amplitude, scale);
      j["delay"] = w.delay;
      break;
  }
  return j;
}

json wing_gait(const WingGaitSpec& g) {
  return json{{"stroke", waveform(g.stroke, kDegree)},
              {"deviation", waveform(g.deviation, kDegree)},
              {"pitch", waveform(g.pitch, kDegree)},
              {"span_ratio", waveform(g.span_ratio, 1.0)}};
}

json wing(const ModelSpec& s) {
  const PlanformSpec& p = s.wing;
  json j;
  j["planform"] = std::string(to_string(p.shape));
  j["span"] = p.span;
  switch (p.shape) {
    case PlanformShape::rectangular:
      j["chord"] = p.chord;
      break;
    case PlanformShape::elliptic:
      j["root_chord"] = p.root_chord;
      break;
    case PlanformShape::tapered:
      j["root_chord"] = p.root_chord;
      j["tip_chord"] = p.tip_chord;
      break;
    case PlanformShape::beta:
      j["mean_chord"] = p.mean_chord;
      j["first_moment_radius"] = p.first_moment_radius;
      j["second_moment_radius"] = p.second_moment_radius;
      break;
    case PlanformShape::table: {
      json rows = json::array();
      for (std::size_t i = 0; i < p.table_span_fraction.size(); ++i)
        rows.push_back(
            json::array({p.table_span_fraction[i], p.table_chord[i], p.table_leading_edge[i]}));
      j["table"] = rows;
      break;
    }
  }
  if (p.shape != PlanformShape::table) j["pitch_axis"] = p.pitch_axis;
  j["hinge"] = vec(p.hinge);
  j["twist_root"] = typed(p.twist_root, kDegree);
  j["twist_tip"] = typed(p.twist_tip, kDegree);
  j["strips"] = s.strips.count;
  j["strip_spacing"] = std::string(to_string(s.strips.spacing));
  const WingMassSpec& m = s.wing_mass;
  if (m.any()) {
    json mass;
    if (m.total > 0.0) mass["total"] = m.total;
    if (!m.table_span_fraction.empty()) {
      json rows = json::array();
      for (std::size_t i = 0; i < m.table_span_fraction.size(); ++i)
        rows.push_back(json::array(
            {m.table_span_fraction[i], m.table_mass_per_span[i], m.table_centre_fraction[i]}));
      mass["per_span"] = rows;
    }
    if (!m.points.empty()) {
      json rows = json::array();
      for (const PointMassSpec& q : m.points)
        rows.push_back(json::array({q.span_fraction, q.chord_fraction, q.mass}));
      mass["points"] = rows;
    }
    j["mass"] = mass;
  }
  return j;
}

json model_options(const AeroOptions& o) {
  json j;
  j["kind"] = std::string(to_string(o.kind));
  j["coefficient_law"] = std::string(to_string(o.law));
  j["suction_recovery"] = o.suction_recovery;
  j["vortex_lift"] = o.vortex_lift;
  if (o.law == CoefficientLaw::revolving_fit) {
    const RevolvingFit& f = o.fit;
    j["fit"] = json{{"lift_offset", f.lift_offset}, {"lift_amplitude", f.lift_amplitude},
                    {"lift_rate", f.lift_rate},     {"lift_shift", f.lift_shift},
                    {"drag_offset", f.drag_offset}, {"drag_amplitude", f.drag_amplitude},
                    {"drag_rate", f.drag_rate},     {"drag_shift", f.drag_shift}};
  }
  j["wagner_fit"] = std::string(to_string(o.wagner_fit));
  j["reverse_flow"] = std::string(to_string(o.reverse_flow));
  j["span_coupling"] = std::string(to_string(o.span_coupling));
  j["line_solve"] = std::string(to_string(o.line_solve));
  j["profile_drag"] = json{{"law", std::string(to_string(o.profile_drag.law))},
                           {"coefficient", o.profile_drag.coefficient}};
  j["inflow"] = std::string(to_string(o.inflow));
  j["inflow_relaxation"] = o.inflow_relaxation;
  return j;
}

json simulation(const SimulationOptions& o) {
  json j;
  j["steps_per_cycle"] = o.steps_per_cycle;
  j["samples_per_cycle"] = o.samples_per_cycle;
  j["min_cycles"] = o.min_cycles;
  j["max_cycles"] = o.max_cycles;
  j["tolerance"] = o.tolerance;
  j["start"] = std::string(to_string(o.start));
  j["spanwise_phases"] = o.spanwise_phases;
  j["history"] = std::string(to_string(o.history));
  j["integrator"] = std::string(to_string(o.integrator));
  j["cache_mib"] = o.cache_mib;
  return j;
}

void emit(YAML::Emitter& out, const json& j) {
  if (j.is_object()) {
    out << YAML::BeginMap;
    for (auto it = j.begin(); it != j.end(); ++it) {
      out << YAML::Key << it.key() << YAML::Value;
      emit(out, it.value());
    }
    out << YAML::EndMap;
  } else if (j.is_array()) {
    const bool flat =
        std::all_of(j.begin(), j.end(), [](const json& e) { return e.is_primitive(); });
    out << (flat ? YAML::Flow : YAML::Block) << YAML::BeginSeq;
    for (const json& e : j) emit(out, e);
    out << YAML::EndSeq;
  } else if (j.is_number_float()) {
    out << studies::shortest(j.get<double>());  // reads back as the same double; never -0
  } else if (j.is_number_integer()) {
    out << j.get<long long>();
  } else if (j.is_boolean()) {
    out << j.get<bool>();
  } else {
    out << j.get<std::string>();
  }
}

}  // namespace

json resolved_configuration(const Model& model) {
  const ModelSpec& s = model.spec();
  json j;
  j["title"] = s.title;
  j["wing"] = wing(s);
  json gait;
  gait["frequency"] = s.gait.frequency;
  gait["stroke_plane_angle"] = typed(s.gait.stroke_plane_angle, kDegree);
  gait["plunge"] = waveform(s.gait.plunge, 1.0);
  gait["right"] = wing_gait(s.gait.right);
  gait["left"] = wing_gait(s.gait.left);
  j["gait"] = gait;
  // The flight as the run used it: a flight condition is resolved into velocity and rates.
  const FlightSpec& f = model.flight();
  j["flight"] =
      json{{"velocity", vec(f.velocity)}, {"rates", vec(f.rates, kDegree)}, {"wind", vec(f.wind)}};
  j["air"] = json{{"density", model.air().density},
                  {"kinematic_viscosity", model.air().kinematic_viscosity}};
  if (const auto& v = model.vehicle()) {
    j["vehicle"] = json{
        {"mass", v->mass},
        {"inertia", json{{"xx", v->ixx}, {"yy", v->iyy}, {"zz", v->izz}, {"xz", v->ixz}}},
        {"drag_area", v->drag_area},
        {"attitude", json{{"roll", typed(v->roll, kDegree)}, {"pitch", typed(v->pitch, kDegree)}}}};
  }
  j["model"] = model_options(model.aero_options());
  j["simulation"] = simulation(model.simulation());
  return j;
}

std::string resolved_yaml(const Model& model) {
  YAML::Emitter out;
  emit(out, resolved_configuration(model));
  return "# The full configuration flapline " + std::string(kVersion) +
         " ran: every key with the value used, defaults filled in\n# (configs/README.md). "
         "Run it again with: flapline run resolved.yaml\n" +
         std::string(out.c_str()) + "\n";
}

}  // namespace flapline::io
