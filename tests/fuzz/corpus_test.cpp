// The config loader's fuzz corpus replayed in every build: each seed (every config in the
// repository and the hand-made seeds) and each past finding (tests/fuzz/regressions) either loads
// or is refused with an InputError; a crash, a sanitizer report or a broken round trip of
// resolved.yaml fails here as it did under the fuzzer.
#include <doctest/doctest.h>

#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <vector>

#include "fuzz_input.hpp"
#include "test_support.hpp"

namespace fs = std::filesystem;
using namespace flapline;

namespace {
std::vector<fs::path> yaml_files(const fs::path& dir, bool recursive) {
  std::vector<fs::path> out;
  auto take = [&](const fs::directory_entry& e) {
    if (e.is_regular_file() && e.path().extension() == ".yaml") out.push_back(e.path());
  };
  if (recursive)
    for (const auto& e : fs::recursive_directory_iterator(dir)) take(e);
  else
    for (const auto& e : fs::directory_iterator(dir)) take(e);
  return out;
}

std::vector<fs::path> files_in(const fs::path& dir) {
  std::vector<fs::path> out;
  for (const auto& e : fs::directory_iterator(dir))
    if (e.is_regular_file() && e.path().filename().string()[0] != '.') out.push_back(e.path());
  return out;
}

/// Replays one file; returns whether it loaded.
bool replay(const fs::path& file, const fs::path& scratch) {
  std::ifstream in(file, std::ios::binary);
  const std::string bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  const auto input = fuzz::split(reinterpret_cast<const std::uint8_t*>(bytes.data()), bytes.size());
  return fuzz::load(input, scratch.string());
}
}  // namespace

TEST_CASE("fuzz seeds: every config in the repository loads or is refused, nothing else") {
  const fs::path scratch = test::fresh_folder("fuzz_seeds");
  fs::create_directories(scratch);
  int loaded = 0, refused = 0;
  std::vector<fs::path> files = yaml_files(test::source_path("configs"), false);
  const auto validation = yaml_files(test::source_path("validation/cases"), true);
  const auto bad = yaml_files(test::source_path("tests/io/bad_input"), false);
  const auto seeds = files_in(test::source_path("tests/fuzz/seeds"));
  for (const auto* more : {&validation, &bad, &seeds})
    files.insert(files.end(), more->begin(), more->end());
  for (const fs::path& f : files) {
    CAPTURE(f.string());
    // validation case.yaml files are not configs (they describe a check): refused is fine.
    CHECK_NOTHROW(replay(f, scratch) ? ++loaded : ++refused);
  }
  // The demos and the hand-made seeds load; the bad-input catalogue is refused.
  CHECK(loaded >= 20);
  CHECK(refused >= static_cast<int>(bad.size()));
  fs::remove_all(scratch);
}

TEST_CASE("fuzz findings: every input that once broke the loader now loads or is refused") {
  const fs::path scratch = test::fresh_folder("fuzz_regressions");
  fs::create_directories(scratch);
  for (const fs::path& f : files_in(test::source_path("tests/fuzz/regressions"))) {
    CAPTURE(f.string());
    CHECK_NOTHROW(replay(f, scratch));
  }
  fs::remove_all(scratch);
}

TEST_CASE("the fuzz input format: #set, #case and #csv lines") {
  const std::string text =
      "gait:\n  frequency: 10\n#set gait.frequency=12\n#case wing.span=0.2\n#case wing.mass\n"
      "#csv\nspan_fraction,chord,leading_edge\n0,1,0\n";
  const auto in = fuzz::split(reinterpret_cast<const std::uint8_t*>(text.data()), text.size());
  CHECK(in.sets == std::vector<std::string>{"gait.frequency=12"});
  REQUIRE(in.study_case.overrides.size() == 2);
  CHECK(in.study_case.overrides[0] == studies::Override{"wing.span", "0.2", false});
  CHECK(in.study_case.overrides[1] == studies::Override{"wing.mass", "", true});
  CHECK(in.has_csv);
  CHECK(in.csv == "span_fraction,chord,leading_edge\n0,1,0\n");
  CHECK(in.text.find("#csv") == std::string::npos);
}
