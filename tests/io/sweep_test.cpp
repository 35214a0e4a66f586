// flapline sweep / merge end to end: rows equal single runs, tables identical whatever the
// threads, shards or interruptions, up-front refusal of bad input with nothing written.
#include <doctest/doctest.h>

#include <charconv>
#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>
#include <string>

#include "flapline/studies/table.hpp"
#include "test_support.hpp"

using namespace flapline;
namespace fs = std::filesystem;

namespace {

std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

std::string config(const char* name) {
  return "\"" + test::source_path(std::string("configs/") + name) + "\"";
}

int sweep(const std::string& args, std::string& log) {
  return test::run_cli("sweep " + args + " --no-plot -q", log);
}

std::vector<std::vector<std::string>> table(const fs::path& csv) {
  std::vector<std::vector<std::string>> out;
  std::istringstream in(slurp(csv));
  for (std::string line; std::getline(in, line);) out.push_back(studies::csv_split(line));
  return out;
}

double number(const std::string& s) {
  double v = 0;
  std::from_chars(s.data(), s.data() + s.size(), v);
  return v;
}

}  // namespace

TEST_CASE("every row of a small grid equals flapline run with the same overrides, bit for bit") {
  for (const char* model : {"quasi_steady", "wagner", "lifting_line"}) {
    CAPTURE(model);
    const fs::path dir = test::fresh_folder(std::string("sweep_rows_") + model);
    std::string log;
    REQUIRE(sweep(config("forward_bat.yaml") +
                      " --vary gait.frequency=5,6.5 --vary wing.strips=8,12"
                      " --set model.kind=" +
                      model + " -o \"" + dir.string() + "\"",
                  log) == 0);
    const auto rows = table(dir / "sweep.csv");
    REQUIRE(rows.size() == 5u);  // header + 4 cases
    const std::vector<std::string>& head = rows[0];
    for (std::size_t r = 1; r < rows.size(); ++r) {
      const fs::path one = test::fresh_folder(std::string("sweep_run_") + model);
      REQUIRE(test::run_cli("run " + config("forward_bat.yaml") + " --set model.kind=" + model +
                                " --set gait.frequency=" + rows[r][1] + " --set wing.strips=" +
                                rows[r][2] + " -o \"" + one.string() + "\" --no-plot -q",
                            log) == 0);
      std::ifstream js(one / "summary.json");
      const nlohmann::json j = nlohmann::json::parse(js);
      CHECK(rows[r][3] == j["status"].get<std::string>());
      int compared = 0;
      for (std::size_t c = 6; c < head.size(); ++c) {
        const nlohmann::json::json_pointer ptr("/" + [&] {
          std::string p = head[c];
          for (char& ch : p)
            if (ch == '.') ch = '/';
          return p;
        }());
        if (!j.contains(ptr) ||
            j[ptr].is_null()) {  // e.g. the vehicle's keys of a case without one
          CHECK(rows[r][c].empty());
          continue;
        }
        CAPTURE(head[c]);
        CHECK(number(rows[r][c]) == j[ptr].get<double>());  // exact: shortest round trip
        ++compared;
      }
      CHECK(compared >= 60);  // every scalar but the undefined ones
    }
  }
}

