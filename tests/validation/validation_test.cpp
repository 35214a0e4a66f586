// The validation runner's pass/fail logic and report (the classical cases themselves run through
// `flapline validate` in ctest).
#include <doctest/doctest.h>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <string>

#include "flapline/common/errors.hpp"
#include "flapline/validation/validation.hpp"
#include "test_support.hpp"

using namespace flapline;
namespace fs = std::filesystem;

namespace {
/// A private copy of one built-in case folder.
fs::path copy_case(const std::string& name, const std::string& tag) {
  const fs::path dir = test::fresh_folder("validation_" + tag);
  fs::create_directories(dir);
  fs::copy(validation::default_cases_dir() / name, dir / name, fs::copy_options::recursive);
  return dir;
}

void replace_in(const fs::path& file, const std::string& from, const std::string& to) {
  std::ifstream in(file);
  std::string text((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  const auto pos = text.find(from);
  REQUIRE(pos != std::string::npos);
  text.replace(pos, from.size(), to);
  std::ofstream(file) << text;
}
}  // namespace

TEST_CASE("every built-in case folder has a handler and declares its sources and tolerances") {
  const auto cases = validation::load_cases(validation::default_cases_dir());
  CHECK(cases.size() >= 8);
  const auto known = validation::known_cases();
  for (const auto& c : cases) {
    CAPTURE(c.name);
    CHECK(std::find(known.begin(), known.end(), c.name) != known.end());
    CHECK(!c.source.empty());
    for (const auto& check : c.checks) {
      CHECK(check.tolerance > 0.0);
      CHECK(!check.why.empty());
    }
  }
}

TEST_CASE("a case passes with the right reference and fails with a deliberately wrong one") {
  // ISO 2533:1975 table (REFERENCES §6): the case file holds the transcribed reference.
  const fs::path good = copy_case("iso2533_density", "good");
  const auto ok = validation::run_case(validation::load_cases(good).front());
  CHECK(ok.ok());
  CHECK(ok.checks.size() == 4u);

  const fs::path bad = copy_case("iso2533_density", "bad");
  replace_in(bad / "iso2533_density" / "case.yaml", "[1000, 1.1117]", "[1000, 1.2117]");
  const auto wrong = validation::run_case(validation::load_cases(bad).front());
  CHECK_FALSE(wrong.ok());
  int failed = 0;
  for (const auto& c : wrong.checks) failed += c.pass ? 0 : 1;
  CHECK(failed == 1);
  const std::string md = validation::report_markdown({ok, wrong}, "no figures");
  CHECK(md.find("**FAIL**") != std::string::npos);
  CHECK(md.find("ISO 2533") != std::string::npos);
  CHECK(md.find("7 of 8 checks pass") != std::string::npos);

  // The CLI exits non-zero and still writes the report.
  std::string log;
  const fs::path out = test::fresh_folder("validation_cli_out");
  CHECK(test::run_cli(
            "validate --no-plot --cases-dir \"" + bad.string() + "\" -o \"" + out.string() + "\"",
            log) == 4);
  CHECK(fs::exists(out / "report.md"));
  CHECK(log.find("VALIDATION FAILED") != std::string::npos);
  fs::remove_all(out);
  CHECK(test::run_cli(
            "validate --no-plot --cases-dir \"" + good.string() + "\" -o \"" + out.string() + "\"",
            log) == 0);
  fs::remove_all(good);
  fs::remove_all(bad);
  fs::remove_all(out);
}

TEST_CASE("a tolerance tighter than the model's known error fails the case") {
  // The Jones fit's own error against the exact Wagner function is 0.0096 (REFERENCES §1): a
  // tolerance of 1e-3 on that check must fail.
  const fs::path dir = copy_case("wagner_step", "tight");
  replace_in(dir / "wagner_step" / "case.yaml", "tolerance: 1.0e-2", "tolerance: 1.0e-3");
  const auto r = validation::run_case(validation::load_cases(dir).front());
  CHECK_FALSE(r.ok());
  fs::remove_all(dir);
}

TEST_CASE("a malformed case file is an input error naming the file and key") {
  const fs::path dir = copy_case("iso2533_density", "malformed");
  replace_in(dir / "iso2533_density" / "case.yaml", "measure: relative", "measure: percent");
  try {
    validation::load_cases(dir);
    FAIL("accepted");
  } catch (const InputError& e) {
    CHECK(e.key() == "checks.measure");
    CHECK(e.file().find("case.yaml") != std::string::npos);
    CHECK(e.line() > 0);
  }
  CHECK_THROWS_AS(validation::load_cases(dir, "no_such_case"), InputError);
  fs::remove_all(dir);
}
