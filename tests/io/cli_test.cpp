// The command-line tool end to end: output files, exit status, no partial files on bad input.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <nlohmann/json.hpp>
#include <string>

#include "flapline/version.hpp"
#include "test_support.hpp"

using namespace flapline;
namespace fs = std::filesystem;

TEST_CASE("flapline run writes history.csv, summary.json and spanwise.csv for every demo") {
  for (const char* demo : {"hover_insect", "forward_bat", "rolling_bat", "sizing_insect",
                           "hover_inflow", "cruise_bat"}) {
    CAPTURE(demo);
    const fs::path out = test::fresh_folder(std::string("cli_") + demo);
    std::string log;
    const int code =
        test::run_cli("run \"" + test::source_path(std::string("configs/") + demo + ".yaml") +
                          "\" -o \"" + out.string() + "\"",
                      log);
    CHECK(code == 0);
    CHECK(log.find("Cautions:") != std::string::npos);  // the run summary carries the cautions
    for (const char* f :
         {"history.csv", "summary.json", "spanwise.csv", "drive.csv", "resolved.yaml"})
      CHECK(fs::exists(out / f));
    std::ifstream js(out / "summary.json");
    const nlohmann::json j = nlohmann::json::parse(js);
    CHECK(j["cycle_mean"]["lift_N"].get<double>() > 0.0);
    CHECK(j.contains("cautions"));
    CHECK(j["derived"].contains("reverse_flow_fraction"));
    CHECK(j["derived"].contains("stroke_peak_to_peak_deg"));
    CHECK(j["version"] == kVersion);
    CHECK(j["overrides"].is_array());
    CHECK(j["configuration"]["simulation"].contains("steps_per_cycle"));
    CHECK(j["drive"]["pair"]["power_storage_none_W"].get<double>() >=
          j["drive"]["pair"]["power_storage_perfect_W"].get<double>());
    CHECK(j.contains("inflow") == (std::string(demo).find("inflow") != std::string::npos ||
                                   std::string(demo) == "cruise_bat"));
    // No temporary file survives.
    for (const auto& e : fs::directory_iterator(out))
      CHECK(e.path().filename().string().find(".tmp-") == std::string::npos);
    fs::remove_all(out);
  }
}

TEST_CASE("every demo also runs with the wagner and lifting_line models") {
  for (const char* model : {"wagner", "lifting_line"})
    for (const char* demo : {"hover_insect", "forward_bat", "rolling_bat", "pitching_wing"}) {
      CAPTURE(model);
      CAPTURE(demo);
      const fs::path out = test::fresh_folder(std::string("cli_model_") + demo);
      std::string log;
      CHECK(test::run_cli("run \"" + test::source_path(std::string("configs/") + demo + ".yaml") +
                              "\" --set model.kind=" + model + " --no-plot -q -o \"" +
                              out.string() + "\"",
                          log) == 0);
      CHECK(fs::exists(out / "summary.json"));
      fs::remove_all(out);
    }
}

TEST_CASE("--state-space T writes the frozen-time matrices of a lag model") {
  const fs::path out = test::fresh_folder("cli_state_space");
  std::string log;
  CHECK(test::run_cli("run \"" + test::source_path("configs/forward_bat.yaml") +
                          "\" --set model.kind=lifting_line --state-space 0.05 -q -o \"" +
                          out.string() + "\"",
                      log) == 0);
  std::ifstream js(out / "state_space.json");
  const nlohmann::json j = nlohmann::json::parse(js);
  CHECK(j["A"].size() == 80u);  // 2 states × 2 wings × 20 strips
  CHECK(j["A"][0].size() == 80u);
  CHECK(j["B"][0].size() == 40u);  // inputs: w_¾ per strip
  CHECK(j["C"].size() == 40u);     // outputs: Γ per strip
  CHECK(j["time_s"].get<double>() == 0.05);
  fs::remove_all(out);
  // The quasi-steady model has no states: refused, nothing written.
  CHECK(test::run_cli("run \"" + test::source_path("configs/forward_bat.yaml") +
                          "\" --state-space 0.05 -q -o \"" + out.string() + "\"",
                      log) == 2);
  CHECK_FALSE(fs::exists(out));
}

