// Workspace: one per worker, reusable across cases, never leaking a cache from one case into the
// next (DESIGN §1, §9). The oracle is a fresh Workspace: results must agree bit for bit.
#include <doctest/doctest.h>

#include <vector>

#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"

using namespace flapline;

namespace {

ModelSpec with(ModelSpec s, ModelKind kind, int strips) {
  s.aero.kind = kind;
  s.strips.count = strips;
  s.simulation.max_cycles = 6;  // enough to exercise every cache; equality is what counts
  return s;
}

void check_identical(const RunSummary& a, const RunSummary& b) {
  REQUIRE(a.history.size() == b.history.size());
  CHECK(a.cycles == b.cycles);
  CHECK(a.averages.mean.force == b.averages.mean.force);
  CHECK(a.averages.mean.moment == b.averages.mean.moment);
  CHECK(a.averages.power_actuator_mean == b.averages.power_actuator_mean);
  for (std::size_t i = 0; i < a.history.size(); ++i) {
    CHECK(a.history[i].loads.total.force == b.history[i].loads.total.force);
    CHECK(a.history[i].loads.total.moment == b.history[i].loads.total.moment);
  }
  CHECK(a.derived.reference_speed == b.derived.reference_speed);
}

}  // namespace

TEST_CASE("a Workspace knows the Model it was built for") {
  const Model a(samples::hover_insect()), b(samples::hover_insect());
  Workspace ws(a);
  CHECK(ws.built_for(a));
  CHECK_FALSE(ws.built_for(b));
  ws.reset(b);
  CHECK(ws.built_for(b));
  CHECK_FALSE(ws.built_for(a));
  Workspace moved(std::move(ws));
  CHECK(moved.built_for(b));
}

TEST_CASE("a reused Workspace gives the results of a fresh one, whatever ran before") {
  // A worker runs cases of every model kind and size in turn with one Workspace.
  std::vector<ModelSpec> cases;
  for (ModelKind kind : {ModelKind::lifting_line, ModelKind::wagner, ModelKind::quasi_steady}) {
    cases.push_back(with(samples::hover_insect(), kind, 8));
    cases.push_back(with(samples::forward_bat(), kind, 8));  // same size, other geometry
    cases.push_back(with(samples::rolling_bat(), kind, 6));  // other size
  }
  cases.push_back(with(samples::forward_bat(), ModelKind::lifting_line, 8));  // after others
  std::vector<Model> models;
  for (const ModelSpec& s : cases) models.emplace_back(s);
  Workspace ws(models.front());
  for (const Model& m : models) {
    CAPTURE(m.spec().title);
    CAPTURE(to_string(m.aero_options().kind));
    ws.reset(m);
    const RunSummary reused = simulate(m, ws);
    const RunSummary fresh = simulate(m);
    check_identical(reused, fresh);
  }
  // Running the same Model twice on one Workspace: the second run starts from clean caches too.
  const Model& last = models.back();
  ws.reset(last);
  const RunSummary again = simulate(last, ws);
  check_identical(again, simulate(last));
}

TEST_CASE("a moved Workspace keeps working") {
  const Model m(with(samples::forward_bat(), ModelKind::lifting_line, 6));
  Workspace a(m);
  Workspace b = std::move(a);
  check_identical(simulate(m, b), simulate(m));
}