TEST_CASE("threads, shards with merge and a resumed journal give the same sweep.csv") {
  const std::string base = config("hover_insect.yaml") +
                           " --vary gait.frequency=20:30:5 --vary gait.pitch.amplitude=40,45"
                           " --set model.kind=wagner --set wing.strips=8";
  std::string log;
  const fs::path one = test::fresh_folder("sweep_t1"), two = test::fresh_folder("sweep_t2");
  REQUIRE(sweep(base + " --threads 1 -o \"" + one.string() + "\"", log) == 0);
  REQUIRE(sweep(base + " --threads 2 -o \"" + two.string() + "\"", log) == 0);
  const std::string reference = slurp(one / "sweep.csv");
  CHECK(slurp(two / "sweep.csv") == reference);

  std::string shards;
  for (int k = 0; k < 3; ++k) {
    const fs::path s = test::fresh_folder("sweep_shard" + std::to_string(k));
    REQUIRE(sweep(base + " --shard " + std::to_string(k) + "/3 -o \"" + s.string() + "\"", log) ==
            0);
    shards += " \"" + s.string() + "\"";
  }
  const fs::path merged = test::fresh_folder("sweep_merged");
  REQUIRE(test::run_cli("merge" + shards + " -o \"" + merged.string() + "\" --no-plot -q", log) ==
          0);
  CHECK(slurp(merged / "sweep.csv") == reference);
  CHECK(slurp(merged / "sweep.json") == slurp(one / "sweep.json"));

  // A killed job: the journal keeps half the rows and a row cut short; the rerun completes it.
  const fs::path resumed = test::fresh_folder("sweep_resumed");
  fs::create_directories(resumed);
  {
    std::istringstream in(slurp(one / "journal.csv"));
    std::ofstream out(resumed / "journal.csv", std::ios::binary);
    std::string line;
    for (int n = 0; std::getline(in, line); ++n) {
      if (n < 2 + 5) out << line << "\n";                      // tag, header, 5 of 10 rows
      if (n == 2 + 5) out << line.substr(0, line.size() / 2);  // cut short
    }
  }
  REQUIRE(sweep(base + " -o \"" + resumed.string() + "\"", log) == 0);
  CHECK(slurp(resumed / "sweep.csv") == reference);

  // A different sweep into the same folder is refused.
  CHECK(sweep(config("hover_insect.yaml") + " --vary gait.frequency=20,21 -o \"" +
                  resumed.string() + "\"",
              log) == 2);
  CHECK(log.find("another sweep") != std::string::npos);
}

TEST_CASE("a case refused per case is a row with its status; the sweep goes on and says so") {
  const fs::path dir = test::fresh_folder("sweep_failures");
  std::string log;
  const int code = sweep(config("hover_insect.yaml") +
                             " --vary wing.strip_spacing=0,1 --set model.kind=wagner"
                             " --set wing.strips=40 -o \"" +
                             dir.string() + "\"",
                         log);
  // wing.strip_spacing takes a word: 0 and 1 are refused up front (nothing written).
  CHECK(code == 2);
  CHECK_FALSE(fs::exists(dir));
  const fs::path cases = test::fresh_folder("sweep_cases_file");
  fs::create_directories(cases);
  std::ofstream(cases / "cases.csv") << "# spacing per case\nwing.strip_spacing,gait.frequency\n"
                                        "uniform,\ncosine,\n,22\n~,20\n";
  REQUIRE(
      sweep(config("hover_insect.yaml") + " --cases \"" + (cases / "cases.csv").string() +
                "\" --set model.kind=wagner --set wing.strips=40 --set simulation.integrator=rk4"
                " --set wing.strip_spacing=uniform -o \"" +
                (cases / "out").string() + "\"",
            log) == 5);  // documented: some case failed
  const auto rows = table(cases / "out" / "sweep.csv");
  REQUIRE(rows.size() == 5u);
  CHECK(rows[1][3] == "converged");
  CHECK(rows[2][3] == "input_error");  // cosine tip strip too narrow for RK4 at 400 steps
  CHECK(rows[2][4].find("steps_per_cycle") != std::string::npos);
  CHECK(rows[2][5].empty());
  CHECK(rows[3][3] == "converged");
  CHECK(rows[3][1].empty());  // base value kept
  CHECK(rows[4][1] == "~");   // key removed: the default spacing (cosine), refused with RK4
  CHECK(rows[4][3] == "input_error");
}

