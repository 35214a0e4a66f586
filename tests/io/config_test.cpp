// Reading cases from YAML: demo configs, overrides, and the bad-input catalogue (each entry's
// first line names the key path its error must carry).
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <string>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/io/config.hpp"
#include "flapline/io/resolved.hpp"
#include "flapline/samples/samples.hpp"
#include "flapline/simulation/integrate.hpp"
#include "test_support.hpp"

using namespace flapline;
namespace fs = std::filesystem;

namespace {
std::string expected_key(const fs::path& file) {
  std::ifstream in(file);
  std::string first;
  std::getline(in, first);
  const auto pos = first.find("expect: ");
  REQUIRE(pos != std::string::npos);
  return first.substr(pos + 8);
}
}  // namespace

TEST_CASE("demo configs equal the invented samples they document") {
  const std::pair<const char*, ModelSpec> demos[] = {
      {"configs/hover_insect.yaml", samples::hover_insect()},
      {"configs/forward_bat.yaml", samples::forward_bat()},
      {"configs/rolling_bat.yaml", samples::rolling_bat()}};
  for (const auto& demo : demos) {
    const char* const path = demo.first;
    const ModelSpec& spec = demo.second;
    CAPTURE(path);
    const RunSummary from_yaml = simulate(io::load_model(test::source_path(path)));
    const RunSummary from_code = simulate(Model(spec));
    CHECK((from_yaml.averages.mean.force - from_code.averages.mean.force).norm() <=
          1e-12 * from_code.averages.force_rms);
    CHECK((from_yaml.averages.mean.moment - from_code.averages.mean.moment).norm() <=
          1e-12 * from_code.averages.force_rms * spec.wing.span);
    CHECK(from_yaml.derived.reverse_flow_fraction <= 0.05);  // leading edge first (DESIGN §2)
  }
}

TEST_CASE("--set overrides any key, and a side block overrides the shared gait key by key") {
  const std::string path = test::source_path("configs/rolling_bat.yaml");
  const ModelSpec s = io::load_spec(
      path, {"gait.frequency=7.5", "wing.hinge=[0, 0.04, 0]", "model.suction_recovery=0.5"});
  CHECK(s.gait.frequency == 7.5);
  CHECK(s.wing.hinge.y() == 0.04);
  CHECK(s.aero.suction_recovery == 0.5);
  // rolling_bat.yaml: left stroke amplitude 24°, the rest of the stroke shared with the right.
  CHECK(s.gait.left.stroke.amplitude == doctest::Approx(24 * kDegree));
  CHECK(s.gait.right.stroke.amplitude == doctest::Approx(30 * kDegree));
  CHECK(s.gait.left.pitch.mean == doctest::Approx(96 * kDegree));
  CHECK(s.gait.left.span_ratio.mean == doctest::Approx(0.8));
}

TEST_CASE("a key given twice with --set: the last one wins, also under a parent key") {
  const std::string path = test::source_path("configs/hover_insect.yaml");
  CHECK(io::load_spec(path, {"gait.frequency=30", "gait.frequency=40"}).gait.frequency == 40);
  // A whole waveform, then one of its fields: the field applies to the new waveform.
  const ModelSpec s = io::load_spec(
      path, {"gait.stroke={shape: harmonic, amplitude: 50}", "gait.stroke.amplitude=55"});
  CHECK(s.gait.right.stroke.shape == WaveShape::harmonic);
  CHECK(s.gait.right.stroke.amplitude == doctest::Approx(55 * kDegree));
  // ... and the other way round: the later whole waveform replaces the earlier field.
  CHECK(
      io::load_spec(path, {"gait.stroke.amplitude=55", "gait.stroke=20"}).gait.right.stroke.mean ==
      doctest::Approx(20 * kDegree));
}

