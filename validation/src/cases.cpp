// The validation cases: flapline's values next to the classical references. The source of every
// reference is named in the case's case.yaml and printed in the report.
#include <cmath>
#include <complex>
#include <functional>
#include <map>

#include "flapline/aero/lifting_line.hpp"
#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/io/config.hpp"
#include "flapline/reference/lifting_line_theory.hpp"
#include "flapline/reference/unsteady_theory.hpp"
#include "flapline/simulation/integrate.hpp"
#include "flapline/validation/validation.hpp"

namespace flapline::validation {
namespace {

namespace ref = flapline::reference;
using Overrides = std::vector<std::string>;

std::string fmt(const char* pattern, double v) {
  char buf[96];
  std::snprintf(buf, sizeof buf, pattern, v);
  return buf;
}

struct Context {
  const CaseSpec& spec;
  CaseResult& out;
  const Overrides& common;  ///< applied after each case's own overrides

  Model model(Overrides o = {}) const {
    o.insert(o.end(), common.begin(), common.end());
    return io::load_model(spec.config.string(), o);
  }

  void check(const std::string& id, const std::string& quantity, double value, double reference) {
    const CheckSpec& s = spec.check(id);
    Check c;
    c.id = id;
    c.quantity = quantity;
    c.value = value;
    c.reference = reference;
    c.tolerance = s.tolerance;
    c.measure = s.measure;
    c.error = s.measure == "relative" ? std::abs(value - reference) / std::abs(reference)
                                      : std::abs(value - reference);
    c.pass = std::isfinite(c.error) && c.error <= s.tolerance;
    out.checks.push_back(c);
  }
};

io::Series line(const std::string& title, std::vector<double> x, std::vector<double> y, int lt,
                bool dashed = false) {
  io::Series s;
  s.title = title;
  s.x = std::move(x);
  s.y = std::move(y);
  s.line_type = lt;
  s.dashed = dashed;
  return s;
}
io::Series points(const std::string& title, std::vector<double> x, std::vector<double> y, int lt) {
  io::Series s = line(title, std::move(x), std::move(y), lt);
  s.style = "points";
  return s;
}

std::vector<double> range(double a, double b, int n, bool log = false) {
  std::vector<double> v;
  for (int i = 0; i <= n; ++i) {
    const double u = static_cast<double>(i) / n;
    v.push_back(log ? a * std::pow(b / a, u) : a + (b - a) * u);
  }
  return v;
}

// ---------------------------------------------------------------------------------------------
void iso2533_density(Context& c) {
  std::vector<double> h, rho;
  for (const auto& row : c.spec.table) {
    const double value = c.model({"air.altitude=" + fmt("%.6g", row[0])}).air().density;
    c.check("table", fmt("density at %.0f m (kg/m^3)", row[0]), value, row[1]);
    h.push_back(row[0]);
    rho.push_back(row[1]);
  }
  std::vector<double> hs = range(-2000, 11000, 52), rs;
  for (double x : hs) rs.push_back(c.model({"air.altitude=" + fmt("%.6g", x)}).air().density);
  io::Plot p{"ISO 2533 standard atmosphere",
             "geopotential altitude (m)",
             "air density (kg/m^3)",
             "",
             "line: flapline; points: the standard's table",
             {}};
  p.series = {line("flapline", hs, rs, 1), points("ISO 2533 table", h, rho, 2)};
  c.out.figures.push_back(p);
}

// ---------------------------------------------------------------------------------------------
void revolving_wing(Context& c) {
  // Right wing of a rectangular pair carried round by a body yawing at Ω: lift = ½ρC_L(α)Ω²∫cr²dr.
  const Model base = c.model();
  const double omega = -base.spec().flight.rates.z(), rho = base.air().density;
  const double inertia = base.planform().area_moment(2);
  const double q = 0.5 * rho * omega * omega * inertia;
  const RevolvingFit fit;
  struct Law {
    const char* id;
    const char* label;
    Overrides set;
    std::function<double(double)> cl;
  };
  const Law laws[] = {{"thin_airfoil_suction",
                       "thin airfoil, full suction: 2π sin α",
                       {"model.coefficient_law=thin_airfoil", "model.suction_recovery=1"},
                       [](double a) { return 2 * kPi * std::sin(a); }},
                      {"thin_airfoil_no_suction",
                       "thin airfoil, no suction: 2π sin α cos²α",
                       {"model.coefficient_law=thin_airfoil", "model.suction_recovery=0"},
                       [](double a) { return 2 * kPi * std::sin(a) * std::cos(a) * std::cos(a); }},
                      {"revolving_fit",
                       "revolving-wing fit (Dickinson, Lehmann & Sane 1999)",
                       {"model.coefficient_law=revolving_fit"},
                       [&fit](double a) { return fit.lift_coefficient(a); }}};
  io::Plot p{"Revolving wing: lift coefficient against the closed forms",     "pitch (deg)",
             "lift coefficient C_L = L / (0.5 rho Omega^2 int c r^2 dr)",     "",
             "lines: closed forms; points: flapline (right wing, 40 strips)", {}};
  int lt = 1;
  for (const Law& law : laws) {
    std::vector<double> xs, ys;
    for (double deg : {5.0, 15.0, 30.0, 45.0, 60.0}) {
      Overrides o = law.set;
      o.push_back("gait.pitch=" + fmt("%.6g", deg));
      const RunSummary r = simulate(c.model(o));
      const double lift = -r.averages.wing_mean[0].force.z();
      c.check(law.id, fmt("lift at %.0f deg (N)", deg), lift, q * law.cl(deg * kDegree));
      xs.push_back(deg);
      ys.push_back(lift / q);
    }
    std::vector<double> ax = range(0, 70, 70), ay;
    for (double d : ax) ay.push_back(law.cl(d * kDegree));
    p.series.push_back(line(law.label, ax, ay, lt));
    p.series.push_back(points("flapline", xs, ys, lt));
    ++lt;
  }
  p.key = "bottom right";
  c.out.figures.push_back(p);
}

// ---------------------------------------------------------------------------------------------
void wagner_step(Context& c) {
  const Model model = c.model();
  Workspace ws(model);
  attach_aero(model, ws).initial_state(model, ws, 0.0, StartMode::rest, ws.state);
  const double speed = model.spec().flight.velocity.x();
  const double b = 0.5 * model.planform().mean_chord();
  const double alpha = model.motion(Side::right).pitch.at(0.0, model.frequency()).value;
  const double steady = kPi * 2 * b * speed * std::sin(alpha);
  const WagnerCoefficients w = wagner_coefficients(model.aero_options().wagner_fit);
  const double dt = 0.05 * b / speed;
  double worst_fit = 0.0;
  std::vector<double> s_f, phi_f;
  for (int j = 0; j <= 2000; ++j) {
    const double s = speed * j * dt / b;
    evaluate(model, ws, j * dt);
    const double ratio = ws.loads.circulation(0) / steady;
    worst_fit = std::max(worst_fit, std::abs(ratio - ref::wagner_fit(s, w.a1, w.a2, w.b1, w.b2)));
    if (j % 10 == 0) {
      s_f.push_back(s);
      phi_f.push_back(ratio);
    }
    for (double at : {1.0, 2.0, 5.0, 10.0, 20.0, 50.0, 100.0})
      if (j == static_cast<int>(std::lround(at / 0.05)))
        c.check("exact", fmt("Gamma(s)/Gamma(inf) at s = %.0f", at), ratio, ref::wagner(at));
    advance(model, ws, j * dt, dt);
  }
  c.check("jones_fit", "max |Gamma/Gamma(inf) - fit| over s in [0, 100]", worst_fit, 0.0);
  std::vector<double> sx = range(0, 100, 200), ex, jx;
  for (double s : sx) {
    ex.push_back(ref::wagner(s));
    jx.push_back(ref::wagner_fit(s, w.a1, w.a2, w.b1, w.b2));
  }
  io::Plot p{"Wagner's problem: circulation after a step in angle",
             "reduced time s = U t / b",
             "Gamma(s) / Gamma(inf)",
             "",
             "2-D strip at constant speed (wagner model)",
             {}};
  p.series = {line("exact Wagner function", sx, ex, 1), line("R.T. Jones fit", sx, jx, 2, true),
              points("flapline", s_f, phi_f, 3)};
  p.key = "bottom right";
  c.out.figures.push_back(p);
}

// ---------------------------------------------------------------------------------------------
/// Complex amplitude of the lift per unit span / (ρU²b) of a small harmonic motion (last cycle).
std::complex<double> harmonic_lift(const Context& c, double k, Overrides o) {
  const Model probe = c.model();
  const double speed = probe.spec().flight.velocity.x();
  const double b = 0.5 * probe.planform().mean_chord();
  const double omega = k * speed / b;
  const int cycles = static_cast<int>(std::ceil(600.0 / (2 * kPi / k))) + 1;
  o.push_back("gait.frequency=" + fmt("%.12g", omega / (2 * kPi)));
  o.push_back("simulation.min_cycles=" + std::to_string(cycles));
  o.push_back("simulation.max_cycles=" + std::to_string(cycles));
  const Model model = c.model(o);
  const RunSummary r = simulate(model);
  std::complex<double> sum = 0.0;
  int n = 0;
  const double span = 2 * model.planform().span();
  for (const HistoryRow& row : r.history) {
    sum += (-row.loads.total.force.z() / span) *
           std::exp(std::complex<double>(0.0, -omega * row.loads.time));
    ++n;
  }
  return std::complex<double>(0.0, 2.0) * sum / static_cast<double>(n) /
         (model.air().density * speed * speed * b);
}

void theodorsen(Context& c) {
  const double amp = 1e-3;  // h/b or α (rad)
  const Model probe = c.model();
  const double b = 0.5 * probe.planform().mean_chord();
  const WagnerCoefficients w = wagner_coefficients(probe.aero_options().wagner_fit);
  struct Motion {
    const char* label;
    double x0;
    bool plunge;
  };
  const Motion motions[] = {{"plunge", 0.25, true},
                            {"pitch about the quarter chord", 0.25, false},
                            {"pitch about mid-chord", 0.5, false}};
  io::Plot amp_plot{"Theodorsen: lift amplitude of small harmonic motions",
                    "reduced frequency k = omega b / U",
                    "|C_l| per unit h/b or alpha (C_l = L / (rho U^2 b))",
                    "",
                    "lines: Theodorsen with exact C(k); points: flapline (wagner model)",
                    {}};
  io::Plot phase_plot{"Theodorsen: lift phase of small harmonic motions",
                      "reduced frequency k = omega b / U",
                      "phase of the lift against the motion (deg)",
                      "",
                      "lines: Theodorsen with exact C(k); points: flapline (wagner model)",
                      {}};
  amp_plot.log_x = phase_plot.log_x = true;
  int lt = 1;
  for (const Motion& m : motions) {
    const double a = 2 * m.x0 - 1;
    std::vector<double> ks, amps, phases;
    for (double k : {0.05, 0.1, 0.2, 0.5, 1.0}) {
      Overrides o{"wing.pitch_axis=" + fmt("%.3g", m.x0)};
      if (m.plunge)
        o.push_back("gait.plunge={shape: harmonic, amplitude: " + fmt("%.9g", amp * b) + "}");
      else
        o.push_back("gait.pitch={shape: harmonic, amplitude: " + fmt("%.9g", amp / kDegree) + "}");
      const std::complex<double> got = harmonic_lift(c, k, o) / amp;
      const auto cj = ref::theodorsen_fit(k, w.a1, w.a2, w.b1, w.b2);
      const auto ce = ref::theodorsen(k);
      const auto fit = m.plunge ? ref::plunge_lift(k, cj) : ref::pitch_lift(k, a, cj);
      const auto exact = m.plunge ? ref::plunge_lift(k, ce) : ref::pitch_lift(k, a, ce);
      const std::string tag = std::string(m.label) + fmt(", k = %.2f", k);
      c.check("amplitude", tag + ": |C_l|", std::abs(got), std::abs(exact));
      c.check("phase", tag + ": phase (deg)", std::arg(got) / kDegree, std::arg(exact) / kDegree);
      c.check("fit", tag + ": C_l with the fit's C_J(k), |complex error| / |C_l|",
              std::abs(got - fit) / std::abs(fit), 0.0);
      ks.push_back(k);
      amps.push_back(std::abs(got));
      phases.push_back(std::arg(got) / kDegree);
    }
    std::vector<double> kx = range(0.03, 1.5, 80, true), ay, py;
    for (double k : kx) {
      const auto e = m.plunge ? ref::plunge_lift(k, ref::theodorsen(k))
                              : ref::pitch_lift(k, a, ref::theodorsen(k));
      ay.push_back(std::abs(e));
      py.push_back(std::arg(e) / kDegree);
    }
    amp_plot.series.push_back(line(m.label, kx, ay, lt));
    amp_plot.series.push_back(points("flapline", ks, amps, lt));
    phase_plot.series.push_back(line(m.label, kx, py, lt));
    phase_plot.series.push_back(points("flapline", ks, phases, lt));
    ++lt;
  }
  amp_plot.key = "top left";
  phase_plot.key = "top left";
  c.out.figures.push_back(amp_plot);
  c.out.figures.push_back(phase_plot);
}

// ---------------------------------------------------------------------------------------------
void garrick_plunge(Context& c) {
  const Model probe = c.model();
  const double speed = probe.spec().flight.velocity.x();
  const double b = 0.5 * probe.planform().mean_chord();
  const double rho = probe.air().density;
  const double h0 = 0.02 * b;
  const WagnerCoefficients w = wagner_coefficients(probe.aero_options().wagner_fit);
  std::vector<double> ks, effs;
  for (double k : {0.1, 0.2, 0.5, 1.0, 2.0}) {
    const double omega = k * speed / b;
    const int cycles = static_cast<int>(std::ceil(600.0 / (2 * kPi / k))) + 1;
    const Model model =
        c.model({"gait.plunge={shape: harmonic, amplitude: " + fmt("%.9g", h0) + ", phase: 90}",
                 "gait.frequency=" + fmt("%.12g", omega / (2 * kPi)),
                 "simulation.min_cycles=" + std::to_string(cycles),
                 "simulation.max_cycles=" + std::to_string(cycles)});
    const RunSummary r = simulate(model);
    const double span = 2 * model.planform().span();
    const double thrust = r.averages.mean.force.x() / span;
    const double power = r.averages.power_actuator_mean / span;
    const auto fit = ref::garrick_plunge(rho, b, omega, h0, speed,
                                         ref::theodorsen_fit(k, w.a1, w.a2, w.b1, w.b2));
    const auto exact = ref::garrick_plunge(rho, b, omega, h0, speed, ref::theodorsen(k));
    const std::string tag = fmt("k = %.2f", k);
    c.check("thrust_fit", tag + ": mean thrust per span (N/m), Garrick with C_J(k)", thrust,
            fit.thrust);
    c.check("power_fit", tag + ": mean input power per span (W/m), Garrick with C_J(k)", power,
            fit.power);
    c.check("thrust_exact", tag + ": mean thrust per span (N/m)", thrust, exact.thrust);
    c.check("power_exact", tag + ": mean input power per span (W/m)", power, exact.power);
    c.check("efficiency_exact", tag + ": propulsive efficiency T U / P", thrust * speed / power,
            exact.efficiency);
    ks.push_back(k);
    effs.push_back(thrust * speed / power);
  }
  std::vector<double> kx = range(0.05, 3.0, 80, true), e_exact, e_fit;
  for (double k : kx) {
    const auto ce = ref::theodorsen(k), cj = ref::theodorsen_fit(k, w.a1, w.a2, w.b1, w.b2);
    e_exact.push_back(std::norm(ce) / ce.real());
    e_fit.push_back(std::norm(cj) / cj.real());
  }
  io::Plot p{"Garrick: propulsive efficiency of a plunging wing",
             "reduced frequency k = omega b / U",
             "propulsive efficiency T U / P (-)",
             "",
             "Garrick 1936 with exact C(k) and with the Jones fit; points: flapline (wagner model)",
             {}};
  p.log_x = true;
  p.series = {line("Garrick, exact C(k)", kx, e_exact, 1),
              line("Garrick, C_J(k)", kx, e_fit, 2, true), points("flapline", ks, effs, 3)};
  c.out.figures.push_back(p);
}

// ---------------------------------------------------------------------------------------------
struct SteadyWing {
  double lift_slope, cl, cd, aspect_ratio;
};
SteadyWing steady_wing(const Context& c, const Overrides& o) {
  const Model model = c.model(o);
  Workspace ws(model);
  attach_aero(model, ws).initial_state(model, ws, 0.0, StartMode::quasi_steady, ws.state);
  const LoadSample l = evaluate(model, ws, 0.0);
  const double speed = model.spec().flight.velocity.x();
  const double alpha = model.motion(Side::right).pitch.at(0.0, model.frequency()).value;
  const double q = 0.5 * model.air().density * speed * speed * 2.0 * model.planform().area();
  const double cl = -l.total.force.z() / q;
  return {cl / alpha, cl, -l.total.force.x() / q, model.planform().aspect_ratio()};
}

void elliptic_wing(Context& c) {
  std::vector<double> ars, slopes;
  for (double ar : {2.0, 4.0, 6.0, 10.0, 20.0}) {
    // Elliptic pair of span 2R = 2 m: AR = 16R/(π c₀) with R = 1.
    const SteadyWing s = steady_wing(c, {"wing.root_chord=" + fmt("%.12g", 8.0 / (kPi * ar))});
    c.check("lift_slope", fmt("AR %.0f: lift slope (1/rad)", ar), s.lift_slope,
            ref::elliptic_lift_slope(2 * kPi, ar));
    c.check("induced_drag", fmt("AR %.0f: C_Di / C_L^2", ar), s.cd / (s.cl * s.cl),
            1.0 / (kPi * ar));
    ars.push_back(ar);
    slopes.push_back(s.lift_slope);
  }
  std::vector<double> ax = range(1.0, 25.0, 96), pr, hb, two;
  for (double a : ax) {
    pr.push_back(ref::elliptic_lift_slope(2 * kPi, a));
    hb.push_back(ref::helmbold_lift_slope(2 * kPi, a));
    two.push_back(2 * kPi);
  }
  io::Plot p{"Steady elliptic wing: lift slope against aspect ratio",
             "aspect ratio of the pair",
             "lift slope (1/rad)",
             "",
             "lifting_line model, 40 cosine strips per wing",
             {}};
  p.series = {line("Prandtl 2 pi / (1 + 2/AR)", ax, pr, 1),
              line("Helmbold (low AR, for comparison)", ax, hb, 2, true),
              line("2-D thin airfoil 2 pi", ax, two, 3, true), points("flapline", ars, slopes, 1)};
  p.key = "bottom right";
  c.out.figures.push_back(p);
}

void rectangular_wing(Context& c) {
  std::vector<double> ars, slopes;
  for (double ar : {3.0, 6.0, 9.0}) {
    const double chord = 2.0 / ar;  // pair span 2 m
    const SteadyWing s = steady_wing(c, {"wing.chord=" + fmt("%.12g", chord)});
    const ref::GlauertSolution g =
        ref::glauert_lifting_line([chord](double) { return chord; }, 2.0, 2 * kPi, 60);
    c.check("lift_slope", fmt("AR %.0f: lift slope (1/rad)", ar), s.lift_slope, g.lift_slope);
    c.check("span_efficiency", fmt("AR %.0f: span efficiency C_L^2/(pi AR C_Di)", ar),
            s.cl * s.cl / (kPi * ar * s.cd), g.span_efficiency());
    ars.push_back(ar);
    slopes.push_back(s.lift_slope);
  }
  std::vector<double> ax = range(1.0, 12.0, 44), gl;
  for (double a : ax)
    gl.push_back(
        ref::glauert_lifting_line([a](double) { return 2.0 / a; }, 2.0, 2 * kPi, 60).lift_slope);
  io::Plot p{"Steady rectangular wing: lift slope against aspect ratio",
             "aspect ratio of the pair",
             "lift slope (1/rad)",
             "",
             "lifting_line model, 40 cosine strips per wing",
             {}};
  p.series = {line("Glauert's series solution", ax, gl, 1), points("flapline", ars, slopes, 2)};
  p.key = "bottom right";
  c.out.figures.push_back(p);
}

void impulsive_start(Context& c) {
  const Model model = c.model();
  Workspace ws(model);
  attach_aero(model, ws).initial_state(model, ws, 0.0, StartMode::rest, ws.state);
  const double speed = model.spec().flight.velocity.x();
  const double ar = model.planform().aspect_ratio();
  const double alpha = model.motion(Side::right).pitch.at(0.0, model.frequency()).value;
  const double q = 0.5 * model.air().density * speed * speed * 2.0 * model.planform().area();
  const double b = 0.5 * model.planform().mean_chord();
  const double dt = 0.05 * b / speed;
  const double final_ref = ref::elliptic_lift_slope(2 * kPi, ar);
  std::vector<double> s_f, cl_f;
  double cl = 0.0;
  for (int j = 0; j <= 12000; ++j) {  // 600 semichords of the mean chord
    cl = -evaluate(model, ws, j * dt).total.force.z() / q;
    if (j == 0) c.check("start", "C_L(0+) / alpha", cl / alpha, kPi / (1 + 1 / ar));
    if (j % 20 == 0 && j <= 4000) {
      s_f.push_back(j * 0.05);
      cl_f.push_back(cl / alpha / (2 * kPi));
    }
    if (j < 12000) advance(model, ws, j * dt, dt);
  }
  c.check("final", "C_L / alpha after 600 semichords", cl / alpha, final_ref);
  std::vector<double> sx = range(0, 200, 200), two, fin;
  for (double s : sx) {
    two.push_back(ref::wagner(s));
    fin.push_back(final_ref / (2 * kPi));
  }
  io::Plot p{"Impulsive start of an elliptic wing (AR " + fmt("%.0f", ar) + ")",
             "reduced time s = U t / b (mean chord)",
             "C_L / (2 pi alpha)",
             "",
             "the model's trailing legs exist from t = 0; R.T. Jones (1939) finds the finite wing "
             "starting near the 2-D value",
             {}};
  p.series = {points("flapline lifting line", s_f, cl_f, 1),
              line("Prandtl steady value", sx, fin, 2, true),
              line("2-D: exact Wagner function", sx, two, 3)};
  p.key = "bottom right";
  c.out.figures.push_back(p);
}

// Observed order of the cycle-mean lift against the step, with the integrator of the run.
void step_order(Context& c) {
  const int steps[] = {200, 400, 800};
  io::Plot p{"Step-size convergence of the mean lift in forward flight",
             "steps per cycle",
             "log10 of the relative change of L from n to 800 steps",
             "",
             "folding wing in forward flight; fourth order: 1.2 decades lower per doubling",
             {}};
  p.log_x = true;
  int lt = 1;
  for (const char* kind : {"wagner", "lifting_line"}) {
    std::vector<double> lift;
    for (int n : steps) {
      const RunSummary r = simulate(c.model(
          {std::string("model.kind=") + kind, "simulation.steps_per_cycle=" + std::to_string(n)}));
      if (r.status != RunStatus::converged)
        throw std::runtime_error(std::string(kind) + " did not converge at " + std::to_string(n) +
                                 " steps per cycle");
      lift.push_back(r.mean_lift());
    }
    const Model probe = c.model({std::string("model.kind=") + kind});
    const std::string tag =
        std::string(kind) + ", " + std::string(to_string(probe.simulation().integrator));
    const double order = std::log2(std::abs(lift[0] - lift[1]) / std::abs(lift[1] - lift[2]));
    c.check("order", tag + ": observed order of the mean-lift error", order, 4.0);
    p.series.push_back(points(tag, {200.0, 400.0},
                              {std::log10(std::abs(lift[0] - lift[2]) / std::abs(lift[2])),
                               std::log10(std::abs(lift[1] - lift[2]) / std::abs(lift[2]))},
                              lt++));
  }
  c.out.figures.push_back(p);
}

const std::map<std::string, std::function<void(Context&)>>& handlers() {
  static const std::map<std::string, std::function<void(Context&)>> h{
      {"iso2533_density", iso2533_density},
      {"revolving_wing", revolving_wing},
      {"wagner_step", wagner_step},
      {"theodorsen", theodorsen},
      {"garrick_plunge", garrick_plunge},
      {"elliptic_wing", elliptic_wing},
      {"rectangular_wing", rectangular_wing},
      {"impulsive_start", impulsive_start},
      {"step_order", step_order}};
  return h;
}

}  // namespace

std::vector<std::string> known_cases() {
  std::vector<std::string> out;
  for (const auto& [name, fn] : handlers()) out.push_back(name);
  return out;
}

CaseResult run_case(const CaseSpec& spec, const std::vector<std::string>& overrides) {
  CaseResult out;
  out.spec = spec;
  const auto it = handlers().find(spec.name);
  if (it == handlers().end()) {
    out.failure = "no handler for a case named '" + spec.name + "'";
    return out;
  }
  try {
    Context c{spec, out, overrides};
    it->second(c);
  } catch (const std::exception& e) {
    out.failure = e.what();
  }
  return out;
}

}  // namespace flapline::validation