TEST_CASE("bad sweep input: one line, exit 2, nothing written") {
  const fs::path dir = test::fresh_folder("sweep_bad");
  const std::string out = " -o \"" + dir.string() + "\"";
  const std::string hover = config("hover_insect.yaml");
  struct Bad {
    std::string args, says;
  };
  for (const Bad& b :
       {Bad{hover + " --vary gait.frequencyy=1,2", "unknown key"},
        Bad{hover + " --vary gait.frequency=0:30:4", "(0, 2000]"},
        Bad{hover + " --vary gait.frequency=20:30", "needs a count"},
        Bad{hover + " --vary gait.frequency=20:x:3", "not a number"},
        Bad{hover + " --vary gait.frequency=20,30 --shard 3/3", "K/N"},
        Bad{hover + " --vary gait.frequency=20,30 --design latin --samples 4", "ranges"},
        Bad{hover + " --vary wing.strips=5:6:3", "whole number"},
        Bad{hover, "at least one --vary"}}) {
    CAPTURE(b.args);
    std::string log;
    CHECK(sweep(b.args + out, log) == 2);
    CHECK(log.find(b.says) != std::string::npos);
    CHECK(std::count(log.begin(), log.end(), '\n') == 1);
    CHECK_FALSE(fs::exists(dir));
  }
  // merge: a missing shard, and shards of different sweeps.
  std::string log;
  const fs::path a = test::fresh_folder("sweep_merge_a"), b = test::fresh_folder("sweep_merge_b");
  REQUIRE(sweep(hover + " --vary gait.frequency=20,30 --shard 0/2 -o \"" + a.string() + "\"",
                log) == 0);
  REQUIRE(sweep(hover + " --vary gait.frequency=20,31 --shard 1/2 -o \"" + b.string() + "\"",
                log) == 0);
  CHECK(test::run_cli("merge \"" + a.string() + "\"" + out, log) == 2);
  CHECK(log.find("missing") != std::string::npos);
  CHECK(test::run_cli("merge \"" + a.string() + "\" \"" + b.string() + "\"" + out, log) == 2);
  CHECK(log.find("another sweep") != std::string::npos);
  CHECK_FALSE(fs::exists(dir));
}

TEST_CASE("latin sweeps are reproducible from the seed") {
  std::string log;
  const fs::path a = test::fresh_folder("sweep_latin_a"), b = test::fresh_folder("sweep_latin_b"),
                 c = test::fresh_folder("sweep_latin_c");
  const std::string args = config("hover_insect.yaml") +
                           " --design latin --samples 6 --vary gait.frequency=20:30"
                           " --vary gait.pitch.amplitude=log:30:50";
  REQUIRE(sweep(args + " --seed 5 -o \"" + a.string() + "\"", log) == 0);
  REQUIRE(sweep(args + " --seed 5 -o \"" + b.string() + "\"", log) == 0);
  REQUIRE(sweep(args + " --seed 6 -o \"" + c.string() + "\"", log) == 0);
  CHECK(slurp(a / "sweep.csv") == slurp(b / "sweep.csv"));
  CHECK(slurp(a / "sweep.csv") != slurp(c / "sweep.csv"));
  std::ifstream js(a / "sweep.json");
  const nlohmann::json j = nlohmann::json::parse(js);
  CHECK(j["design"]["seed"] == 5);
  CHECK(j["cases"] == 6);
}

TEST_CASE("compare runs one config under several override sets") {
  const fs::path dir = test::fresh_folder("compare_variants");
  std::string log;
  REQUIRE(
      test::run_cli("compare " + config("hover_insect.yaml") +
                        " --variant \"gait.frequency=20\" --variant \"gait.frequency=40\" -o \"" +
                        dir.string() + "\" --no-plot -q",
                    log) == 0);
  const std::string csv = slurp(dir / "comparison.csv");
  CHECK(csv.find("gait.frequency=20") != std::string::npos);
  // analytic: quasi-steady hover lift scales with f², so the ratio of the lift cells is 4.
  std::istringstream in(csv);
  std::string header, lift;
  std::getline(in, header);
  std::getline(in, lift);
  const auto cells = studies::csv_split(lift);
  REQUIRE(cells.size() == 3u);
  CHECK(number(cells[2]) / number(cells[1]) == doctest::Approx(4.0).epsilon(1e-5));  // 6 digits
}