TEST_CASE("an override error is placed on the command line") {
  const std::string path = test::source_path("configs/hover_insect.yaml");
  try {
    io::load_model(path, {"gait.frequency=-3"});
    FAIL("no error");
  } catch (const InputError& e) {
    CHECK(e.key() == "gait.frequency");
    CHECK(std::string(e.what()).find("--set gait.frequency=-3") != std::string::npos);
  }
  CHECK_THROWS_WITH_AS(io::load_model(path, {"wing.spna=0.1"}),
                       doctest::Contains("did you mean 'span'"), InputError);
}

TEST_CASE("bad-input catalogue: every entry names its key path, file and line") {
  const fs::path dir = test::source_path("tests/io/bad_input");
  int count = 0;
  for (const auto& entry : fs::directory_iterator(dir)) {
    if (entry.path().extension() != ".yaml") continue;
    ++count;
    const std::string want = expected_key(entry.path());
    CAPTURE(entry.path().filename().string());
    try {
      io::load_model(entry.path().string());
      FAIL("accepted a bad config");
    } catch (const InputError& e) {
      CHECK(e.key() == want);
      CHECK(e.file() == entry.path().string());
      if (entry.path().stem() != "missing_frequency") CHECK(e.line() > 0);
      CHECK(std::string(e.what()).find("key '" + want + "'") != std::string::npos);
      CHECK(!e.allowed().empty());
    }
  }
  CHECK(count >= 15);
}

TEST_CASE("a missing file is an input error naming the file") {
  CHECK_THROWS_WITH_AS(io::load_model("/nonexistent/case.yaml"),
                       doctest::Contains("/nonexistent/case.yaml"), InputError);
}

TEST_CASE("did-you-mean finds near misses only") {
  CHECK(io::closest_match("strip", {"strips", "span", "chord"}) == "strips");
  CHECK(io::closest_match("frequncy", {"frequency", "stroke"}) == "frequency");
  CHECK(io::closest_match("banana", {"frequency", "stroke"}).empty());
}

TEST_CASE("planform table from CSV, relative to the config's folder") {
  const fs::path dir = test::fresh_folder("csv_table");
  fs::create_directories(dir);
  std::ofstream(dir / "wing.csv") << "# invented test planform\nspan_fraction,chord,leading_edge\n"
                                     "0,0.04,0.01\n0.5,0.04,0.01\n1,0.02,0.005\n";
  std::ofstream(dir / "case.yaml")
      << "wing:\n  planform: table\n  span: 0.2\n  table_file: wing.csv\n"
         "gait:\n  frequency: 10\n  stroke: 40\n";
  const Model m = io::load_model((dir / "case.yaml").string());
  // analytic: S = 0.04·0.1 + (0.04 + 0.02)/2·0.1 = 0.007 m²
  CHECK(m.planform().area() == doctest::Approx(0.007).epsilon(1e-12));
  std::ofstream(dir / "wing.csv") << "span_fraction,chord,leading_edge\n0,0.04,0.01\n1,x,0.005\n";
  try {
    io::load_model((dir / "case.yaml").string());
    FAIL("accepted a bad CSV");
  } catch (const InputError& e) {
    CHECK(e.key() == "wing.table_file");
    CHECK(e.file() == (dir / "wing.csv").string());
    CHECK(e.line() == 3);
  }
  fs::remove_all(dir);
}

TEST_CASE("bad-input messages say what a first user needs: units typed, counts, rows, forms") {
  // Each entry: the catalogue file, a phrase its message must hold, the line it must point at.
  struct Expect {
    const char* file;
    const char* phrase;
    int line;
  };
  const Expect cases[] = {
      {"rates_out_of_range", "within ±36000 (deg/s)", 12},  // the unit the user typed
      {"rates_out_of_range", "[0, 0, 50000]", 12},
      {"vector_length", "(2 given)", 12},
      {"waveform_list", "or a map such as", 9},
      {"table_row_order", "row 3", 8},  // the row's own line, not the table key's
      {"second_moment_below_first", "must exceed first_moment_radius", 7},
      {"mass_point_outside", "must lie on the wing", 8},
      {"stroke_too_fast", "slower than 1000 m/s", 9},  // the cause, at its own key
      {"stroke_too_fast", "deg/s times the span, 0.5 m", 9},
      {"plunge_too_fast", "(the peak plunge rate)", 9},
      {"plunge_huge", "must stay within ±1000 (m)", 10},
  };
  for (const Expect& c : cases) {
    CAPTURE(c.file);
    const fs::path path = test::source_path(std::string("tests/io/bad_input/") + c.file + ".yaml");
    try {
      io::load_model(path.string());
      FAIL("accepted a bad config");
    } catch (const InputError& e) {
      CHECK(std::string(e.what()).find(c.phrase) != std::string::npos);
      CHECK(e.line() == c.line);
    }
  }
}

