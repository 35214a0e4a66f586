#include "flapline/io/sweep.hpp"

#include <algorithm>
#include <charconv>
#include <cmath>
#include <fstream>
#include <nlohmann/json.hpp>
#include <set>
#include <sstream>

#include "flapline/common/errors.hpp"
#include "flapline/io/plots.hpp"
#include "flapline/io/writers.hpp"
#include "flapline/studies/table.hpp"
#include "flapline/version.hpp"

namespace flapline::io {
namespace {

namespace fs = std::filesystem;

const char* const kJournal = "journal.csv";
const char* const kJournalTag = "# flapline sweep journal";

std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

[[noreturn]] void fail_at(const std::string& key, const std::string& value,
                          const std::string& allowed, const std::string& file, int line) {
  InputError e(key, value, allowed);
  e.locate(file, line);
  throw e;
}

/// --cases FILE.csv: a header of key paths, then one case per row; an empty cell keeps the base
/// value, `~` removes the key. Lines starting with '#' and blank lines are skipped.
void read_case_table(SweepDefinition& def) {
  const std::string& path = def.cases_file;
  std::error_code ec;
  if (!fs::is_regular_file(path, ec))
    fail_at("--cases", "'" + path + "'", "must name a CSV file of cases (no such file)",
            "command line", 0);
  std::ifstream in(path);
  std::string line;
  int lineno = 0;
  bool header = false;
  while (std::getline(in, line)) {
    ++lineno;
    if (!line.empty() && line.back() == '\r') line.pop_back();
    if (lineno == 1 && line.rfind("\xEF\xBB\xBF", 0) == 0) line.erase(0, 3);  // a UTF-8 BOM
    const auto first = line.find_first_not_of(" \t");
    if (first == std::string::npos || (!header && line[first] == '#')) continue;
    std::vector<std::string> cells = studies::csv_split(line);
    for (std::string& c : cells) {
      const auto a = c.find_first_not_of(" \t"), b = c.find_last_not_of(" \t");
      c = a == std::string::npos ? std::string() : c.substr(a, b - a + 1);
    }
    if (!header) {
      std::set<std::string> seen;
      for (const std::string& c : cells) {
        if (c.empty())
          fail_at("--cases", "'" + line + "'", "every header cell must be a key path", path,
                  lineno);
        if (!seen.insert(c).second)
          fail_at("--cases", "'" + c + "'", "each key path may head one column only", path, lineno);
      }
      def.columns = cells;
      header = true;
      continue;
    }
    if (cells.size() != def.columns.size())
      fail_at("--cases", "'" + line + "'",
              "each row needs " + std::to_string(def.columns.size()) + " cells (one per column); " +
                  std::to_string(cells.size()) + " given",
              path, lineno);
    studies::CaseSpec c;
    for (std::size_t j = 0; j < cells.size(); ++j) {
      if (cells[j].empty()) continue;
      if (cells[j] == "~")
        c.overrides.push_back({def.columns[j], "", true});
      else
        c.overrides.push_back({def.columns[j], cells[j], false});
    }
    def.cases.push_back(std::move(c));
  }
  if (!header)
    fail_at("--cases", "'" + path + "'", "the file holds no header of key paths", path, lineno);
  if (def.cases.empty())
    fail_at("--cases", "'" + path + "'", "the file holds no case rows", path, lineno);
}

double parse_cell(const std::string& s) {
  double v = std::numeric_limits<double>::quiet_NaN();
  if (s.empty()) return v;
  const auto r = std::from_chars(s.data(), s.data() + s.size(), v);
  return r.ec == std::errc() ? v : std::numeric_limits<double>::quiet_NaN();
}

/// An error the key's value earns whatever the other keys hold (so a sweep should not start):
/// raised for the key itself or for a key above it (an unknown key, a list that is not there),
/// and not a rule between keys (InputError::between_keys).
bool about_key(const InputError& e, const std::string& key) {
  if (e.is_between_keys()) return false;
  return e.key() == key || key.rfind(e.key() + ".", 0) == 0;
}

std::string safe_stem(const std::string& key) {
  std::string s = key;
  for (char& c : s)
    if (!std::isalnum(static_cast<unsigned char>(c))) c = '_';
  return s;
}

}  // namespace

void complete_definition(SweepDefinition& def) {
  def.cases.clear();
  if (!def.cases_file.empty()) {
    def.design.kind = studies::DesignKind::table;
    read_case_table(def);
  } else {
    if (def.vary_specs.empty())
      throw InputError("--vary", "(none)",
                       "a sweep needs at least one --vary KEY=VALUES or a --cases FILE.csv");
    def.design.keys.clear();
    std::set<std::string> seen;
    for (const std::string& v : def.vary_specs) {
      def.design.keys.push_back(studies::parse_vary(v));
      if (!seen.insert(def.design.keys.back().key).second)
        throw InputError("--vary " + def.design.keys.back().key, "'" + v + "'",
                         "each key may be varied once");
    }
    def.columns = studies::varied_keys(def.design);
    def.cases = studies::make_cases(def.design);
  }
  // One spelling per key: no key may also be varied through a key above or below it.
  for (const std::string& a : def.columns)
    for (const std::string& b : def.columns)
      if (a != b && b.rfind(a + ".", 0) == 0)
        throw InputError(def.cases_file.empty() ? "--vary " + b : "--cases " + b, "'" + b + "'",
                         "is part of '" + a + "', which is varied too; vary one of them");
  studies::Fingerprint f;
  f.add("flapline sweep");
  f.add(def.config_text);
  for (const std::string& s : def.sets) f.add(s);
  f.add(std::string(to_string(def.design.kind)));
  for (const std::string& c : def.columns) f.add(c);
  for (const studies::CaseSpec& c : def.cases) {
    f.add("case");
    for (const studies::Override& o : c.overrides) {
      f.add(o.key);
      f.add(o.remove ? std::string("~remove") : o.text);
    }
  }
  def.fingerprint = f.hex();
}

void check_sweep_values(const SweepDefinition& def, const CaseLoader& loader) {
  // The base configuration alone first: every case would fail with it.
  (void)loader.build(studies::CaseSpec{});
  for (std::size_t j = 0; j < def.columns.size(); ++j) {
    const std::string& key = def.columns[j];
    std::vector<std::string> texts;
    if (def.design.kind == studies::DesignKind::latin) {
      texts = {studies::shortest(def.design.keys[j].low),
               studies::shortest(def.design.keys[j].high)};
    } else {
      std::set<std::string> seen;
      for (const studies::CaseSpec& c : def.cases)
        for (const studies::Override& o : c.overrides)
          if (o.key == key && !o.remove && seen.insert(o.text).second) texts.push_back(o.text);
    }
    for (const std::string& t : texts) {
      try {
        (void)loader.build(studies::CaseSpec{{{key, t, false}}});
      } catch (const InputError& e) {
        if (!about_key(e, key)) continue;  // a rule between keys: decided per case
        InputError up(e.key(), e.value().empty() ? "'" + t + "'" : e.value(), e.allowed(),
                      e.hint());
        up.locate(def.cases_file.empty() ? "command line (--vary " + key + ")"
                                         : def.cases_file + " (column " + key + ")",
                  0);
        throw up;
      }
    }
  }
}

Shard Shard::parse(const std::string& text) {
  Shard s;
  const auto slash = text.find('/');
  auto whole = [&](const std::string& t, int& out) {
    const auto r = std::from_chars(t.data(), t.data() + t.size(), out);
    return !t.empty() && r.ec == std::errc() && r.ptr == t.data() + t.size();
  };
  if (slash == std::string::npos || !whole(text.substr(0, slash), s.index) ||
      !whole(text.substr(slash + 1), s.count) || s.count < 1 || s.index < 0 || s.index >= s.count)
    throw InputError("--shard", "'" + text + "'",
                     "must be K/N with whole numbers 0 <= K < N (shard K of N)");
  return s;
}

std::string sweep_json(const SweepDefinition& def, const Shard& shard) {
  using nlohmann::json;
  json j;
  j["version"] = kVersion;
  j["config"] = {{"path", def.config_path}, {"content", def.config_text}};
  j["overrides"] = def.sets;
  json design = {{"kind", std::string(to_string(def.design.kind))}, {"keys", def.columns}};
  if (def.design.kind == studies::DesignKind::table) {
    design["cases_file"] = def.cases_file;
  } else {
    design["vary"] = def.vary_specs;
  }
  if (def.design.kind == studies::DesignKind::latin) {
    design["samples"] = def.design.samples;
    design["seed"] = def.design.seed;
  }
  j["design"] = design;
  j["cases"] = def.cases.size();
  j["fingerprint"] = def.fingerprint;
  if (shard.count > 1) j["shard"] = {{"index", shard.index}, {"count", shard.count}};
  j["table"] =
      "sweep.csv: one row per case in case order; columns case, the varied keys, status, "
      "message, cycles, then summary.json's scalars by key path";
  return j.dump(2) + "\n";
}

std::string sweep_csv(const std::vector<std::string>& columns,
                      const std::map<std::size_t, std::string>& rows) {
  std::string out = studies::table_header(columns);
  for (const auto& [index, row] : rows) out += row;
  return out;
}

SweepFolder::SweepFolder(fs::path dir, const SweepDefinition& def, const Shard& shard)
    : dir_(std::move(dir)), def_(def), shard_(shard), header_(studies::table_header(def.columns)) {
  const std::string tag = std::string(kJournalTag) + "; flapline " + kVersion + "; fingerprint " +
                          def.fingerprint + "; shard " + std::to_string(shard.index) + "/" +
                          std::to_string(shard.count) + "\n";
  const fs::path journal = dir_ / kJournal;
  std::error_code ec;
  if (fs::exists(journal, ec)) {
    std::string text = slurp(journal);
    const std::size_t nl = text.find('\n');
    const std::string first = nl == std::string::npos ? text : text.substr(0, nl + 1);
    const std::size_t nl2 = nl == std::string::npos ? nl : text.find('\n', nl + 1);
    const std::string second =
        nl2 == std::string::npos ? std::string() : text.substr(nl + 1, nl2 - nl);
    if (first != tag || second != header_) {
      std::string what = first.rfind(kJournalTag, 0) == 0
                             ? first.substr(std::string(kJournalTag).size() + 2)
                             : std::string("not a sweep journal");
      if (!what.empty() && what.back() == '\n') what.pop_back();
      throw InputError(
          "-o", "'" + dir_.string() + "'",
          "the folder holds another sweep (" + what + "); choose another folder or remove it");
    }
    // Drop a row cut short by a killed job, so that appending starts on a fresh line.
    const std::size_t last = text.rfind('\n');
    if (last + 1 != text.size()) {
      text.resize(last + 1);
      fs::resize_file(journal, text.size());
    }
    std::istringstream in(text);
    std::string line;
    std::getline(in, line);  // tag
    std::getline(in, line);  // header
    const std::size_t columns = studies::table_columns(def.columns).size();
    while (std::getline(in, line)) {
      line += "\n";
      const long index = studies::row_index(line, columns);
      if (index >= 0 && static_cast<std::size_t>(index) < def.cases.size() &&
          shard.owns(static_cast<std::size_t>(index)))
        rows_[static_cast<std::size_t>(index)] = line;
    }
  } else {
    if (fs::exists(dir_, ec) && !fs::is_empty(dir_, ec))
      throw InputError("-o", "'" + dir_.string() + "'",
                       "the folder is not empty and holds no sweep journal; choose an empty or "
                       "new folder");
    fs::create_directories(dir_, ec);
    if (ec) throw std::runtime_error("cannot create " + dir_.string() + ": " + ec.message());
    std::ofstream(journal, std::ios::binary) << tag << header_;
  }
  journal_ = std::fopen(journal.string().c_str(), "ab");
  if (!journal_) throw std::runtime_error("cannot open " + journal.string() + " for appending");
}

SweepFolder::~SweepFolder() {
  if (journal_) std::fclose(journal_);
}

void SweepFolder::append(std::size_t index, const std::string& row) {
  rows_[index] = row;
  if (std::fwrite(row.data(), 1, row.size(), journal_) != row.size() || std::fflush(journal_) != 0)
    throw std::runtime_error("cannot write " + (dir_ / kJournal).string());
}

void SweepFolder::finish(bool plots, std::string* plot_note) {
  OutputFolder out(dir_);
  out.add("sweep.csv", sweep_csv(def_.columns, rows_));
  out.add("sweep.json", sweep_json(def_, shard_));
  if (plots) {
    if (gnuplot_available()) {
      for (auto& [name, content] : sweep_plots(def_.design.kind, def_.columns, rows_))
        out.add(name, std::move(content));
    } else if (plot_note) {
      *plot_note = "figures skipped: gnuplot (with PNG and SVG output) is not installed";
    }
  }
  out.commit();
}

std::map<std::string, std::string> sweep_plots(studies::DesignKind kind,
                                               const std::vector<std::string>& columns,
                                               const std::map<std::size_t, std::string>& rows) {
  const std::vector<std::string> all = studies::table_columns(columns);
  auto col = [&all](const std::string& name) {
    return static_cast<std::size_t>(std::find(all.begin(), all.end(), name) - all.begin());
  };
  std::vector<std::vector<std::string>> table;
  for (const auto& [i, row] : rows) {
    std::vector<std::string> cells = studies::csv_split(row.substr(0, row.size() - 1));
    if (cells.size() == all.size() && !cells[col("cycles")].empty())
      table.push_back(std::move(cells));
  }
  std::map<std::string, std::string> out;
  if (table.empty() || columns.empty()) return out;
  const bool points = kind == studies::DesignKind::latin || kind == studies::DesignKind::table;
  struct Result {
    const char* column;
    const char* label;
  };
  const std::vector<Result> forces{{"cycle_mean.lift_N", "mean lift (N)"},
                                   {"cycle_mean.thrust_N", "mean thrust (N)"},
                                   {"cycle_mean.side_force_N", "mean side force (N)"}};
  const std::vector<Result> moments{{"cycle_mean.L_roll_Nm", "roll L (N m)"},
                                    {"cycle_mean.M_pitch_Nm", "pitch M (N m)"},
                                    {"cycle_mean.N_yaw_Nm", "yaw N (N m)"}};
  const std::vector<Result> power{{"power.actuator_mean_W", "mean actuator power (W)"},
                                  {"power.air_mean_W", "mean power to the air (W)"}};
  // Results against one key (rows where that key has a value; sorted along it).
  auto against = [&](std::size_t j, const std::vector<Result>& what, const std::string& ylabel,
                     const std::string& stem, const std::string& title) {
    Plot p;
    p.title = title;
    p.xlabel = columns[j];
    p.ylabel = ylabel;
    for (const Result& r : what) {
      std::vector<std::pair<double, double>> xy;
      for (const auto& cells : table) {
        const double x = parse_cell(cells[1 + j]), y = parse_cell(cells[col(r.column)]);
        if (std::isfinite(x) && std::isfinite(y)) xy.emplace_back(x, y);
      }
      std::stable_sort(xy.begin(), xy.end(),
                       [](const auto& a, const auto& b) { return a.first < b.first; });
      Series s;
      s.title = r.label;
      s.style = points ? "points" : "linespoints";
      for (const auto& [x, y] : xy) {
        s.x.push_back(x);
        s.y.push_back(y);
      }
      if (!s.x.empty()) p.series.push_back(s);
    }
    if (!p.series.empty())
      for (auto& [name, content] : render(p, stem)) out[name] = std::move(content);
  };
  if (columns.size() == 1) {
    against(0, forces, "force (N), body axes", "sweep_forces", "Mean forces against " + columns[0]);
    against(0, moments, "moment (N m), body axes", "sweep_moments",
            "Mean moments against " + columns[0]);
    against(0, power, "power (W)", "sweep_power", "Mean power against " + columns[0]);
    return out;
  }
  if (columns.size() == 2 && kind == studies::DesignKind::grid) {
    std::vector<double> xs, ys;
    for (const auto& cells : table) {
      const double x = parse_cell(cells[1]), y = parse_cell(cells[2]);
      if (std::find(xs.begin(), xs.end(), x) == xs.end()) xs.push_back(x);
      if (std::find(ys.begin(), ys.end(), y) == ys.end()) ys.push_back(y);
    }
    std::sort(xs.begin(), xs.end());
    std::sort(ys.begin(), ys.end());
    for (const Result& r : {Result{"cycle_mean.lift_N", "mean lift (N)"},
                            Result{"power.actuator_mean_W", "mean actuator power (W)"}}) {
      Plot p;
      p.title = std::string(r.label) + " over " + columns[0] + " and " + columns[1];
      p.xlabel = columns[0];
      p.ylabel = columns[1];
      ColourMap m;
      m.x = xs;
      m.y = ys;
      m.zlabel = r.label;
      m.z.assign(xs.size(),
                 std::vector<double>(ys.size(), std::numeric_limits<double>::quiet_NaN()));
      for (const auto& cells : table) {
        const auto i = std::find(xs.begin(), xs.end(), parse_cell(cells[1])) - xs.begin();
        const auto k = std::find(ys.begin(), ys.end(), parse_cell(cells[2])) - ys.begin();
        m.z[static_cast<std::size_t>(i)][static_cast<std::size_t>(k)] =
            parse_cell(cells[col(r.column)]);
      }
      const std::string stem =
          r.column == std::string("cycle_mean.lift_N") ? "sweep_lift_map" : "sweep_power_map";
      if (xs.size() > 1 && ys.size() > 1)
        for (auto& [name, content] : render(p, m, stem)) out[name] = std::move(content);
    }
    return out;
  }
  for (std::size_t j = 0; j < columns.size(); ++j) {
    const std::vector<Result> main{{"cycle_mean.lift_N", "mean lift (N)"},
                                   {"cycle_mean.thrust_N", "mean thrust (N)"}};
    against(j, main, "force (N), body axes", "sweep_forces_" + safe_stem(columns[j]),
            "Mean lift and thrust against " + columns[j]);
    against(j, power, "power (W)", "sweep_power_" + safe_stem(columns[j]),
            "Mean power against " + columns[j]);
  }
  return out;
}

void merge_sweeps(const std::vector<fs::path>& shards, const fs::path& out_dir, bool plots,
                  std::string* plot_note) {
  using nlohmann::json;
  if (shards.empty()) throw InputError("merge", "(none)", "name the shard folders to merge");
  {
    std::error_code ec;
    for (const fs::path& dir : shards)
      if (fs::exists(out_dir, ec) && fs::equivalent(dir, out_dir, ec))
        throw InputError("-o", "'" + out_dir.string() + "'",
                         "is one of the shard folders; merge into a new folder");
    if (fs::exists(out_dir / kJournal, ec))
      throw InputError(
          "-o", "'" + out_dir.string() + "'",
          "holds a sweep's journal (a sweep or shard folder); merge into a new folder");
  }
  std::map<int, fs::path> seen;
  std::string fingerprint;
  int count = 0;
  std::size_t cases = 0;
  json first;
  std::vector<std::string> columns;
  studies::DesignKind kind = studies::DesignKind::grid;
  std::map<std::size_t, std::string> rows;
  for (const fs::path& dir : shards) {
    const fs::path meta = dir / "sweep.json", table = dir / "sweep.csv";
    std::error_code ec;
    if (!fs::is_regular_file(meta, ec) || !fs::is_regular_file(table, ec))
      throw InputError(
          "merge", "'" + dir.string() + "'",
          "holds no finished sweep (sweep.json and sweep.csv); finish that shard first");
    json j;
    int k = 0, n = 1;
    std::string fp, version;
    std::size_t shard_cases = 0;
    std::vector<std::string> shard_columns;
    try {
      j = json::parse(slurp(meta));
      k = j.contains("shard") ? j.at("shard").at("index").get<int>() : 0;
      n = j.contains("shard") ? j.at("shard").at("count").get<int>() : 1;
      fp = j.at("fingerprint").get<std::string>();
      version = j.at("version").get<std::string>();
      shard_cases = j.at("cases").get<std::size_t>();
      shard_columns = j.at("design").at("keys").get<std::vector<std::string>>();
    } catch (const json::exception&) {
      throw InputError("merge", "'" + meta.string() + "'", "is not a sweep.json flapline wrote");
    }
    if (version != kVersion)
      throw InputError("merge", "'" + meta.string() + "'",
                       "was written by flapline " + version + "; this is " + kVersion +
                           ": rerun that shard with this version");
    if (fingerprint.empty()) {
      fingerprint = fp;
      count = n;
      cases = shard_cases;
      first = j;
      columns = shard_columns;
      kind = from_string<studies::DesignKind>(j["design"].value("kind", "grid")).value_or(kind);
    } else if (fp != fingerprint || n != count) {
      throw InputError("merge", "'" + dir.string() + "'",
                       "belongs to another sweep (fingerprint " + fp + ", " + std::to_string(n) +
                           " shards) than " + shards.front().string() + " (fingerprint " +
                           fingerprint + ", " + std::to_string(count) + " shards)");
    }
    if (!seen.emplace(k, dir).second)
      throw InputError("merge", "'" + dir.string() + "'",
                       "shard " + std::to_string(k) + "/" + std::to_string(n) +
                           " is given twice (also " + seen[k].string() + ")");
    // The shard's rows: every case it owns, once.
    std::istringstream in(slurp(table));
    std::string line;
    std::getline(in, line);
    if (line + "\n" != studies::table_header(columns))
      throw InputError("merge", "'" + table.string() + "'",
                       "has another header than the sweep's table");
    const std::size_t ncol = studies::table_columns(columns).size();
    std::size_t got = 0;
    while (std::getline(in, line)) {
      line += "\n";
      const long i = studies::row_index(line, ncol);
      if (i < 0 || static_cast<std::size_t>(i) >= cases || static_cast<int>(i % n) != k)
        throw InputError("merge", "'" + table.string() + "'",
                         "holds a row that is not of this shard");
      rows[static_cast<std::size_t>(i)] = line;
      ++got;
    }
    const std::size_t expected =
        cases / static_cast<std::size_t>(n) +
        (static_cast<std::size_t>(k) < cases % static_cast<std::size_t>(n) ? 1 : 0);
    if (got != expected)
      throw InputError("merge", "'" + table.string() + "'",
                       "holds " + std::to_string(got) + " of the shard's " +
                           std::to_string(expected) + " cases; finish that shard first");
  }
  for (int k = 0; k < count; ++k)
    if (!seen.count(k))
      throw InputError("merge",
                       std::to_string(seen.size()) + " of " + std::to_string(count) + " shards",
                       "shard " + std::to_string(k) + "/" + std::to_string(count) +
                           " is missing; give every shard folder of the sweep");
  first.erase("shard");
  OutputFolder out(out_dir);
  out.add("sweep.csv", sweep_csv(columns, rows));
  out.add("sweep.json", first.dump(2) + "\n");
  if (plots) {
    if (gnuplot_available()) {
      for (auto& [name, content] : sweep_plots(kind, columns, rows))
        out.add(name, std::move(content));
    } else if (plot_note) {
      *plot_note = "figures skipped: gnuplot (with PNG and SVG output) is not installed";
    }
  }
  out.commit();
}

}  // namespace flapline::io
