#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <map>

#include "flapline/common/errors.hpp"
#include "flapline/validation/validation.hpp"

namespace flapline::validation {

namespace fs = std::filesystem;

const CheckSpec& CaseSpec::check(const std::string& id) const {
  for (const CheckSpec& c : checks)
    if (c.id == id) return c;
  throw InputError(name + ".checks", id, "case.yaml declares no check with this id",
                   "every check the case computes needs a tolerance and a reason in case.yaml");
}

bool CaseResult::ok() const {
  return failure.empty() && !checks.empty() &&
         std::all_of(checks.begin(), checks.end(), [](const Check& c) { return c.pass; });
}

fs::path default_cases_dir() {
  // An installed binary finds the cases in the data folder beside it (PREFIX/bin/flapline →
  // PREFIX/share/flapline/validation/cases); a build-tree binary uses the source tree's.
  std::error_code ec;
  const fs::path exe = fs::read_symlink("/proc/self/exe", ec);
  if (!ec) {
    const fs::path installed = exe.parent_path().parent_path() / FLAPLINE_INSTALLED_CASES;
    if (fs::is_directory(installed, ec)) return installed;
  }
  return fs::path(FLAPLINE_VALIDATION_CASES);
}

namespace {

[[noreturn]] void bad(const fs::path& file, const YAML::Node& at, const std::string& key,
                      const std::string& allowed) {
  InputError e(key, "", allowed);
  e.locate(file.string(), at.IsDefined() && at.Mark().line >= 0 ? at.Mark().line + 1 : 0);
  throw e;
}

std::string text(const fs::path& file, const YAML::Node& map, const char* key) {
  const YAML::Node n = map[key];
  if (!n.IsScalar()) bad(file, map, key, "required text");
  return n.Scalar();
}

CaseSpec read_case(const fs::path& dir) {
  const fs::path file = dir / "case.yaml";
  YAML::Node root;
  try {
    root = YAML::LoadFile(file.string());
  } catch (const YAML::Exception& ex) {
    InputError e("(syntax)", "", "YAML error: " + ex.msg);
    e.locate(file.string(), ex.mark.line + 1);
    throw e;
  }
  CaseSpec c;
  c.dir = dir;
  c.name = text(file, root, "name");
  c.title = text(file, root, "title");
  c.compared = text(file, root, "compared");
  c.source = text(file, root, "source");
  if (root["config"].IsDefined()) c.config = dir / text(file, root, "config");
  const YAML::Node checks = root["checks"];
  if (!checks.IsSequence() || checks.size() == 0)
    bad(file, root, "checks", "a list of {id, tolerance, measure, why}");
  for (const YAML::Node& n : checks) {
    CheckSpec s;
    s.id = text(file, n, "id");
    s.measure = text(file, n, "measure");
    if (s.measure != "relative" && s.measure != "absolute" && s.measure != "degrees")
      bad(file, n["measure"], "checks.measure", "relative | absolute | degrees");
    try {
      s.tolerance = n["tolerance"].as<double>();
    } catch (const YAML::Exception&) {
      bad(file, n, "checks.tolerance", "a number > 0");
    }
    if (!(s.tolerance > 0)) bad(file, n, "checks.tolerance", "a number > 0");
    s.why = text(file, n, "why");
    if (n["law"].IsDefined()) s.law = text(file, n, "law");
    c.checks.push_back(s);
  }
  if (const YAML::Node ref = root["reference"]; ref.IsDefined()) {
    c.table_source = text(file, ref, "source");
    for (const YAML::Node& row : ref["rows"]) {
      std::vector<double> r;
      for (const YAML::Node& v : row) r.push_back(v.as<double>());
      c.table.push_back(r);
    }
  }
  return c;
}

std::string number(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.6g", v);
  return buf;
}

}  // namespace

std::vector<CaseSpec> load_cases(const fs::path& dir, const std::string& only) {
  std::vector<fs::path> folders;
  if (!fs::is_directory(dir)) {
    InputError e("--cases-dir", dir.string(), "must be a folder of validation cases");
    throw e;
  }
  for (const auto& entry : fs::directory_iterator(dir))
    if (entry.is_directory() && fs::exists(entry.path() / "case.yaml"))
      folders.push_back(entry.path());
  std::sort(folders.begin(), folders.end());
  std::vector<CaseSpec> out;
  for (const auto& f : folders) {
    if (!only.empty() && f.filename() != only) continue;
    out.push_back(read_case(f));
  }
  if (!only.empty() && out.empty()) {
    std::string names;
    for (const auto& f : folders) names += (names.empty() ? "" : ", ") + f.filename().string();
    throw InputError("--case", only, "no such case; cases: " + names);
  }
  return out;
}

/// A table cell: `|` would end the cell early in Markdown.
std::string cell(const std::string& text) {
  std::string out;
  for (char ch : text) {
    if (ch == '|') out += '\\';
    out += ch;
  }
  return out;
}

std::string report_markdown(const std::vector<CaseResult>& results,
                            const std::string& figures_note) {
  int passed = 0, total = 0;
  for (const auto& r : results)
    for (const auto& c : r.checks) {
      ++total;
      passed += c.pass ? 1 : 0;
    }
  std::string md = "# flapline validation report\n\n";
  md += std::to_string(passed) + " of " + std::to_string(total) + " checks pass in " +
        std::to_string(results.size()) + " cases. " + figures_note +
        " The published values and how far each was checked: validation/REFERENCES.md (shipped "
        "with flapline; installed under share/flapline/validation).\n\n";
  md += "| case | compared | checks passed | source |\n|---|---|---|---|\n";
  for (const auto& r : results) {
    const long ok =
        std::count_if(r.checks.begin(), r.checks.end(), [](const Check& c) { return c.pass; });
    md += "| " + cell(r.spec.name) + " | " + cell(r.spec.compared) + " | " +
          (r.failure.empty() ? std::to_string(ok) + " / " + std::to_string(r.checks.size())
                             : "could not run: " + cell(r.failure)) +
          " | " + cell(r.spec.source) + " |\n";
  }
  for (const auto& r : results) {
    md += "\n## " + r.spec.name + ": " + r.spec.title + "\n\n";
    md += "Compared: " + r.spec.compared + ". Source: " + r.spec.source + ".\n";
    if (!r.spec.table_source.empty()) md += "Reference table: " + r.spec.table_source + ".\n";
    md += "\nTolerances:\n";
    for (const auto& s : r.spec.checks)
      md += "- `" + s.id + "`: " + number(s.tolerance) + " (" + s.measure + ") — " + s.why + "\n";
    if (!r.failure.empty()) md += "\n**Could not run:** " + r.failure + "\n";
    md +=
        "\n| quantity, against | flapline | reference | error | tolerance | result |\n"
        "|---|---|---|---|---|---|\n";
    for (const auto& c : r.checks) {
      const std::string law = c.law.empty() ? r.spec.check(c.id).law : c.law;
      md += "| " + cell(c.quantity + (law.empty() ? std::string() : ", " + law)) + " | " +
            number(c.value) + " | " + number(c.reference) + " | " + number(c.error) +
            (c.measure == "degrees" ? " deg" : "") + " | " + number(c.tolerance) + " | " +
            (c.pass ? "pass" : "**FAIL**") + " |\n";
    }
    for (std::size_t f = 0; f < r.figures.size(); ++f)
      md += "\n![" + r.figures[f].title + "](" + r.spec.name +
            (f == 0 ? std::string() : "_" + std::to_string(f + 1)) + ".png)\n";
  }
  return md;
}

}  // namespace flapline::validation
