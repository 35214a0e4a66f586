// The case runner: parallel, order-independent, failures recorded as rows (DESIGN §9). Models are
// built in code here (no YAML): the builder reads a case's overrides itself.
#include <doctest/doctest.h>

#include <map>
#include <string>

#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"
#include "flapline/studies/runner.hpp"
#include "flapline/studies/table.hpp"

using namespace flapline;
using namespace flapline::studies;

namespace {

/// A builder for the hover sample that understands two keys.
CaseBuilderFactory hover_factory(ModelKind kind) {
  return [kind] {
    return [kind](const CaseSpec& c) {
      ModelSpec s = samples::hover_insect();
      s.aero.kind = kind;
      s.strips.count = 10;
      for (const Override& o : c.overrides) {
        if (o.key == "gait.frequency") s.gait.frequency = std::stod(o.text);
        if (o.key == "wing.strip_spacing" && o.text == "cosine") {
          s.strips.spacing = StripSpacing::cosine;
          s.strips.count = 40;
          s.simulation.integrator = Integrator::rk4;  // too stiff for RK4 at 400 steps
        }
      }
      return Model(s);
    };
  };
}

std::map<std::size_t, std::string> rows_of(const std::vector<CaseSpec>& cases, ModelKind kind,
                                           int threads) {
  std::vector<std::size_t> all(cases.size());
  for (std::size_t i = 0; i < all.size(); ++i) all[i] = i;
  RunnerOptions o;
  o.threads = threads;
  std::map<std::size_t, std::string> rows;
  run_cases(cases, all, hover_factory(kind), o, [&](std::size_t i, const RunSummary& s) {
    rows[i] = table_row(i, {"gait.frequency"}, cases[i], s);
  });
  return rows;
}

}  // namespace

TEST_CASE("quasi-steady hover lift follows f² exactly through the runner") {
  // analytic: in still air with the body at rest every load term scales with f² at fixed angles.
  Design d;
  d.keys = {parse_vary("gait.frequency=10:40:7")};
  const std::vector<CaseSpec> cases = make_cases(d);
  std::vector<std::size_t> all{0, 1, 2, 3, 4, 5, 6};
  std::map<std::size_t, double> lift, freq;
  RunnerOptions o;
  o.threads = 2;
  run_cases(cases, all, hover_factory(ModelKind::quasi_steady), o,
            [&](std::size_t i, const RunSummary& s) {
              lift[i] = s.mean_lift();
              freq[i] = s.frequency;
            });
  REQUIRE(lift.size() == 7u);
  for (std::size_t i = 1; i < 7; ++i)
    CHECK(lift[i] / lift[0] == doctest::Approx(std::pow(freq[i] / freq[0], 2)).epsilon(1e-12));
}

TEST_CASE("rows are identical with one thread or two, for every model") {
  Design d;
  d.keys = {parse_vary("gait.frequency=15,20,25,30,35")};
  const std::vector<CaseSpec> cases = make_cases(d);
  for (ModelKind kind : {ModelKind::quasi_steady, ModelKind::wagner, ModelKind::lifting_line}) {
    CAPTURE(to_string(kind));
    CHECK(rows_of(cases, kind, 1) == rows_of(cases, kind, 2));
  }
}

TEST_CASE("a case refused per case is a row with its status; the others run") {
  // Cosine strips on the beta planform with RK4: a tip strip too narrow for 400 steps (wagner).
  std::vector<CaseSpec> cases(3);
  cases[1].overrides = {{"wing.strip_spacing", "cosine", false}};
  std::map<std::size_t, RunSummary> out;
  RunnerOptions o;
  o.threads = 2;
  run_cases(cases, {0, 1, 2}, hover_factory(ModelKind::wagner), o,
            [&](std::size_t i, const RunSummary& s) { out[i] = s; });
  REQUIRE(out.size() == 3u);
  CHECK(out[0].status == RunStatus::converged);
  CHECK(out[1].status == RunStatus::input_error);
  CHECK(out[1].error_key == "simulation.steps_per_cycle");
  CHECK(out[2].status == RunStatus::converged);
  const std::string row = table_row(1, {"wing.strip_spacing"}, cases[1], out[1]);
  CHECK(row.rfind("1,cosine,input_error,", 0) == 0);
  // A failed case's result cells are empty, so the row has the table's column count.
  CHECK(row_index(row, table_columns({"wing.strip_spacing"}).size()) == 1);
}

TEST_CASE("a study can be stopped between cases") {
  std::vector<CaseSpec> cases(20);
  std::vector<std::size_t> all(20);
  for (std::size_t i = 0; i < 20; ++i) all[i] = i;
  int done = 0;
  RunnerOptions o;
  o.threads = 1;
  o.stop = [&done] { return done >= 3; };
  run_cases(cases, all, hover_factory(ModelKind::quasi_steady), o,
            [&](std::size_t, const RunSummary&) { ++done; });
  CHECK(done == 3);
}
