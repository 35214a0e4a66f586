#include "local_studies.hpp"

#include <cmath>
#include <cstdio>
#include <filesystem>
#include <iostream>
#include <memory>

#include "cli_common.hpp"
#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/io/config.hpp"
#include "flapline/io/local_studies.hpp"
#include "flapline/io/plots.hpp"
#include "flapline/io/run_plots.hpp"
#include "flapline/io/writers.hpp"
#include "flapline/simulation/summary_keys.hpp"
#include "flapline/studies/derivatives.hpp"
#include "flapline/studies/modes.hpp"
#include "flapline/studies/trim.hpp"

namespace flapline::cli {
namespace {

namespace fs = std::filesystem;

/// The runs inside a trim or a derivative: tightly converged from the periodic start, so that a
/// residual or a difference is not run-to-run noise.
const std::vector<std::string> kInnerRuns{"simulation.start=periodic", "simulation.tolerance=1e-9"};
const char* const kInnerRunsText = "simulation.start periodic, simulation.tolerance 1e-9";

std::vector<std::string> with_inner(std::vector<std::string> sets) {
  sets.insert(sets.end(), kInnerRuns.begin(), kInnerRuns.end());
  return sets;
}

double parse_number(const std::string& text, const std::string& option, const std::string& spec) {
  try {
    std::size_t used = 0;
    const double v = std::stod(text, &used);
    if (used != text.size() || !std::isfinite(v)) throw std::invalid_argument(text);
    return v;
  } catch (const std::exception&) {
    throw InputError(option, "'" + spec + "'", "'" + text + "' is not a number");
  }
}

/// A config key as a parameter, at its value in the base config; its value must be accepted.
studies::Parameter key_parameter(const io::CaseLoader& loader, const std::string& key,
                                 const std::string& option) {
  studies::Parameter p;
  p.name = key;
  const std::optional<double> base = loader.number_at(key);
  if (!base)
    throw InputError(option + " " + key, "(no number)",
                     "the config holds no number at this key path: give it a value (e.g. --set " +
                         key + "=...)");
  p.base = *base;
  // A continuous number: a small step off the value must be accepted for the key's own sake
  // (a whole-number key such as wing.strips cannot be differentiated or trimmed).
  const double step = p.base != 0.0 ? 1e-3 * std::abs(p.base) : 1e-3;
  for (double v : {p.base, p.base + 0.5 * step}) {
    try {
      (void)loader.build(studies::CaseSpec{{{key, studies::shortest(v), false}}});
    } catch (const InputError& e) {
      if (e.is_between_keys() || (e.key() != key && key.rfind(e.key() + ".", 0) != 0)) continue;
      InputError up =
          v == p.base
              ? e.rekeyed(e.key())
              : InputError(key, studies::shortest(p.base),
                           "must be a continuous number to be " +
                               std::string(option == "--free" ? "trimmed" : "differentiated") +
                               " (" + e.allowed() + ")");
      up.locate("command line (" + option + " " + key + ")", 0);
      throw up;
    }
  }
  return p;
}

/// A value of a key checked alone against the base config (up-front bound checks).
void check_value(const io::CaseLoader& loader, const std::string& key, double v,
                 const std::string& option) {
  try {
    (void)loader.build(studies::CaseSpec{{{key, studies::shortest(v), false}}});
  } catch (const InputError& e) {
    if (e.is_between_keys() || (e.key() != key && key.rfind(e.key() + ".", 0) != 0)) return;
    InputError up = e.rekeyed(e.key());
    up.locate("command line (" + option + " " + key + ")", 0);
    throw up;
  }
}

std::string summary_key_hint(const std::string& q) {
  std::vector<std::string> all;
  for (const SummaryKey& k : summary_keys()) all.push_back(k.path);
  const std::string near = io::closest_match(q, all);
  return near.empty() ? "e.g. cycle_mean.lift_N, cycle_mean.L_roll_Nm, net_mean.Z_N"
                      : "did you mean '" + near + "'?";
}

void write_run(io::OutputFolder& folder, const RunSummary& s, const Model& model, bool plot,
               std::string& plot_note) {
  folder.add("history.csv", io::history_csv(s));
  folder.add("summary.json", io::summary_json(s));
  folder.add("spanwise.csv", io::spanwise_csv(s));
  folder.add("drive.csv", io::drive_csv(s));
  if (plot && io::gnuplot_available())
    for (auto& [name, content] : io::run_plots(s, model)) folder.add(name, content);
  else if (plot)
    plot_note = kNoGnuplot;
}

}  // namespace

int trim_command(const TrimArgs& a) {
  if (a.balance == !a.targets.empty())
    throw InputError("--target", a.targets.empty() ? "(none)" : "'" + a.targets.front() + "'",
                     "give --target QUANTITY=VALUE (one or more) or --balance, not both");
  if (a.frees.empty())
    throw InputError("--free", "(none)", "name at least one free key: --free KEY=LO:HI");
  if (!(a.tolerance > 0 && a.tolerance < 1))
    throw InputError("--tolerance", studies::shortest(a.tolerance), "must lie in (0, 1)");
  const io::CaseLoader loader(a.config, with_inner(a.sets), fs::path(a.config).filename().string());
  (void)loader.build({});  // the base config's own errors, at their file and line
  std::vector<studies::Parameter> free;
  for (const std::string& f : a.frees) {
    const auto eq = f.find('='), colon = f.rfind(':');
    if (eq == std::string::npos || colon == std::string::npos || colon < eq)
      throw InputError("--free", "'" + f + "'", "must be KEY=LO:HI, e.g. gait.frequency=15:40");
    const std::string key = f.substr(0, eq);
    for (const auto& p : free)
      if (p.name == key)
        throw InputError("--free " + key, "'" + f + "'", "each key may be free once");
    studies::Parameter p = key_parameter(loader, key, "--free");
    p.low = parse_number(f.substr(eq + 1, colon - eq - 1), "--free " + key, f);
    p.high = parse_number(f.substr(colon + 1), "--free " + key, f);
    if (!(p.low < p.high)) throw InputError("--free " + key, "'" + f + "'", "needs LO < HI");
    if (!(p.base >= p.low && p.base <= p.high))
      throw InputError("--free " + key, studies::shortest(p.base),
                       "the start (the config's value) must lie within " + f.substr(eq + 1),
                       "set a start inside the bounds with --set " + key + "=...");
    check_value(loader, key, p.low, "--free");
    check_value(loader, key, p.high, "--free");
    free.push_back(p);
  }
  std::vector<studies::Target> targets;
  for (const std::string& t : a.targets) {
    const auto eq = t.find('=');
    if (eq == std::string::npos)
      throw InputError("--target", "'" + t + "'",
                       "must be QUANTITY=VALUE, e.g. cycle_mean.lift_N=0.02");
    studies::Target tg{t.substr(0, eq), parse_number(t.substr(eq + 1), "--target", t)};
    if (!find_summary_key(tg.quantity))
      throw InputError("--target", "'" + tg.quantity + "'",
                       "unknown quantity: a key path of summary.json",
                       summary_key_hint(tg.quantity));
    targets.push_back(tg);
  }
  const ModelSpec base_spec = loader.spec({});
  if (a.balance && !base_spec.vehicle)
    throw InputError("--balance", "(no vehicle)",
                     "steady flight needs the vehicle section (mass, inertia, attitude)",
                     "see configs/README.md, 'vehicle'");
  for (const studies::Target& t : targets)
    if (t.quantity.rfind("net_mean.", 0) == 0 || t.quantity.rfind("vehicle.", 0) == 0 ||
        t.quantity.rfind("steady_flight_residual.", 0) == 0)
      if (!base_spec.vehicle)
        throw InputError("--target", "'" + t.quantity + "'", "needs the vehicle section");

  studies::TrimOptions options;
  options.tolerance = a.tolerance;
  options.runner.threads = a.threads;
  const bool tty = !a.quiet && ::isatty(STDERR_FILENO);
  if (tty)
    options.on_iteration = [](int it, double r) {
      std::fprintf(stderr, "\rtrim: iteration %d, scaled residual %.3e   ", it, r);
    };
  const studies::TrimResult r =
      studies::trim(free, targets, {}, io::case_builders(loader), options);
  if (tty) std::fprintf(stderr, "\r%*s\r", 60, "");

  const fs::path dir = a.out.empty()
                           ? fs::path("results") / (fs::path(a.config).stem().string() + "_trim")
                           : fs::path(a.out);
  io::OutputFolder folder(dir, io::OutputFolder::Ownership::whole);
  folder.add("trim.json", io::trim_json(r, free, a.tolerance, kInnerRunsText));
  std::string plot_note;
  if (a.plot && io::gnuplot_available() && !r.history.empty())
    for (auto& [name, content] : io::trim_plot(r)) folder.add(name, content);
  if (r.status == studies::TrimStatus::trimmed) {
    // The trimmed config carries the inner runs' settings, so that it reproduces the trim.
    const studies::CaseSpec solved = studies::case_at(free, r.values);
    folder.add("trimmed.yaml", "# Trimmed by flapline trim (" + std::string(to_string(r.status)) +
                                   ", scaled residual " + studies::shortest(r.residual) +
                                   ") from " + a.config + "\n" + loader.document(solved));
    const Model model = loader.build(solved);
    const RunSummary s = simulate(model);
    write_run(folder, s, model, a.plot, plot_note);
  }
  folder.commit();
  if (!a.quiet) {
    std::printf("flapline trim: %s (%s)\n", std::string(to_string(r.status)).c_str(),
                r.message.c_str());
    for (std::size_t i = 0; i < free.size() && r.values.size(); ++i)
      std::printf("  %-36s %.10g   (start %.6g, bounds %.6g .. %.6g)\n", free[i].name.c_str(),
                  r.values(static_cast<Eigen::Index>(i)), free[i].base, free[i].low, free[i].high);
    for (std::size_t i = 0; i < r.quantities.size() && r.achieved.size(); ++i)
      std::printf("  %-36s %.8g (target %.8g)\n", r.quantities[i].c_str(),
                  r.achieved(static_cast<Eigen::Index>(i)),
                  r.targets(static_cast<Eigen::Index>(i)));
    std::printf("  %d iterations, %d runs\n", r.iterations, r.runs);
    if (!r.active_bounds.empty()) {
      std::string b;
      for (const auto& s : r.active_bounds) b += (b.empty() ? "" : "; ") + s;
      std::printf("  active bounds: %s\n", b.c_str());
    }
    std::cout << "results: " << dir.string() << "/ (trim.json"
              << (r.status == studies::TrimStatus::trimmed ? ", trimmed.yaml and its run" : "")
              << ")\n";
    if (!plot_note.empty()) std::cout << plot_note << "\n";
    std::cout << kCautions << "\n";
  }
  if (r.status != studies::TrimStatus::trimmed) {
    // One line, also with --quiet: the outcome, the active bounds, the closest values reached.
    std::string line = "flapline: trim " + std::string(to_string(r.status)) + ": " + r.message;
    for (const auto& b : r.active_bounds) line += "; " + b;
    for (std::size_t i = 0; i < r.quantities.size() && r.achieved.size(); ++i)
      line += "; closest " + r.quantities[i] + " = " +
              studies::shortest(r.achieved(static_cast<Eigen::Index>(i))) + " (target " +
              studies::shortest(r.targets(static_cast<Eigen::Index>(i))) + ")";
    std::cerr << line << "\n";
  }
  switch (r.status) {
    case studies::TrimStatus::trimmed:
      return 0;
    case studies::TrimStatus::not_reachable:
      return kExitNotReachable;
    case studies::TrimStatus::not_converged:
      return kExitNotConverged;
    case studies::TrimStatus::failed:
      break;
  }
  return kExitNumerical;
}

namespace {

/// Derivatives of `quantities` for --param keys (and the flight state).
studies::DerivativeTable derivative_table(const DerivativesArgs& a, const io::CaseLoader& loader,
                                          const std::vector<std::string>& quantities,
                                          std::vector<studies::Parameter>& params) {
  if (a.flight) params = studies::Parameter::flight_state();
  for (const std::string& k : a.params) {
    for (const auto& p : params)
      if (p.name == k)
        throw InputError("--param " + k, "'" + k + "'", "each key may be given once");
    params.push_back(key_parameter(loader, k, "--param"));
  }
  if (params.empty())
    throw InputError("--param", "(none)", "name at least one --param KEY, or --flight");
  studies::RunnerOptions options;
  options.threads = a.threads;
  return studies::derivatives(params, quantities, {}, io::case_builders(loader), options);
}

void print_table(const studies::DerivativeTable& t) {
  std::printf("%-26s", "quantity \\ parameter");
  for (const auto& p : t.parameters) std::printf(" %13.13s", p.name.c_str());
  std::printf("\n");
  for (std::size_t i = 0; i < t.quantities.size(); ++i) {
    std::printf("%-26s", t.quantities[i].c_str());
    for (Eigen::Index j = 0; j < t.value.cols(); ++j)
      std::printf(" %12.5g%s", t.value(static_cast<Eigen::Index>(i), j),
                  t.flagged(static_cast<Eigen::Index>(i), j) ? "*" : " ");
    std::printf("\n");
  }
}

}  // namespace

int derivatives_command(const DerivativesArgs& a) {
  const io::CaseLoader loader(a.config, with_inner(a.sets), fs::path(a.config).filename().string());
  (void)loader.build({});  // the base config's own errors, at their file and line
  std::vector<studies::Parameter> params;
  const studies::DerivativeTable t =
      derivative_table(a, loader, studies::derivative_quantities(), params);
  const fs::path dir =
      a.out.empty() ? fs::path("results") / (fs::path(a.config).stem().string() + "_derivatives")
                    : fs::path(a.out);
  io::OutputFolder folder(dir, io::OutputFolder::Ownership::whole);
  folder.add("derivatives.csv", io::derivatives_csv(t));
  folder.add("derivatives.json", io::derivatives_json(t));
  if (a.plot && io::gnuplot_available())
    for (auto& [name, content] : io::derivative_plots(t, "derivatives")) folder.add(name, content);
  folder.commit();
  if (!a.quiet) {
    std::printf(
        "flapline derivatives: %zu quantities x %zu parameters, %d runs "
        "(quantity unit per parameter unit; * = Richardson estimate above 1 %%)\n",
        t.quantities.size(), t.parameters.size(), t.runs);
    print_table(t);
    std::cout << "results: " << dir.string() << "/ (derivatives.csv, derivatives.json)\n";
    std::cout << kCautions << "\n";
  }
  return 0;
}

int modes_command(const DerivativesArgs& a) {
  const io::CaseLoader loader(a.config, with_inner(a.sets), fs::path(a.config).filename().string());
  const Model base = loader.build({});
  if (!base.vehicle())
    throw InputError("modes", "(no vehicle)",
                     "flight modes need the vehicle section (mass, inertia, attitude)",
                     "see configs/README.md, 'vehicle'");
  std::vector<studies::Parameter> controls;
  for (const std::string& k : a.params) {
    for (const auto& p : controls)
      if (p.name == k)
        throw InputError("--param " + k, "'" + k + "'", "each key may be given once");
    controls.push_back(key_parameter(loader, k, "--param"));
  }
  studies::RunnerOptions options;
  options.threads = a.threads;
  const studies::ModesStudy study =
      studies::modes_study(base, controls, io::case_builders(loader), options);
  const studies::DerivativeTable& t = study.derivatives;
  const studies::LinearModel& lm = study.linear;
  const std::vector<studies::Mode>& modes = study.modes;
  const std::vector<std::string>& warnings = study.warnings;
  std::vector<std::string> inputs, input_units;
  for (const auto& p : controls) {
    inputs.push_back(p.name);
    input_units.push_back(io::parameter_unit(p));
  }
  const fs::path dir = a.out.empty()
                           ? fs::path("results") / (fs::path(a.config).stem().string() + "_modes")
                           : fs::path(a.out);
  io::OutputFolder folder(dir, io::OutputFolder::Ownership::whole);
  folder.add("modes.json", io::modes_json(lm, inputs, input_units, modes, warnings));
  folder.add("derivatives.csv", io::derivatives_csv(t));
  folder.add("derivatives.json", io::derivatives_json(t));
  if (a.plot && io::gnuplot_available()) {
    for (auto& [name, content] : io::modes_plot(modes)) folder.add(name, content);
    for (auto& [name, content] : io::derivative_plots(t, "derivatives")) folder.add(name, content);
  }
  folder.commit();
  if (!a.quiet) {
    std::printf("flapline modes: %zu modes of the wing-beat-averaged dynamics\n", modes.size());
    for (const auto& m : modes) {
      if (m.oscillatory)
        std::printf(
            "  %-12s oscillatory  lambda = %.5g +/- %.5gi  (wn %.4g rad/s, zeta %.3g, period %.4g "
            "s)",
            m.family.c_str(), m.real, m.imag, m.natural_frequency, m.damping_ratio, m.period);
      else
        std::printf("  %-12s real         lambda = %.5g", m.family.c_str(), m.real);
      if (m.time_to_half > 0) std::printf("  half in %.4g s", m.time_to_half);
      if (m.time_to_double > 0) std::printf("  doubles in %.4g s", m.time_to_double);
      std::string d;
      for (const auto& s : m.dominant) d += (d.empty() ? "" : ",") + s;
      std::printf("  [%s]\n", d.c_str());
    }
    for (const auto& w : warnings) std::cout << "warning: " << w << "\n";
    std::cout << "results: " << dir.string()
              << "/ (modes.json, derivatives.csv, derivatives.json)\n";
    std::cout << kCautions << "\n";
  }
  return 0;
}

}  // namespace flapline::cli