TEST_CASE("a gait too fast for an incompressible model is refused at its largest cause") {
  // Peak stroke rates at 2000 Hz (right: the demo's 60 degrees, smoothed triangle K = 0.7, peak
  // rate A·2πf·K/asin K; left: 170 degrees) times the 0.05 m span: about 594 and 1680 m/s.
  const std::string path = test::source_path("configs/hover_insect.yaml");
  try {
    io::load_model(path, {"gait.frequency=2000", "gait.left.stroke.amplitude=170"});
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(e.key() == "gait.left.stroke");
    CHECK(e.is_between_keys());
    CHECK(std::string(e.what()).find("--set gait.left.stroke.amplitude=170") != std::string::npos);
  }
  // The demo itself at its own frequency is far below the limit.
  CHECK_NOTHROW(io::load_model(path, {"gait.left.stroke.amplitude=170"}));
}

TEST_CASE("resolved.yaml holds every key and reruns the same case") {
  // Every demo (a flight condition, a vehicle, a mass table, inflow, profile drag among them),
  // plus a planform from a table file and --set overrides.
  std::vector<std::pair<std::string, std::vector<std::string>>> cases;
  for (const auto& e : fs::directory_iterator(test::source_path("configs")))
    if (e.path().extension() == ".yaml") cases.push_back({e.path().string(), {}});
  cases.push_back({test::source_path("configs/forward_bat.yaml"),
                   {"gait.left.stroke.amplitude=20", "model.kind=wagner"}});
  REQUIRE(cases.size() >= 9);
  const fs::path dir = test::fresh_folder("resolved_yaml");
  fs::create_directories(dir);
  for (const auto& entry : cases) {
    const auto& config = entry.first;
    const auto& sets = entry.second;
    CAPTURE(config);
    const Model a = io::load_model(config, sets);
    const fs::path file = dir / "resolved.yaml";
    std::ofstream(file) << io::resolved_yaml(a);
    const Model b = io::load_model(file.string());
    // Every key of the grammar is present: the sections and the defaults a config may omit.
    const auto j = io::resolved_configuration(a);
    for (const char* key : {"title", "wing", "gait", "flight", "air", "model", "simulation"})
      CHECK(j.contains(key));
    CHECK(j["simulation"].contains("spanwise_phases"));
    CHECK(j["model"].contains("wagner_fit"));
    CHECK(j["gait"]["left"].contains("span_ratio"));
    RunControl quick;
    quick.keep_history = false;
    ModelSpec sa = a.spec(), sb = b.spec();
    for (ModelSpec* s : {&sa, &sb}) {
      s->strips.count = 6;
      s->simulation.max_cycles = 3;
    }
    const RunSummary ra = simulate(Model(sa), quick), rb = simulate(Model(sb), quick);
    // Values typed in degrees are written as the shortest decimal that converts back to the same
    // double, so the rerun is the same case bit for bit.
    CHECK(io::resolved_configuration(a) == io::resolved_configuration(b));
    CHECK(rb.mean_lift() == ra.mean_lift());
    CHECK(rb.mean_thrust() == ra.mean_thrust());
    CHECK(rb.averages.mean.moment == ra.averages.mean.moment);
  }
  fs::remove_all(dir);
}
