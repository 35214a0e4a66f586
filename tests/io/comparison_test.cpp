// The comparison table: each column holds exactly the figures of its own run.
#include <doctest/doctest.h>

#include <sstream>
#include <string>

#include "flapline/io/comparison.hpp"
#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"

using namespace flapline;

TEST_CASE("comparison columns equal the individual runs (property)") {
  ModelSpec a = samples::forward_bat(), b = samples::rolling_bat();
  a.aero.kind = b.aero.kind = ModelKind::wagner;
  const std::vector<io::ComparedCase> cases{{"forward", simulate(Model(a))},
                                            {"rolling", simulate(Model(b))}};
  const std::string csv = io::comparison_csv(cases);
  std::istringstream in(csv);
  std::string line;
  std::getline(in, line);
  CHECK(line == "quantity,forward,rolling");
  for (const auto& q : io::compared_quantities()) {
    REQUIRE(std::getline(in, line));
    CAPTURE(line);
    CHECK(line.rfind("\"" + q.label + "\"", 0) == 0);
    const auto first = line.find("\",") + 2, second = line.find(',', first);
    const double va = std::stod(line.substr(first, second - first));
    const double vb = std::stod(line.substr(second + 1));
    CHECK(va == doctest::Approx(q.value(cases[0].summary)).epsilon(1e-5));
    CHECK(vb == doctest::Approx(q.value(cases[1].summary)).epsilon(1e-5));
  }
  // The asymmetric gait rolls, the symmetric one does not.
  CHECK(cases[1].summary.averages.mean.moment.x() < 0.0);
  const std::string md = io::comparison_markdown(cases, "same settings");
  CHECK(md.find("| mean lift (N) |") != std::string::npos);
  CHECK(md.find("Cautions") != std::string::npos);
}
