#include "flapline/io/run_plots.hpp"

#include <cmath>

#include "flapline/common/math.hpp"
#include "flapline/io/plots.hpp"

namespace flapline::io {

const char* const kAxesNote =
    "body axes: x forward, y right wing, z down; lift = -Z, thrust = X\n"
    "L roll (+ right wing down), M pitch (+ nose up), N yaw (+ nose right)";

namespace {

/// Rows of the last whole cycle, with their phase in [0, 1).
std::vector<std::pair<double, const HistoryRow*>> last_cycle(const RunSummary& s) {
  std::vector<std::pair<double, const HistoryRow*>> out;
  const double start = (s.cycles - 1) / s.frequency;
  for (const HistoryRow& r : s.history) {
    const double phase = (r.loads.time - start) * s.frequency;
    if (phase > -1e-9 && phase < 1.0 - 1e-9) out.emplace_back(std::max(0.0, phase), &r);
  }
  return out;
}

template <class F>
Series history_series(const std::vector<std::pair<double, const HistoryRow*>>& rows,
                      const std::string& title, F value, int lt = 0, bool dashed = false) {
  Series s;
  s.title = title;
  for (const auto& [phase, row] : rows) {
    s.x.push_back(phase);
    s.y.push_back(value(*row));
  }
  s.line_type = lt;
  s.dashed = dashed;
  return s;
}

Series named(std::string title, std::string style) {
  Series s;
  s.title = std::move(title);
  s.style = std::move(style);
  return s;
}

void merge(std::map<std::string, std::string>& into, std::map<std::string, std::string> more) {
  into.insert(more.begin(), more.end());
}

std::string cycle_title(const RunSummary& s, const std::string& what) {
  return what + " over the last cycle\n" +
         (s.title.empty() ? std::string("flapline run") : s.title);
}

}  // namespace

std::map<std::string, std::string> run_plots(const RunSummary& s, const Model& model) {
  std::map<std::string, std::string> files;
  const auto rows = last_cycle(s);
  const std::string phase_label = "phase of the wing-beat (cycle fraction)";

  Plot forces{cycle_title(s, "Forces"), phase_label, "force (N)", "", kAxesNote, {}};
  forces.series = {
      history_series(
          rows, "X (thrust)", [](const HistoryRow& r) { return r.loads.total.force.x(); }, 1),
      history_series(
          rows, "Y (side)", [](const HistoryRow& r) { return r.loads.total.force.y(); }, 2),
      history_series(
          rows, "Z", [](const HistoryRow& r) { return r.loads.total.force.z(); }, 3),
      history_series(
          rows, "lift = -Z", [](const HistoryRow& r) { return -r.loads.total.force.z(); }, 4,
          true)};
  merge(files, render(forces, "forces"));

  Plot moments{cycle_title(s, "Moments about the body origin"),
               phase_label,
               "moment (N m)",
               "",
               kAxesNote,
               {}};
  moments.series = {
      history_series(
          rows, "L (roll)", [](const HistoryRow& r) { return r.loads.total.moment.x(); }, 1),
      history_series(
          rows, "M (pitch)", [](const HistoryRow& r) { return r.loads.total.moment.y(); }, 2),
      history_series(
          rows, "N (yaw)", [](const HistoryRow& r) { return r.loads.total.moment.z(); }, 3)};
  merge(files, render(moments, "moments"));

  Plot power{cycle_title(s, "Aerodynamic power"),
             phase_label,
             "power (W)",
             "",
             "power given to the air, and actuator power (velocities relative to the body)",
             {}};
  power.series = {
      history_series(
          rows, "to the air", [](const HistoryRow& r) { return r.loads.power_air; }, 1),
      history_series(
          rows, "actuator", [](const HistoryRow& r) { return r.loads.power_actuator; }, 2, true)};
  merge(files, render(power, "power"));

  // Drive: the generalised forces of the angle joints and the power of each wing.
  Plot torque{cycle_title(s, "Joint torques"),
              phase_label,
              "torque (N m)",
              "",
              "what each joint's drive supplies (aerodynamic + inertial" +
                  std::string(model.vehicle() ? " + the wing's weight" : "") +
                  "); solid: right wing, dashed: left wing",
              {}};
  const char* joint_name[3] = {"stroke", "deviation", "pitch"};
  const char* wing_name[2] = {"right", "left"};
  for (std::size_t w = 0; w < 2; ++w)
    for (std::size_t j = 0; j < 3; ++j)
      torque.series.push_back(history_series(
          rows, std::string(wing_name[w]) + " " + joint_name[j],
          [w, j](const HistoryRow& r) { return r.loads.drive[w].torque[j]; },
          static_cast<int>(j) + 1, w == 1));
  torque.key = "outside right top";
  merge(files, render(torque, "drive_torque"));

  Plot drive_power{cycle_title(s, "Drive power"),
                   phase_label,
                   "power (W)",
                   "",
                   "each wing's drive (sum over its joints) and its inertial part; solid: right, "
                   "dashed: left",
                   {}};
  for (std::size_t w = 0; w < 2; ++w) {
    drive_power.series.push_back(history_series(
        rows, std::string(wing_name[w]) + " wing",
        [w](const HistoryRow& r) { return r.loads.drive[w].power; }, 1, w == 1));
    drive_power.series.push_back(history_series(
        rows, std::string(wing_name[w]) + " inertial part",
        [w](const HistoryRow& r) { return r.loads.drive[w].power_inertial; }, 2, w == 1));
  }
  drive_power.key = "outside right top";
  merge(files, render(drive_power, "drive_power"));

  Plot angles{cycle_title(s, "Gait"),
              phase_label,
              "angle (deg)",
              "span ratio (-)",
              "stroke: + forward; deviation: + tip up; pitch: + leading edge up (relative to the "
              "stroke plane)",
              {}};
  const char* side_name[2] = {"right", "left"};
  // The span-ratio axis only when a wing folds (a constant 1 would read like an angle).
  bool folds = false;
  for (int w = 0; w < 2; ++w) {
    const Waveform& lam = model.motion(static_cast<Side>(w)).span_ratio;
    folds = folds || lam.maximum() - lam.minimum() > 1e-12;
  }
  if (!folds) angles.y2label.clear();
  for (std::size_t w = 0; w < 2; ++w) {
    const bool d = w == 1;
    angles.series.push_back(history_series(
        rows, std::string(side_name[w]) + " stroke",
        [w](const HistoryRow& r) { return r.angles[w].stroke / kDegree; }, 1, d));
    angles.series.push_back(history_series(
        rows, std::string(side_name[w]) + " deviation",
        [w](const HistoryRow& r) { return r.angles[w].deviation / kDegree; }, 2, d));
    angles.series.push_back(history_series(
        rows, std::string(side_name[w]) + " pitch",
        [w](const HistoryRow& r) { return r.angles[w].pitch / kDegree; }, 3, d));
    if (folds) {
      Series lam = history_series(
          rows, std::string(side_name[w]) + " span ratio",
          [w](const HistoryRow& r) { return r.angles[w].span_ratio; }, 4, d);
      lam.second_axis = true;
      angles.series.push_back(lam);
    }
  }
  angles.key = "outside right top";
  merge(files, render(angles, "gait"));

  // Spanwise lift per unit span at the requested phases and as a cycle mean: the right wing, and
  // the left one too (dashed) when the gait differs between the wings.
  const bool both = !model.mirror_gait();
  Plot span{std::string(both ? "Spanwise loading of both wings\n"
                             : "Spanwise loading of the right wing\n") +
                s.title,
            "r / R (span fraction)",
            "lift per unit span (N/m)",
            "",
            both
                ? "lift = -Z per unit span; solid: right wing, dashed: left wing; black: cycle mean"
                : "lift = -Z per unit span; black: cycle mean",
            {}};
  std::map<std::string, Series> by_phase;
  std::map<double, int> phase_type;
  for (const SpanwiseRow& r : s.spanwise)
    if (!r.cycle_mean) phase_type.emplace(r.phase, static_cast<int>(phase_type.size()) + 1);
  for (const SpanwiseRow& r : s.spanwise) {
    if (r.side != Side::right && !both) continue;
    char key[48];
    std::snprintf(key, sizeof key, r.cycle_mean ? "%scycle mean" : "%sphase %.2f",
                  both ? (r.side == Side::right ? "right, " : "left, ") : "", r.phase);
    Series& ser = by_phase[key];
    ser.title = key;
    ser.style = r.cycle_mean ? "lines" : "linespoints";
    ser.dashed = r.side == Side::left;
    ser.line_type = r.cycle_mean ? 8 : phase_type[r.phase];  // gnuplot type 8: black
    ser.x.push_back(r.span_fraction);
    ser.y.push_back(-r.force_per_span.z());
  }
  for (auto& [k, ser] : by_phase) span.series.push_back(ser);
  span.key = "outside right top vertical";
  merge(files, render(span, "spanwise"));

  // Planform seen from above: leading and trailing edges, strip edges, pitch axis.
  const Planform& pf = model.planform();
  const Strips& st = model.strips();
  Plot plan{"Planform of the right wing with its " + std::to_string(st.size()) + " strips",
            "distance from the hinge along the span (m)",
            "chordwise position (m, + forward)",
            "",
            "the left wing is its mirror image; pitch axis at 0",
            {}};
  plan.equal_axes = true;
  Series le = named("leading edge", "lines"), te = named("trailing edge", "lines");
  const int fine = 200;
  for (int i = 0; i <= fine; ++i) {
    const double r = pf.span() * i / fine;
    le.x.push_back(r);
    le.y.push_back(pf.leading_edge(r));
    te.x.push_back(r);
    te.y.push_back(pf.leading_edge(r) - pf.chord(r));
  }
  le.line_type = te.line_type = 1;
  Series edges = named("strip edges", "vectors");
  for (Eigen::Index j = 0; j < st.edge_radius.size(); ++j) {
    edges.x.push_back(st.edge_radius(j));
    edges.y.push_back(st.edge_leading_edge(j) - st.edge_chord(j));
    edges.dx.push_back(0.0);
    edges.dy.push_back(st.edge_chord(j));
  }
  Series axis = named("pitch axis", "lines");
  axis.x = {0.0, pf.span()};
  axis.y = {0.0, 0.0};
  axis.line_type = 3;
  axis.dashed = true;
  Series centres = named("strip centres", "points");
  for (Eigen::Index i = 0; i < st.size(); ++i) {
    centres.x.push_back(st.radius(i));
    centres.y.push_back(st.leading_edge(i) - 0.25 * st.chord(i));
  }
  plan.series = {le, te, edges, axis, centres};
  plan.key = "outside right top vertical";
  merge(files, render(plan, "planform"));

  // Stroke diagram: the section at r̂₂R at 24 phases, seen along the span, in stroke-plane
  // coordinates (distance along the stroke path, height out of the stroke plane).
  const double r2 = pf.radius_moment(2) * pf.span();
  const double c = pf.chord(r2), le2 = pf.leading_edge(r2), tw = pf.twist(r2);
  Plot stroke{"Stroke diagram of the section at r2 R = " + std::to_string(r2 * 1000).substr(0, 6) +
                  (both ? " mm (both wings)" : " mm (right wing)"),
              "along the stroke path (m, + forward stroke)",
              "out of the stroke plane (m, + up)",
              "",
              both ? "chord drawn every 1/24 cycle, dot = leading edge; stroke-plane coordinates; "
                     "the left wing's path dashed"
                   : "chord drawn every 1/24 cycle, dot = leading edge; stroke-plane coordinates",
              {}};
  stroke.equal_axes = true;
  for (int w = 0; w < (both ? 2 : 1); ++w) {
    const std::string who = both ? std::string(w == 0 ? "right " : "left ") : std::string();
    Series forward = named(who + "chord, forward stroke", "vectors");
    Series backward = named(who + "chord, backward stroke", "vectors");
    Series edges_le = named(who + "leading edge", "points");
    Series path = named(who + "pitch-axis path", "lines");
    const WingMotion& m = model.motion(static_cast<Side>(w));
    for (int j = 0; j <= 240; ++j) {
      const double t = (s.cycles - 1 + j / 240.0) / s.frequency;
      const double lam = m.span_ratio.at(t, m.frequency).value;
      path.x.push_back(lam * r2 * m.stroke.at(t, m.frequency).value);
      path.y.push_back(lam * r2 * m.deviation.at(t, m.frequency).value);
    }
    for (int j = 0; j < 24; ++j) {
      const double t = (s.cycles - 1 + j / 24.0) / s.frequency;
      const double lam = m.span_ratio.at(t, m.frequency).value;
      const double u = lam * r2 * m.stroke.at(t, m.frequency).value;
      const double v = lam * r2 * m.deviation.at(t, m.frequency).value;
      const double psi = m.pitch.at(t, m.frequency).value + tw;
      const double cu = std::cos(psi), cv = std::sin(psi);
      Series& chords = m.stroke.at(t, m.frequency).rate >= 0.0 ? forward : backward;
      chords.x.push_back(u - (c - le2) * cu);
      chords.y.push_back(v - (c - le2) * cv);
      chords.dx.push_back(c * cu);
      chords.dy.push_back(c * cv);
      edges_le.x.push_back(u + le2 * cu);
      edges_le.y.push_back(v + le2 * cv);
    }
    path.line_type = w == 0 ? 3 : 7;
    path.dashed = true;
    forward.line_type = w == 0 ? 1 : 5;
    backward.line_type = w == 0 ? 2 : 6;
    edges_le.line_type = w == 0 ? 4 : 8;
    for (Series* x : {&path, &forward, &backward, &edges_le}) stroke.series.push_back(*x);
  }
  stroke.key = "outside bottom center horizontal";
  merge(files, render(stroke, "stroke"));
  return files;
}

}  // namespace flapline::io
