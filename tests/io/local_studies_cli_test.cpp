// flapline trim / derivatives / modes end to end: files, exit statuses, one-line refusals.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <string>

#include "test_support.hpp"

using namespace flapline;
namespace fs = std::filesystem;

namespace {
std::string config(const char* name) {
  return "\"" + test::source_path(std::string("configs/") + name) + "\"";
}
nlohmann::json read_json(const fs::path& p) {
  std::ifstream in(p);
  return nlohmann::json::parse(in);
}
}  // namespace

TEST_CASE(
    "trim writes trim.json, a runnable trimmed.yaml and its run; unreachable is its own status") {
  const fs::path dir = test::fresh_folder("trim_ok");
  std::string log;
  REQUIRE(test::run_cli("trim " + config("hover_vehicle.yaml") +
                            " --free gait.frequency=15:40 --free gait.pitch.mean=60:120 --balance"
                            " --no-plot -q -o \"" +
                            dir.string() + "\"",
                        log) == 0);
  const nlohmann::json t = read_json(dir / "trim.json");
  CHECK(t["status"] == "trimmed");
  CHECK(t["residual_rms_scaled"].get<double>() <= 1e-6);
  CHECK(t["jacobian"]["values"].size() == 6u);
  // trimmed.yaml runs as is and balances the vehicle (the summary's own residual).
  const fs::path again = test::fresh_folder("trim_again");
  REQUIRE(test::run_cli("run \"" + (dir / "trimmed.yaml").string() + "\" --no-plot -q -o \"" +
                            again.string() + "\"",
                        log) == 0);
  const nlohmann::json s = read_json(again / "summary.json");
  CHECK(std::abs(s["steady_flight_residual"]["Z_N"].get<double>()) <=
        1e-5 * s["vehicle"]["weight_N"].get<double>());
  CHECK(s["vehicle"]["lift_to_weight"].get<double>() == doctest::Approx(1.0).epsilon(1e-5));

  const fs::path far = test::fresh_folder("trim_far");
  CHECK(test::run_cli("trim " + config("hover_vehicle.yaml") +
                          " --free gait.frequency=20:30 --target cycle_mean.lift_N=1"
                          " --no-plot -q -o \"" +
                          far.string() + "\"",
                      log) == 6);  // documented: not reachable
  CHECK(read_json(far / "trim.json")["status"] == "not_reachable");
  CHECK_FALSE(fs::exists(far / "trimmed.yaml"));
}

TEST_CASE("derivatives and modes write their tables") {
  const fs::path d = test::fresh_folder("derivatives_ok"), m = test::fresh_folder("modes_ok");
  std::string log;
  REQUIRE(test::run_cli("derivatives " + config("forward_bat.yaml") +
                            " --param gait.frequency --flight --no-plot -q -o \"" + d.string() +
                            "\"",
                        log) == 0);
  std::ifstream csv(d / "derivatives.csv");
  std::string header;
  std::getline(csv, header);
  CHECK(header == "quantity,u,v,w,p,q,r,gait.frequency");
  REQUIRE(test::run_cli("modes " + config("hover_vehicle.yaml") + " --param gait.frequency" +
                            " --no-plot -q -o \"" + m.string() + "\"",
                        log) == 0);
  const nlohmann::json j = read_json(m / "modes.json");
  CHECK(j["A"].size() == 8u);
  CHECK(j["B"][0].size() == 1u);
  CHECK(j["modes"].size() >= 4u);
}

TEST_CASE("bad trim, derivatives and vehicle input: one line, exit 2, nothing written") {
  const fs::path dir = test::fresh_folder("local_bad");
  const std::string out = " --no-plot -q -o \"" + dir.string() + "\"";
  const std::string hv = config("hover_vehicle.yaml"), hi = config("hover_insect.yaml");
  struct Bad {
    std::string args, says;
  };
  for (const Bad& b :
       {Bad{"trim " + hv + " --free model.kind=0:1 --balance", "no number"},
        Bad{"trim " + hv + " --free gait.frequency=30:20 --balance", "LO < HI"},
        Bad{"trim " + hv + " --free gait.frequency=30:40 --balance", "must lie within"},
        Bad{"trim " + hv + " --free gait.frequency=10:40 --target cycle_mean.lift=1",
            "unknown quantity"},
        Bad{"trim " + hi + " --free gait.frequency=10:40 --balance", "vehicle"},
        Bad{"trim " + hv + " --free gait.frequency=10:40", "--balance"},
        Bad{"derivatives " + hi, "--param"}, Bad{"modes " + hi, "vehicle"},
        Bad{"run " + hv + " --set vehicle.mass=-1", "vehicle.mass"},
        Bad{"run " + hv + " --set vehicle.inertia.xz=1e-7", "positive definite"},
        Bad{"run " + hv + " --set flight.airspeed=5 --set flight.velocity=[1,0,0]", "derived"},
        Bad{"run " + hi + " --set flight.airspeed=5", "vehicle"},
        Bad{"trim " + hv + " --free wing.strips=4:40 --balance", "continuous"},
        Bad{"modes " + hv + " --set vehicle.attitude.pitch=90", "singular"}}) {
    CAPTURE(b.args);
    std::string log;
    CHECK(test::run_cli(b.args + out, log) == 2);
    CHECK(log.find(b.says) != std::string::npos);
    CHECK(std::count(log.begin(), log.end(), '\n') == 1);
    CHECK_FALSE(fs::exists(dir));
  }
}