TEST_CASE("--plot renders the run's figures when gnuplot is there, and says so when not") {
  const fs::path out = test::fresh_folder("cli_plots");
  std::string log;
  CHECK(test::run_cli("run \"" + test::source_path("configs/forward_bat.yaml") + "\" -o \"" +
                          out.string() + "\"",
                      log) == 0);
  if (log.find("figures skipped") == std::string::npos) {
    for (const char* f : {"forces", "moments", "power", "gait", "spanwise", "planform", "stroke"}) {
      CAPTURE(f);
      CHECK(fs::file_size(out / (std::string(f) + ".png")) > 1000);
      CHECK(fs::exists(out / (std::string(f) + ".svg")));
    }
  } else {
    CHECK_FALSE(fs::exists(out / "forces.png"));
  }
  fs::remove_all(out);
  // --no-plot writes only the data files.
  CHECK(test::run_cli("run \"" + test::source_path("configs/forward_bat.yaml") +
                          "\" --no-plot -q -o \"" + out.string() + "\"",
                      log) == 0);
  CHECK_FALSE(fs::exists(out / "forces.png"));
  fs::remove_all(out);
}

TEST_CASE("compare runs every case with the same model and tabulates them side by side") {
  const fs::path out = test::fresh_folder("cli_compare");
  std::string log;
  CHECK(test::run_cli("compare \"" + test::source_path("configs/forward_bat.yaml") + "\" \"" +
                          test::source_path("configs/rolling_bat.yaml") +
                          "\" --model wagner --no-plot -q -o \"" + out.string() + "\"",
                      log) == 0);
  std::ifstream csv(out / "comparison.csv");
  std::string header, lift_row;
  std::getline(csv, header);
  std::getline(csv, lift_row);
  CHECK(header == "quantity,forward_bat,rolling_bat");
  CHECK(lift_row.rfind("\"mean lift (N)\",", 0) == 0);
  std::ifstream md(out / "comparison.md");
  const std::string text((std::istreambuf_iterator<char>(md)), std::istreambuf_iterator<char>());
  CHECK(text.find("model wagner") != std::string::npos);
  CHECK(text.find("| mean roll moment L (N m) |") != std::string::npos);
  fs::remove_all(out);
  // One config is not a comparison.
  CHECK(test::run_cli("compare \"" + test::source_path("configs/forward_bat.yaml") + "\"", log) ==
        2);
}

TEST_CASE("bad input: exit status 2, one line naming the file and key, and no output left") {
  const fs::path dir = test::source_path("tests/io/bad_input");
  for (const auto& entry : fs::directory_iterator(dir)) {
    if (entry.path().extension() != ".yaml") continue;
    CAPTURE(entry.path().filename().string());
    std::ifstream in(entry.path());
    std::string first;
    std::getline(in, first);
    const std::string key = first.substr(first.find("expect: ") + 8);
    const fs::path out = test::fresh_folder("bad_" + entry.path().stem().string());
    std::string log;
    const int code =
        test::run_cli("run \"" + entry.path().string() + "\" -o \"" + out.string() + "\"", log);
    CHECK(code == 2);
    CHECK(log.find("key '" + key + "'") != std::string::npos);
    CHECK(log.find(entry.path().filename().string()) != std::string::npos);
    CHECK(std::count(log.begin(), log.end(), '\n') == 1);
    CHECK_FALSE(fs::exists(out));
  }
}