TEST_CASE("rules between keys are left to the cases; a value's own range is checked up front") {
  std::string log;
  const std::string hover = config("hover_insect.yaml") + " --set wing.strips=6";
  // r̂₂ must exceed r̂₁: (0.5, 0.5) is refused per case, (0.45, 0.5) and (0.5, 0.55) run.
  const fs::path grid = test::fresh_folder("sweep_between");
  CHECK(sweep(hover +
                  " --vary wing.first_moment_radius=0.45,0.5"
                  " --vary wing.second_moment_radius=0.5,0.55 -o \"" +
                  grid.string() + "\"",
              log) == 5);
  const auto rows = table(grid / "sweep.csv");
  REQUIRE(rows.size() == 5u);
  CHECK(rows[1][3] == "converged");
  CHECK(rows[3][3] == "input_error");
  CHECK(rows[4][3] == "converged");
  // A case table that switches the planform and brings its own keys.
  const fs::path t = test::fresh_folder("sweep_planforms");
  fs::create_directories(t);
  std::ofstream(t / "cases.csv")
      << "wing.planform,wing.mean_chord,wing.first_moment_radius,wing.second_moment_radius,"
         "wing.root_chord\n,,,,\nelliptic,~,~,~,0.02\n";
  CHECK(sweep(hover + " --cases \"" + (t / "cases.csv").string() + "\" -o \"" +
                  (t / "out").string() + "\"",
              log) == 0);
  // The last point of a range is its stop, exactly (1 is the pitch axis' upper bound).
  const fs::path edge = test::fresh_folder("sweep_edge");
  CHECK(sweep(hover + " --vary wing.pitch_axis=0.2:1:4 -o \"" + edge.string() + "\"", log) != 2);
  CHECK(table(edge / "sweep.csv")[4][1] == "1");
  // A trailing dot, an element of a list that is not there, and a key varied twice are refused.
  const fs::path bad = test::fresh_folder("sweep_keys");
  for (const char* v : {" --vary gait.frequency.=20,25", " --vary flight.velocity.0=0,1",
                        " --vary gait.stroke=10,20 --vary gait.stroke.amplitude=50,60"}) {
    CAPTURE(v);
    CHECK(sweep(hover + v + " -o \"" + bad.string() + "\"", log) == 2);
    CHECK_FALSE(fs::exists(bad));
  }
}

TEST_CASE(
    "rows do not depend on how the config's path is spelled; merge never overwrites a shard") {
  const fs::path dir = test::fresh_folder("sweep_paths");
  fs::create_directories(dir);
  fs::copy_file(test::source_path("configs/hover_insect.yaml"), dir / "h.yaml");
  std::ofstream(dir / "pl.csv") << "wing.second_moment_radius\n0.55\n0.4\n";  // 0.4 < r̂₁: refused
  std::string log;
  CHECK(sweep("\"" + (dir / "h.yaml").string() + "\" --cases \"" + (dir / "pl.csv").string() +
                  "\" -o \"" + (dir / "a").string() + "\"",
              log) == 5);
  CHECK(sweep("\"" + (dir / "." / "h.yaml").string() + "\" --cases \"" + (dir / "pl.csv").string() +
                  "\" -o \"" + (dir / "b").string() + "\"",
              log) == 5);
  CHECK(slurp(dir / "a" / "sweep.csv") == slurp(dir / "b" / "sweep.csv"));
  const auto rows = table(dir / "a" / "sweep.csv");
  CHECK(rows[2][3].find("case wing.second_moment_radius=0.4") != std::string::npos);
  CHECK(rows[2][3].find(dir.string()) == std::string::npos);
  // Merging into a shard folder is refused.
  const fs::path s0 = dir / "s0", s1 = dir / "s1";
  const std::string base =
      config("hover_insect.yaml") + " --set wing.strips=6 --vary gait.frequency=20,25";
  REQUIRE(sweep(base + " --shard 0/2 -o \"" + s0.string() + "\"", log) == 0);
  REQUIRE(sweep(base + " --shard 1/2 -o \"" + s1.string() + "\"", log) == 0);
  const std::string before = slurp(s0 / "sweep.csv");
  CHECK(test::run_cli("merge \"" + s0.string() + "\" \"" + s1.string() + "\" -o \"" + s0.string() +
                          "\" --no-plot -q",
                      log) == 2);
  CHECK(slurp(s0 / "sweep.csv") == before);
}
