#pragma once
/// \file
/// The validation suite behind `flapline validate`: every case folder in validation/cases holds a
/// case.yaml (what is compared, the source, each check's tolerance and why, and any transcribed
/// reference table) and the flapline config it runs. The reference values come from
/// flapline::reference (formulas evaluated with Boost.Math) or from the case file's table.

#include <filesystem>
#include <string>
#include <vector>

#include "flapline/io/plots.hpp"

namespace flapline::validation {

/// One check declared in case.yaml.
struct CheckSpec {
  std::string id;
  double tolerance = 0;
  std::string measure;  ///< "relative", "absolute" or "degrees"
  std::string why;      ///< why the tolerance is what it is
  std::string law;      ///< the law or result checked against, named in each report row
};

/// A case folder.
struct CaseSpec {
  std::string name, title, compared, source;
  std::filesystem::path dir;
  std::filesystem::path config;  ///< the flapline case it runs
  std::vector<CheckSpec> checks;
  std::vector<std::vector<double>> table;  ///< transcribed reference rows, when the case has them
  std::string table_source;
  const CheckSpec& check(const std::string& id) const;
};

/// One row of the report.
struct Check {
  std::string id, quantity;
  std::string law;  ///< filled from the CheckSpec when the report is written
  double value = 0, reference = 0, error = 0, tolerance = 0;
  std::string measure;
  bool pass = false;
};

struct CaseResult {
  CaseSpec spec;
  std::vector<Check> checks;
  std::vector<io::Plot> figures;  ///< flapline against the reference curve
  std::string failure;            ///< set when the case could not run at all
  bool ok() const;
};

/// Read every case folder under `dir` (sorted by name), or only `only`. Throws InputError for a
/// malformed case.yaml (file, line, key).
std::vector<CaseSpec> load_cases(const std::filesystem::path& dir, const std::string& only = {});

/// Run one case: compute flapline's values and the references, compare with each check's
/// tolerance. Never throws: a case that cannot run reports a failure.
/// `overrides` (key=value) apply to every model the case loads, after the case's own (e.g.
/// `simulation.integrator=rk4`).
CaseResult run_case(const CaseSpec& spec, const std::vector<std::string>& overrides = {});

/// Names of the cases this build knows how to run.
std::vector<std::string> known_cases();

/// report.md: a summary per case and one row per check (quantity, flapline, reference, error,
/// tolerance, pass/fail, source). `figures_note` says where the figures are or why they are
/// missing.
std::string report_markdown(const std::vector<CaseResult>& results,
                            const std::string& figures_note);

/// The built-in location of the case folders (the source tree's validation/cases).
std::filesystem::path default_cases_dir();

}  // namespace flapline::validation