TEST_CASE("--set errors and a missing file also exit with status 2") {
  std::string log;
  const fs::path out = test::fresh_folder("bad_set");
  CHECK(test::run_cli("run \"" + test::source_path("configs/hover_insect.yaml") +
                          "\" --set wing.strips=0 -o \"" + out.string() + "\"",
                      log) == 2);
  CHECK(log.find("--set wing.strips=0") != std::string::npos);
  CHECK_FALSE(fs::exists(out));
  CHECK(test::run_cli("run /nonexistent/case.yaml -o \"" + out.string() + "\"", log) == 2);
  CHECK_FALSE(fs::exists(out));
  // The file itself is named, not a key: "PATH: the configuration file could not be opened".
  CHECK(log.find("/nonexistent/case.yaml: the configuration file could not be opened") !=
        std::string::npos);
  CHECK(log.find("(file)") == std::string::npos);
  // A directory or a device is refused before anything is read.
  for (const char* path : {"/dev/zero", "/tmp"}) {
    CHECK(test::run_cli(std::string("run ") + path + " -o \"" + out.string() + "\"", log) == 2);
    CHECK(log.find("not a regular file") != std::string::npos);
  }
  CHECK_FALSE(fs::exists(out));
}

TEST_CASE("a setting the chosen model would ignore is refused, also after --set model.kind") {
  // The revolving-wing fit is a quasi-steady law: switching the model to a lag model on the
  // command line must not fall back to the thin-airfoil law without a word.
  const fs::path out = test::fresh_folder("unused_setting");
  std::string log;
  CHECK(test::run_cli("run \"" + test::source_path("configs/hover_insect.yaml") +
                          "\" --set model.coefficient_law=revolving_fit "
                          "--set model.suction_recovery=1 --set model.kind=wagner -o \"" +
                          out.string() + "\"",
                      log) == 2);
  CHECK(log.find("key 'model.coefficient_law'") != std::string::npos);
  CHECK(log.find("model.kind wagner") != std::string::npos);
  CHECK_FALSE(fs::exists(out));
  // Every demo still runs with every model that can take its options.
  for (const char* demo : {"hover_insect", "forward_bat", "pitching_wing", "sizing_insect"})
    for (const char* kind : {"quasi_steady", "wagner", "lifting_line"}) {
      CAPTURE(demo);
      CAPTURE(kind);
      CHECK(
          test::run_cli("run \"" + test::source_path(std::string("configs/") + demo + ".yaml") +
                            "\" --no-plot --quiet --set model.kind=" + kind +
                            " --set wing.strips=6 --set simulation.steps_per_cycle=40 --set "
                            "simulation.samples_per_cycle=20 --set simulation.max_cycles=2 -o \"" +
                            out.string() + "\"",
                        log) == 0);
    }
  fs::remove_all(out);
}

TEST_CASE(
    "output folders: a folder flapline did not write is refused; a rerun replaces its files") {
  const fs::path out = test::fresh_folder("owned_folder");
  fs::create_directories(out);
  std::ofstream(out / "notes.txt") << "someone's notes\n";
  const std::string config = "\"" + test::source_path("configs/hover_insect.yaml") + "\"";
  const std::string quick =
      " --set wing.strips=6 --set simulation.steps_per_cycle=40 "
      "--set simulation.samples_per_cycle=20 --set simulation.max_cycles=2";
  std::string log;
  // Not written by flapline and not empty: refused, nothing written, nothing touched.
  CHECK(test::run_cli("run " + config + quick + " -o \"" + out.string() + "\"", log) == 2);
  CHECK(log.find(out.string()) != std::string::npos);
  CHECK(log.find("did not write") != std::string::npos);
  CHECK_FALSE(fs::exists(out / "summary.json"));
  CHECK(fs::exists(out / "notes.txt"));
  fs::remove(out / "notes.txt");
  // Empty: used, and marked. A second run without figures removes the first run's figures but
  // leaves a file someone added since.
  CHECK(test::run_cli("run " + config + quick + " --plot -o \"" + out.string() + "\"", log) == 0);
  CHECK(fs::exists(out / ".flapline-output"));
  const bool figures = fs::exists(out / "forces.svg");
  std::ofstream(out / "notes.txt") << "added after the run\n";
  CHECK(test::run_cli("run " + config + quick + " --no-plot -o \"" + out.string() + "\"", log) ==
        0);
  CHECK(fs::exists(out / "summary.json"));
  CHECK(fs::exists(out / "notes.txt"));
  if (figures) CHECK_FALSE(fs::exists(out / "forces.svg"));
  fs::remove_all(out);
}
