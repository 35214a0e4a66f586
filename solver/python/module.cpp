// The Python module `flapline._flapline`: thin bindings over flapline::io and flapline::studies.
// Configs arrive as YAML text (a file's content, or a dict dumped as JSON, which is YAML); the
// Python package (flapline/__init__.py) wraps these functions with a Pythonic API. Every run and
// study releases the GIL; studies stop between cases on Ctrl-C.
#include <pybind11/numpy.h>
#include <pybind11/pybind11.h>
#include <pybind11/stl.h>

#include <atomic>
#include <memory>
#include <thread>

#include "flapline/flapline.hpp"

namespace py = pybind11;
using namespace flapline;

namespace {

/// The Python exception class for bad input (set up in the module body; kept alive for good).
py::handle g_input_error;

[[noreturn]] void raise_input_error(const InputError& e) {
  py::object err = py::reinterpret_borrow<py::object>(g_input_error)(py::str(e.what()));
  err.attr("file") = e.file();
  err.attr("line") = e.line();
  err.attr("key") = e.key();
  err.attr("value") = e.value();
  err.attr("allowed") = e.allowed();
  err.attr("hint") = e.hint();
  PyErr_SetObject(g_input_error.ptr(), err.ptr());
  throw py::error_already_set();
}

/// Ctrl-C between cases: the main thread (OpenMP's thread 0) looks at Python's signals.
struct Interrupt {
  std::thread::id main = std::this_thread::get_id();
  std::atomic<bool> raised{false};
  bool check() {
    if (raised) return true;
    if (std::this_thread::get_id() != main) return false;
    py::gil_scoped_acquire gil;
    if (PyErr_CheckSignals() != 0) {
      PyErr_Clear();
      raised = true;
    }
    return raised;
  }
  void rethrow() const {
    if (!raised) return;
    PyErr_SetNone(PyExc_KeyboardInterrupt);
    throw py::error_already_set();
  }
};

template <class F>
auto guarded(F&& f) {
  try {
    return f();
  } catch (const studies::Interrupted&) {
    PyErr_SetNone(PyExc_KeyboardInterrupt);
    throw py::error_already_set();
  } catch (const InputError& e) {
    raise_input_error(e);
  } catch (const NumericalError& e) {
    PyErr_SetString(PyExc_ArithmeticError, e.what());
    throw py::error_already_set();
  }
}

py::array_t<double> array(const std::vector<double>& v) {
  py::array_t<double> a(static_cast<py::ssize_t>(v.size()));
  std::copy(v.begin(), v.end(), a.mutable_data());
  return a;
}

/// One run: (summary.json text, history columns, spanwise columns).
py::tuple run(const std::string& text, const std::string& name, const std::string& base_dir,
              const std::vector<std::string>& sets) {
  return guarded([&] {
    RunSummary s;
    std::string summary;
    {
      py::gil_scoped_release release;
      const io::CaseLoader loader(text, name, base_dir, sets);
      const Model model = loader.build({});
      s = simulate(model);
      summary = io::summary_json(s, {}, &model, sets);
    }
    py::dict history;
    const std::vector<std::vector<double>> t = io::history_table(s);
    for (std::size_t k = 0; k < t.size(); ++k)
      history[py::str(io::history_columns()[k])] = array(t[k]);
    py::dict span;
    std::vector<bool> mean;
    std::vector<double> phase;
    std::vector<std::string> wing;
    for (const SpanwiseRow& r : s.spanwise) {
      mean.push_back(r.cycle_mean);
      phase.push_back(r.cycle_mean ? std::nan("") : r.phase);
      wing.emplace_back(to_string(r.side));
    }
    span["cycle_mean"] = mean;
    span["phase"] = array(phase);
    span["wing"] = wing;
    const std::vector<std::vector<double>> st = io::spanwise_table(s);
    for (std::size_t k = 0; k < st.size(); ++k)
      span[py::str(io::spanwise_numeric_columns()[k])] = array(st[k]);
    py::dict drive;
    const std::vector<std::vector<double>> dt = io::drive_table(s);
    for (std::size_t k = 0; k < dt.size(); ++k)
      drive[py::str(io::drive_columns()[k])] = array(dt[k]);
    return py::make_tuple(summary, history, span, drive);
  });
}

/// A sweep: (column names, rows as lists of cell texts), in case order.
py::tuple sweep(const std::string& text, const std::string& name, const std::string& base_dir,
                const std::vector<std::string>& sets, const std::vector<std::string>& vary,
                const std::string& design, int samples, std::uint64_t seed,
                const std::string& cases_file, int threads) {
  return guarded([&] {
    io::SweepDefinition def;
    def.config_path = name;
    def.config_text = text;
    def.sets = sets;
    def.vary_specs = vary;
    def.cases_file = cases_file;
    const auto kind = from_string<studies::DesignKind>(design);
    if (!kind || *kind == studies::DesignKind::table)
      throw InputError("design", "'" + design + "'", "must be one of: grid, one_at_a_time, latin");
    def.design.kind = *kind;
    def.design.samples = samples;
    def.design.seed = seed;
    std::map<std::size_t, std::string> rows;
    Interrupt interrupt;
    {
      py::gil_scoped_release release;
      io::complete_definition(def);
      const io::CaseLoader loader(text, name, base_dir, sets);
      io::check_sweep_values(def, loader);
      std::vector<std::size_t> all(def.cases.size());
      for (std::size_t i = 0; i < all.size(); ++i) all[i] = i;
      studies::RunnerOptions options;
      options.threads = threads;
      options.stop = [&interrupt] { return interrupt.check(); };
      studies::run_cases(def.cases, all, io::case_builders(loader), options,
                         [&](std::size_t i, const RunSummary& s) {
                           rows[i] = studies::table_row(i, def.columns, def.cases[i], s);
                         });
    }
    interrupt.rethrow();
    py::list out;
    for (const auto& [i, row] : rows) out.append(studies::csv_split(row.substr(0, row.size() - 1)));
    return py::make_tuple(studies::table_columns(def.columns), out);
  });
}

std::vector<studies::Parameter> parameters(const io::CaseLoader& loader,
                                           const std::vector<std::string>& keys) {
  std::vector<studies::Parameter> out;
  for (const std::string& k : keys) {
    studies::Parameter p;
    p.name = k;
    const std::optional<double> v = loader.number_at(k);
    if (!v) throw InputError(k, "(no number)", "the config holds no number at this key path");
    p.base = *v;
    out.push_back(p);
  }
  return out;
}

const std::vector<std::string> kInner{"simulation.start=periodic", "simulation.tolerance=1e-9"};

std::vector<std::string> inner(std::vector<std::string> sets) {
  sets.insert(sets.end(), kInner.begin(), kInner.end());
  return sets;
}

/// trim.json text.
std::string trim(const std::string& text, const std::string& name, const std::string& base_dir,
                 const std::vector<std::string>& sets,
                 const std::vector<std::tuple<std::string, double, double>>& free,
                 const std::vector<std::pair<std::string, double>>& targets, bool balance,
                 double tolerance, int threads) {
  Interrupt interrupt;
  return guarded([&] {
    py::gil_scoped_release release;
    const io::CaseLoader loader(text, name, base_dir, inner(sets));
    std::vector<std::string> keys;
    for (const auto& f : free) keys.push_back(std::get<0>(f));
    std::vector<studies::Parameter> params = parameters(loader, keys);
    for (std::size_t i = 0; i < params.size(); ++i) {
      params[i].low = std::get<1>(free[i]);
      params[i].high = std::get<2>(free[i]);
      if (!(params[i].low < params[i].high) || params[i].base < params[i].low ||
          params[i].base > params[i].high)
        throw InputError(keys[i], studies::shortest(params[i].base),
                         "needs low < high with the config's value between them");
    }
    std::vector<studies::Target> t;
    for (const auto& [q, v] : targets) {
      if (!find_summary_key(q))
        throw InputError(q, "(quantity)", "unknown quantity: a key path of summary.json");
      t.push_back({q, v});
    }
    if (balance != t.empty())
      throw InputError("targets", "", "give targets or balance=True, not both");
    studies::TrimOptions o;
    o.tolerance = tolerance;
    o.runner.threads = threads;
    o.runner.stop = [&interrupt] { return interrupt.check(); };
    const studies::TrimResult r = studies::trim(params, t, {}, io::case_builders(loader), o);
    return io::trim_json(r, params, tolerance,
                         "simulation.start periodic, simulation.tolerance 1e-9");
  });
}

/// derivatives.json (and modes.json for modes) text.
std::string derivatives(const std::string& text, const std::string& name,
                        const std::string& base_dir, const std::vector<std::string>& sets,
                        const std::vector<std::string>& keys, bool flight, int threads) {
  Interrupt interrupt;
  return guarded([&] {
    py::gil_scoped_release release;
    const io::CaseLoader loader(text, name, base_dir, inner(sets));
    std::vector<studies::Parameter> params;
    if (flight) params = studies::Parameter::flight_state();
    for (const auto& p : parameters(loader, keys)) params.push_back(p);
    studies::RunnerOptions o;
    o.threads = threads;
    o.stop = [&interrupt] { return interrupt.check(); };
    return io::derivatives_json(studies::derivatives(params, studies::derivative_quantities(), {},
                                                     io::case_builders(loader), o));
  });
}

std::string modes(const std::string& text, const std::string& name, const std::string& base_dir,
                  const std::vector<std::string>& sets, const std::vector<std::string>& keys,
                  int threads) {
  Interrupt interrupt;
  return guarded([&] {
    py::gil_scoped_release release;
    const io::CaseLoader loader(text, name, base_dir, inner(sets));
    const Model base = loader.build({});
    if (!base.vehicle())
      throw InputError("vehicle", "(none)", "flight modes need the vehicle section");
    studies::RunnerOptions o;
    o.threads = threads;
    o.stop = [&interrupt] { return interrupt.check(); };
    const std::vector<studies::Parameter> controls = parameters(loader, keys);
    const studies::ModesStudy m =
        studies::modes_study(base, controls, io::case_builders(loader), o);
    std::vector<std::string> units;
    for (const auto& p : controls) units.push_back(io::parameter_unit(p));
    return io::modes_json(m.linear, keys, units, m.modes, m.warnings);
  });
}

}  // namespace

PYBIND11_MODULE(_flapline, m) {
  m.doc() = "flapline's C++ core (use the flapline package)";
  g_input_error = py::object(py::module_::import("flapline.errors").attr("InputError")).release();
  m.attr("__version__") = kVersion;
  m.attr("CAUTIONS") = kCautions;
  m.def("run", &run);
  m.def("sweep", &sweep);
  m.def("trim", &trim);
  m.def("derivatives", &derivatives);
  m.def("modes", &modes);
}
