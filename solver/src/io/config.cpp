#include "flapline/io/config.hpp"

#include <yaml-cpp/yaml.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <fstream>
#include <functional>
#include <map>
#include <set>
#include <sstream>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"

namespace flapline::io {
namespace {

namespace fs = std::filesystem;
using Keys = std::vector<std::string>;

constexpr std::uintmax_t kMaxInputFileBytes = 16u << 20;  // a configuration file
constexpr std::uintmax_t kMaxTableFileBytes = 4u << 20;   // a planform table

std::string join(const std::string& a, const std::string& b) {
  return a.empty() ? b : a + "." + b;
}

std::string describe(const YAML::Node& n) {
  if (!n.IsDefined() || n.IsNull()) return "(empty)";
  if (n.IsScalar()) return "'" + n.Scalar() + "'";
  if (n.IsSequence()) return "(a list)";
  return "(a map)";
}

/// The parsed document, with what is needed to place an error.
struct Source {
  std::string file;
  std::string base_dir;
  YAML::Node root;
  std::map<std::string, std::string> overrides;  // key path -> "--set path=value" as typed

  /// Node at a dotted path, or an undefined node.
  YAML::Node find(const std::string& path) const {
    YAML::Node cur;
    cur.reset(root);
    std::stringstream ss(path);
    std::string part;
    while (std::getline(ss, part, '.')) {
      if (cur.IsSequence()) {  // a list element: flight.velocity.0
        char* end = nullptr;
        const long k = std::strtol(part.c_str(), &end, 10);
        if (part.empty() || *end != '\0' || k < 0 || static_cast<std::size_t>(k) >= cur.size())
          return YAML::Node(YAML::NodeType::Undefined);
        const YAML::Node next = static_cast<const YAML::Node&>(cur)[static_cast<std::size_t>(k)];
        cur.reset(next);
        continue;
      }
      if (!cur.IsMap()) return YAML::Node(YAML::NodeType::Undefined);
      const YAML::Node next = static_cast<const YAML::Node&>(cur)[part];
      if (!next.IsDefined()) return YAML::Node(YAML::NodeType::Undefined);
      cur.reset(next);
    }
    return cur;
  }

  /// The override that sets `path` or one of its parents, if any.
  const std::string* override_for(const std::string& path) const {
    for (const auto& [key, text] : overrides)
      if (path == key || path.rfind(key + ".", 0) == 0 || key.rfind(path + ".", 0) == 0)
        return &text;
    return nullptr;
  }

  /// Put file and line on an error raised for `path`; `at` is the node when the caller has it.
  void locate(InputError& e, const YAML::Node* at = nullptr) const {
    if (const std::string* o = override_for(e.key())) {
      e.locate("command line (" + *o + ")", 0);
      return;
    }
    if (at && at->IsDefined() && at->Mark().line >= 0) {
      e.locate(file, at->Mark().line + 1);
      return;
    }
    std::string p = e.key();
    while (!p.empty()) {
      const YAML::Node n = find(p);
      if (n.IsDefined() && n.Mark().line >= 0) {
        // "row K" in the value of a table's error: point at that row's own line.
        if (p == e.key() && n.IsSequence() && e.value().rfind("row ", 0) == 0) {
          const std::size_t k = std::strtoul(e.value().c_str() + 4, nullptr, 10);
          if (k >= 1 && k <= n.size() && n[k - 1].Mark().line >= 0) {
            e.locate(file, n[k - 1].Mark().line + 1);
            return;
          }
        }
        e.locate(file, n.Mark().line + 1);
        return;
      }
      const auto dot = p.rfind('.');
      p = dot == std::string::npos ? std::string() : p.substr(0, dot);
    }
    e.locate(file, 0);
  }
};

/// Rewrite a core key path to the one the user actually wrote (shared gait block, table file).
std::string written_key(const Source& src, const std::string& key) {
  if (src.find(key).IsDefined() || src.override_for(key)) return key;
  for (const char* side : {"gait.right.", "gait.left."}) {
    if (key.rfind(side, 0) != 0) continue;
    const std::size_t n = std::string(side).size();
    const std::string shared = "gait." + key.substr(n);
    if (src.find(shared).IsDefined()) return shared;  // the value came from the shared block
    const std::string angle_path = key.substr(0, key.find('.', n));
    return src.find(angle_path).IsDefined() ? key : shared;
  }
  if (key.rfind("wing.table", 0) == 0 && src.find("wing.table_file").IsDefined())
    return "wing.table_file";
  return key;
}

class Reader {
 public:
  explicit Reader(const Source& src) : src_(src) {}

  ModelSpec read() {
    const YAML::Node& root = src_.root;
    if (!root.IsDefined() || root.IsNull())
      fail("(document)", nullptr, "(empty)", "the file holds no settings; see configs/README.md");
    if (!root.IsMap())
      fail("(document)", &root, describe(root), "the top level must be a map of sections");
    check_keys(root, "",
               {"title", "description", "wing", "gait", "flight", "air", "model", "simulation",
                "vehicle"});
    ModelSpec spec;
    if (has(root, "title")) spec.title = text(root["title"], "title");
    read_wing(required(root, "", "wing"), spec);
    read_gait(required(root, "", "gait"), spec.gait);
    if (has(root, "vehicle")) read_vehicle(map_at(root, "", "vehicle"), spec);
    if (has(root, "flight")) read_flight(map_at(root, "", "flight"), spec);
    if (has(root, "air")) read_air(map_at(root, "", "air"), spec.air);
    if (has(root, "model")) read_model(map_at(root, "", "model"), spec.aero);
    if (has(root, "simulation")) read_simulation(map_at(root, "", "simulation"), spec.simulation);
    return spec;
  }

 private:
  const Source& src_;

  [[noreturn]] void fail(const std::string& path, const YAML::Node* at, const std::string& value,
                         const std::string& allowed, const std::string& hint = {}) const {
    InputError e(path, value, allowed, hint);
    src_.locate(e, at);
    throw e;
  }

  /// The same for a rule between keys (see InputError::between_keys).
  [[noreturn]] void fail_between(const std::string& path, const YAML::Node* at,
                                 const std::string& value, const std::string& allowed) const {
    InputError e(path, value, allowed);
    e.between_keys();
    src_.locate(e, at);
    throw e;
  }

  static bool has(const YAML::Node& map, const char* key) {
    return map.IsMap() && map[key].IsDefined();
  }

  YAML::Node required(const YAML::Node& map, const std::string& path, const char* key) const {
    if (!has(map, key))
      fail(join(path, key), &map, "(missing)", "this key is required; see configs/README.md");
    return map_at(map, path, key);
  }

  YAML::Node map_at(const YAML::Node& map, const std::string& path, const char* key) const {
    const YAML::Node n = map[key];
    if (!n.IsMap()) fail(join(path, key), &n, describe(n), "must be a map of keys");
    return n;
  }

  void check_keys(const YAML::Node& map, const std::string& path, const Keys& allowed) const {
    for (auto it = map.begin(); it != map.end(); ++it) {
      const std::string key = it->first.Scalar();
      if (std::find(allowed.begin(), allowed.end(), key) != allowed.end()) continue;
      std::string all;
      for (const auto& a : allowed) all += (all.empty() ? "" : ", ") + a;
      const std::string near = closest_match(key, allowed);
      fail(join(path, key), &it->first, "", "unknown key; allowed here: " + all,
           near.empty() ? std::string() : "did you mean '" + near + "'?");
    }
  }

  double number(const YAML::Node& n, const std::string& path) const {
    if (!n.IsScalar()) fail(path, &n, describe(n), "must be a number");
    try {
      const double v = n.as<double>();
      if (!std::isfinite(v)) fail(path, &n, describe(n), "must be a finite number");
      return v;
    } catch (const YAML::BadConversion&) {
      fail(path, &n, describe(n), "must be a number");
    }
  }

  int integer(const YAML::Node& n, const std::string& path) const {
    const double v = number(n, path);
    if (v != std::floor(v)) fail(path, &n, describe(n), "must be a whole number");
    if (std::abs(v) > 1e9)
      fail(path, &n, describe(n), "must be a whole number between -1000000000 and 1000000000");
    return static_cast<int>(v);
  }

  std::string text(const YAML::Node& n, const std::string& path) const {
    if (!n.IsScalar()) fail(path, &n, describe(n), "must be a text value");
    return n.Scalar();
  }

  template <class E>
  E choice(const YAML::Node& n, const std::string& path) const {
    const std::string s = n.IsScalar() ? n.Scalar() : std::string();
    if (const auto v = from_string<E>(s)) return *v;
    std::vector<std::string> names;
    for (const auto& item : EnumNames<E>::items) names.emplace_back(item.second);
    const std::string near = closest_match(s, names);
    fail(path, &n, describe(n), "must be one of: " + allowed_names<E>(),
         near.empty() ? std::string() : "did you mean '" + near + "'?");
  }

  Eigen::Vector3d vec3(const YAML::Node& n, const std::string& path, double scale = 1.0) const {
    if (!n.IsSequence() || n.size() != 3)
      fail(path, &n, describe(n),
           "must be a list of three numbers [x, y, z]" +
               (n.IsSequence() ? " (" + std::to_string(n.size()) + " given)" : std::string()));
    return Eigen::Vector3d(number(n[0], path), number(n[1], path), number(n[2], path)) * scale;
  }

  // --- wing -----------------------------------------------------------------------------------
  void read_wing(const YAML::Node& w, ModelSpec& spec) const {
    const std::string P = "wing";
    check_keys(w, P,
               {"planform", "span", "chord", "root_chord", "tip_chord", "mean_chord",
                "first_moment_radius", "second_moment_radius", "table", "table_file", "pitch_axis",
                "hinge", "twist_root", "twist_tip", "strips", "strip_spacing", "mass"});
    if (has(w, "mass")) read_mass(map_at(w, P, "mass"), spec.wing_mass);
    PlanformSpec& p = spec.wing;
    if (!has(w, "planform"))
      fail(P + ".planform", &w, "(missing)",
           "this key is required: one of " + allowed_names<PlanformShape>());
    p.shape = choice<PlanformShape>(w["planform"], P + ".planform");
    static const std::map<PlanformShape, Keys> needs{
        {PlanformShape::rectangular, {"chord"}},
        {PlanformShape::elliptic, {"root_chord"}},
        {PlanformShape::tapered, {"root_chord", "tip_chord"}},
        {PlanformShape::beta, {"mean_chord", "first_moment_radius", "second_moment_radius"}},
        {PlanformShape::table, {}}};
    const Keys shape_keys{"chord",      "root_chord",          "tip_chord",
                          "mean_chord", "first_moment_radius", "second_moment_radius",
                          "table",      "table_file"};
    const Keys& need = needs.at(p.shape);
    const std::string shape_name(to_string(p.shape));
    for (const auto& k : shape_keys) {
      const bool wanted = std::find(need.begin(), need.end(), k) != need.end() ||
                          (p.shape == PlanformShape::table && (k == "table" || k == "table_file"));
      if (has(w, k.c_str()) && !wanted) {
        const YAML::Node v = w[k];
        fail_between(P + "." + k, &v, describe(v), "does not apply to planform " + shape_name);
      }
    }
    for (const auto& k : need)
      if (!has(w, k.c_str()))
        fail_between(P + "." + k, &w, "(missing)", "required for planform " + shape_name);
    if (!has(w, "span")) fail(P + ".span", &w, "(missing)", "this key is required (m, > 0)");
    p.span = number(w["span"], P + ".span");
    if (has(w, "chord")) p.chord = number(w["chord"], P + ".chord");
    if (has(w, "root_chord")) p.root_chord = number(w["root_chord"], P + ".root_chord");
    if (has(w, "tip_chord")) p.tip_chord = number(w["tip_chord"], P + ".tip_chord");
    if (has(w, "mean_chord")) p.mean_chord = number(w["mean_chord"], P + ".mean_chord");
    if (has(w, "first_moment_radius"))
      p.first_moment_radius = number(w["first_moment_radius"], P + ".first_moment_radius");
    if (has(w, "second_moment_radius"))
      p.second_moment_radius = number(w["second_moment_radius"], P + ".second_moment_radius");
    if (p.shape == PlanformShape::table) {
      if (has(w, "table") == has(w, "table_file"))
        fail_between(P + ".table_file", &w, "",
                     "planform table needs exactly one of wing.table "
                     "(inline rows) or wing.table_file (CSV)");
      if (has(w, "table"))
        read_inline_table(w["table"], P + ".table", p);
      else
        read_table_file(w["table_file"], P + ".table_file", p);
      const YAML::Node pa = w["pitch_axis"];
      if (pa.IsDefined())
        fail_between(P + ".pitch_axis", &pa, describe(pa),
                     "does not apply to planform table (its leading_edge column places the pitch "
                     "axis)");
    } else if (has(w, "pitch_axis")) {
      p.pitch_axis = number(w["pitch_axis"], P + ".pitch_axis");
    }
    if (has(w, "hinge")) p.hinge = vec3(w["hinge"], P + ".hinge");
    if (has(w, "twist_root")) p.twist_root = number(w["twist_root"], P + ".twist_root") * kDegree;
    if (has(w, "twist_tip")) p.twist_tip = number(w["twist_tip"], P + ".twist_tip") * kDegree;
    if (has(w, "strips")) spec.strips.count = integer(w["strips"], P + ".strips");
    if (has(w, "strip_spacing"))
      spec.strips.spacing = choice<StripSpacing>(w["strip_spacing"], P + ".strip_spacing");
  }

  void read_mass(const YAML::Node& m, WingMassSpec& out) const {
    const std::string P = "wing.mass";
    check_keys(m, P, {"total", "per_span", "points"});
    if (has(m, "total")) out.total = number(m["total"], P + ".total");
    auto rows = [&](const char* key, const char* layout) {
      const YAML::Node t = m[key];
      const std::string path = P + "." + key;
      if (!t.IsSequence() || t.size() == 0)
        fail(path, &t, describe(t), std::string("must be a list of ") + layout + " rows");
      for (const auto& row : t)
        if (!row.IsSequence() || row.size() != 3)
          fail(path, &row, describe(row),
               std::string("each row must be ") + layout +
                   (row.IsSequence()
                        ? " (3 numbers; this row has " + std::to_string(row.size()) + ")"
                        : ""));
      return t;
    };
    if (has(m, "per_span")) {
      const std::string path = P + ".per_span";
      for (const auto& row : rows("per_span", "[span_fraction, kg_per_m, centre_chord_fraction]")) {
        out.table_span_fraction.push_back(number(row[0], path));
        out.table_mass_per_span.push_back(number(row[1], path));
        out.table_centre_fraction.push_back(number(row[2], path));
      }
    }
    if (has(m, "points")) {
      const std::string path = P + ".points";
      for (const auto& row : rows("points", "[span_fraction, chord_fraction, kg]"))
        out.points.push_back({number(row[0], path), number(row[1], path), number(row[2], path)});
    }
  }

  void read_inline_table(const YAML::Node& t, const std::string& path, PlanformSpec& p) const {
    if (!t.IsSequence())
      fail(path, &t, describe(t), "must be a list of [span_fraction, chord, leading_edge] rows");
    for (const auto& row : t) {
      if (!row.IsSequence() || row.size() != 3)
        fail(path, &row, describe(row),
             "each row must be [span_fraction, chord (m), leading_edge (m)]");
      p.table_span_fraction.push_back(number(row[0], path));
      p.table_chord.push_back(number(row[1], path));
      p.table_leading_edge.push_back(number(row[2], path));
    }
  }

  void read_table_file(const YAML::Node& n, const std::string& path, PlanformSpec& p) const {
    const std::string name = text(n, path);
    const fs::path file = fs::path(src_.base_dir) / name;
    // Type and size first: a device or a huge file must not be read at all.
    std::error_code ec;
    const auto status = fs::status(file, ec);
    if (fs::exists(status) && !fs::is_regular_file(status))
      fail(path, &n, "'" + name + "'",
           std::string("must name a regular CSV file (this is ") +
               (fs::is_directory(status) ? "a directory" : "a device or a pipe") + ")");
    if (fs::exists(status) && fs::file_size(file, ec) > kMaxTableFileBytes)
      fail(path, &n, "'" + name + "'",
           "the CSV file is larger than 4 MiB (a planform table "
           "needs a few hundred rows at most)");
    std::ifstream in(file);
    if (!in)
      fail(path, &n, "'" + name + "'",
           "the CSV file could not be opened (relative to the config's folder)");
    auto csv_fail = [&](int line, const std::string& value, const std::string& allowed) {
      InputError e(path, value, allowed);
      e.locate(file.string(), line);
      throw e;
    };
    std::string line;
    int lineno = 0;
    bool header = false;
    while (std::getline(in, line)) {
      ++lineno;
      if (!line.empty() && line.back() == '\r') line.pop_back();
      const auto first = line.find_first_not_of(" \t");
      if (first == std::string::npos || line[first] == '#') continue;
      std::vector<std::string> cells;
      std::stringstream ss(line);
      std::string cell;
      while (std::getline(ss, cell, ',')) {
        const auto a = cell.find_first_not_of(" \t"), b = cell.find_last_not_of(" \t");
        cells.push_back(a == std::string::npos ? std::string() : cell.substr(a, b - a + 1));
      }
      if (!header) {
        if (cells != std::vector<std::string>{"span_fraction", "chord", "leading_edge"})
          csv_fail(lineno, "'" + line + "'",
                   "the header must be: span_fraction,chord,leading_edge");
        header = true;
        continue;
      }
      if (cells.size() != 3) csv_fail(lineno, "'" + line + "'", "each row needs three numbers");
      double v[3];
      for (int i = 0; i < 3; ++i) {
        char* end = nullptr;
        v[i] = std::strtod(cells[static_cast<std::size_t>(i)].c_str(), &end);
        if (cells[static_cast<std::size_t>(i)].empty() || *end != '\0' || !std::isfinite(v[i]))
          csv_fail(lineno, "'" + cells[static_cast<std::size_t>(i)] + "'", "must be a number");
      }
      p.table_span_fraction.push_back(v[0]);
      p.table_chord.push_back(v[1]);
      p.table_leading_edge.push_back(v[2]);
    }
    if (!header)
      csv_fail(lineno, "(no header)", "the header must be: span_fraction,chord,leading_edge");
  }

  // --- gait -----------------------------------------------------------------------------------
  void read_gait(const YAML::Node& g, GaitSpec& gait) const {
    const std::string P = "gait";
    const Keys angles{"stroke", "deviation", "pitch", "span_ratio"};
    check_keys(g, P,
               {"frequency", "stroke_plane_angle", "stroke", "deviation", "pitch", "span_ratio",
                "plunge", "left", "right"});
    if (!has(g, "frequency"))
      fail(P + ".frequency", &g, "(missing)", "this key is required (Hz, > 0)");
    gait.frequency = number(g["frequency"], P + ".frequency");
    if (has(g, "stroke_plane_angle"))
      gait.stroke_plane_angle =
          number(g["stroke_plane_angle"], P + ".stroke_plane_angle") * kDegree;
    for (const char* side : {"left", "right"})
      if (has(g, side)) check_keys(map_at(g, P, side), P + "." + side, angles);
    for (int s = 0; s < 2; ++s) {
      const std::string side = s == 0 ? "right" : "left";
      WingGaitSpec& w = s == 0 ? gait.right : gait.left;
      const YAML::Node over =
          has(g, side.c_str()) ? g[side] : YAML::Node(YAML::NodeType::Undefined);
      w.stroke = waveform(g, over, side, "stroke", kDegree, 0.0);
      w.deviation = waveform(g, over, side, "deviation", kDegree, 0.0);
      w.pitch = waveform(g, over, side, "pitch", kDegree, 0.0);
      w.span_ratio = waveform(g, over, side, "span_ratio", 1.0, 1.0);
    }
    if (has(g, "plunge"))
      gait.plunge = waveform(g, YAML::Node(YAML::NodeType::Undefined), "", "plunge", 1.0, 0.0);
  }

  /// The waveform of one angle: the side's entry replaces the shared one when it is a number or
  /// names a shape, and otherwise overrides it key by key.
  WaveformSpec waveform(const YAML::Node& gait, const YAML::Node& side_map, const std::string& side,
                        const std::string& angle, double scale, double default_mean) const {
    const std::string shared_path = "gait." + angle;
    const YAML::Node base =
        has(gait, angle.c_str()) ? gait[angle] : YAML::Node(YAML::NodeType::Undefined);
    YAML::Node over(YAML::NodeType::Undefined);
    std::string over_path;
    if (side_map.IsMap() && side_map[angle].IsDefined()) {
      over.reset(side_map[angle]);
      over_path = "gait." + side + "." + angle;
    }
    WaveformSpec w;
    w.mean = default_mean;
    const bool replace = over.IsDefined() && (!over.IsMap() || over["shape"].IsDefined());
    const YAML::Node* primary = replace ? &over : (base.IsDefined() ? &base : nullptr);
    const std::string primary_path = replace ? over_path : shared_path;
    if (!primary && !over.IsDefined()) return w;
    const Keys keys{"shape",     "mean",      "amplitude", "phase",
                    "sharpness", "harmonics", "points",    "delay"};
    // Scalar shorthand: a constant.
    auto scalar_case = [&](const YAML::Node& n, const std::string& path) {
      if (n.IsSequence())
        fail(path, &n, describe(n),
             "must be a number (a constant) or a map such as {shape: harmonic, amplitude: 30}",
             "a list of values over the cycle is written {shape: table, points: [[0, v0], ...]}");
      w.mean = number(n, path) * scale;
      return w;
    };
    if (replace && !over.IsMap()) return scalar_case(over, over_path);
    if (!replace && base.IsDefined() && !base.IsMap()) {
      if (over.IsDefined())
        fail_between(over_path, &over, describe(over),
                     "overrides a constant shared value: give a number or a map with a shape");
      return scalar_case(base, shared_path);
    }
    if (primary) check_keys(*primary, primary_path, keys);
    if (over.IsDefined() && !replace) check_keys(over, over_path, keys);
    // key lookup: the side's value first (when merging), then the primary map.
    auto pick = [&](const char* key, std::string& path) -> YAML::Node {
      if (!replace && over.IsDefined() && over[key].IsDefined()) {
        path = over_path + "." + key;
        return over[key];
      }
      if (primary && (*primary)[key].IsDefined()) {
        path = primary_path + "." + key;
        return (*primary)[key];
      }
      path = primary_path + "." + key;
      return YAML::Node(YAML::NodeType::Undefined);
    };
    std::string path;
    if (const YAML::Node n = pick("shape", path); n.IsDefined())
      w.shape = choice<WaveShape>(n, path);
    const std::string shape_name(to_string(w.shape));
    static const std::map<WaveShape, Keys> applies{
        {WaveShape::harmonic, {"shape", "mean", "amplitude", "phase"}},
        {WaveShape::fourier, {"shape", "mean", "phase", "harmonics"}},
        {WaveShape::smoothed_triangle, {"shape", "mean", "amplitude", "phase", "sharpness"}},
        {WaveShape::smoothed_square, {"shape", "mean", "amplitude", "phase", "sharpness"}},
        {WaveShape::table, {"shape", "phase", "points"}},
        {WaveShape::step, {"shape", "mean", "amplitude", "delay"}}};
    const Keys& ok = applies.at(w.shape);
    for (const auto& k : keys) {
      const YAML::Node v = pick(k.c_str(), path);
      if (v.IsDefined() && std::find(ok.begin(), ok.end(), k) == ok.end())
        fail_between(path, &v, describe(v), "does not apply to shape " + shape_name);
    }
    if (const YAML::Node n = pick("mean", path); n.IsDefined()) w.mean = number(n, path) * scale;
    if (const YAML::Node n = pick("amplitude", path); n.IsDefined())
      w.amplitude = number(n, path) * scale;
    if (const YAML::Node n = pick("phase", path); n.IsDefined())
      w.phase = number(n, path) * kDegree;
    if (const YAML::Node n = pick("delay", path); n.IsDefined()) w.delay = number(n, path);
    if (w.shape == WaveShape::smoothed_triangle || w.shape == WaveShape::smoothed_square) {
      const YAML::Node n = pick("sharpness", path);
      if (!n.IsDefined())
        fail_between(path, primary, "(missing)", "required for shape " + shape_name);
      w.sharpness = number(n, path);
    }
    if (w.shape == WaveShape::fourier) {
      const YAML::Node n = pick("harmonics", path);
      if (!n.IsDefined() || !n.IsSequence())
        fail(path, n.IsDefined() ? &n : primary, describe(n),
             "shape fourier needs a list of {amplitude, phase} maps, one per harmonic");
      for (const auto& h : n) {
        if (!h.IsMap()) fail(path, &h, describe(h), "each harmonic must be {amplitude, phase}");
        check_keys(h, path, {"amplitude", "phase"});
        w.harmonic_amplitudes.push_back(has(h, "amplitude") ? number(h["amplitude"], path) * scale
                                                            : 0.0);
        w.harmonic_phases.push_back(has(h, "phase") ? number(h["phase"], path) * kDegree : 0.0);
      }
    }
    if (w.shape == WaveShape::table) {
      const YAML::Node n = pick("points", path);
      if (!n.IsDefined() || !n.IsSequence())
        fail(path, n.IsDefined() ? &n : primary, describe(n),
             "shape table needs a list of [cycle_fraction, value] rows");
      for (const auto& row : n) {
        if (!row.IsSequence() || row.size() != 2)
          fail(path, &row, describe(row), "each row must be [cycle_fraction, value]");
        w.table_fraction.push_back(number(row[0], path));
        w.table_value.push_back(number(row[1], path) * scale);
      }
    }
    return w;
  }

  // --- other sections --------------------------------------------------------------------------
  void read_flight(const YAML::Node& f, ModelSpec& spec) const {
    FlightSpec& flight = spec.flight;
    check_keys(
        f, "flight",
        {"velocity", "rates", "wind", "airspeed", "flight_path_angle", "sideslip", "turn_rate"});
    if (has(f, "velocity")) flight.velocity = vec3(f["velocity"], "flight.velocity");
    if (has(f, "rates")) flight.rates = vec3(f["rates"], "flight.rates", kDegree);
    if (has(f, "wind")) flight.wind = vec3(f["wind"], "flight.wind");
    const bool condition = has(f, "airspeed") || has(f, "flight_path_angle") ||
                           has(f, "sideslip") || has(f, "turn_rate");
    if (!condition) return;
    if (!has(f, "airspeed")) {
      const char* given = has(f, "flight_path_angle") ? "flight_path_angle"
                          : has(f, "sideslip")        ? "sideslip"
                                                      : "turn_rate";
      const YAML::Node n = f[given];
      fail_between(std::string("flight.") + given, &n, describe(n),
                   "belongs to a flight condition: give flight.airspeed too (m/s)");
    }
    for (const char* derived : {"velocity", "rates"}) {
      if (!has(f, derived)) continue;
      const YAML::Node n = f[derived];
      fail_between(std::string("flight.") + derived, &n, describe(n),
                   "is derived from the flight condition (airspeed, flight_path_angle, sideslip, "
                   "turn_rate) and the vehicle's attitude; give one or the other");
    }
    FlightCondition c;
    c.airspeed = number(f["airspeed"], "flight.airspeed");
    if (has(f, "flight_path_angle"))
      c.flight_path_angle = number(f["flight_path_angle"], "flight.flight_path_angle") * kDegree;
    if (has(f, "sideslip")) c.sideslip = number(f["sideslip"], "flight.sideslip") * kDegree;
    if (has(f, "turn_rate")) c.turn_rate = number(f["turn_rate"], "flight.turn_rate") * kDegree;
    spec.condition = c;
  }

  void read_vehicle(const YAML::Node& v, ModelSpec& spec) const {
    const std::string P = "vehicle";
    check_keys(v, P, {"mass", "inertia", "drag_area", "attitude"});
    VehicleSpec out;
    if (!has(v, "mass")) fail(P + ".mass", &v, "(missing)", "this key is required (kg, > 0)");
    out.mass = number(v["mass"], P + ".mass");
    if (!has(v, "inertia"))
      fail(P + ".inertia", &v, "(missing)",
           "this key is required: {xx, yy, zz, xz} about the centre of mass (kg m^2)");
    const YAML::Node in = map_at(v, P, "inertia");
    check_keys(in, P + ".inertia", {"xx", "yy", "zz", "xz"});
    for (const auto& [key, target] :
         {std::pair<const char*, double*>{"xx", &out.ixx}, {"yy", &out.iyy}, {"zz", &out.izz}})
      if (!has(in, key))
        fail(P + ".inertia." + key, &in, "(missing)", "required (kg m^2, > 0)");
      else
        *target = number(in[key], P + ".inertia." + key);
    if (has(in, "xz")) out.ixz = number(in["xz"], P + ".inertia.xz");
    if (has(v, "drag_area")) out.drag_area = number(v["drag_area"], P + ".drag_area");
    if (has(v, "attitude")) {
      const YAML::Node a = map_at(v, P, "attitude");
      check_keys(a, P + ".attitude", {"roll", "pitch"});
      if (has(a, "roll")) out.roll = number(a["roll"], P + ".attitude.roll") * kDegree;
      if (has(a, "pitch")) out.pitch = number(a["pitch"], P + ".attitude.pitch") * kDegree;
    }
    spec.vehicle = out;
  }

  void read_air(const YAML::Node& a, AirSpec& air) const {
    check_keys(a, "air", {"altitude", "density", "kinematic_viscosity"});
    if (has(a, "altitude")) air.altitude = number(a["altitude"], "air.altitude");
    if (has(a, "density")) air.density = number(a["density"], "air.density");
    if (has(a, "kinematic_viscosity"))
      air.kinematic_viscosity = number(a["kinematic_viscosity"], "air.kinematic_viscosity");
  }

  void read_model(const YAML::Node& m, AeroOptions& o) const {
    check_keys(m, "model",
               {"kind", "coefficient_law", "suction_recovery", "vortex_lift", "fit", "wagner_fit",
                "reverse_flow", "span_coupling", "line_solve", "profile_drag", "inflow",
                "inflow_relaxation"});
    if (has(m, "inflow")) o.inflow = choice<InflowModel>(m["inflow"], "model.inflow");
    if (has(m, "inflow_relaxation"))
      o.inflow_relaxation = number(m["inflow_relaxation"], "model.inflow_relaxation");
    if (has(m, "profile_drag")) {
      const YAML::Node d = map_at(m, "model", "profile_drag");
      check_keys(d, "model.profile_drag", {"law", "coefficient"});
      if (has(d, "law"))
        o.profile_drag.law = choice<ProfileDragLaw>(d["law"], "model.profile_drag.law");
      if (has(d, "coefficient"))
        o.profile_drag.coefficient = number(d["coefficient"], "model.profile_drag.coefficient");
    }
    if (has(m, "line_solve")) o.line_solve = choice<LineSolve>(m["line_solve"], "model.line_solve");
    if (has(m, "span_coupling"))
      o.span_coupling = choice<SpanCoupling>(m["span_coupling"], "model.span_coupling");
    if (has(m, "wagner_fit")) o.wagner_fit = choice<WagnerFit>(m["wagner_fit"], "model.wagner_fit");
    if (has(m, "reverse_flow"))
      o.reverse_flow = choice<ReverseFlow>(m["reverse_flow"], "model.reverse_flow");
    if (has(m, "kind")) o.kind = choice<ModelKind>(m["kind"], "model.kind");
    if (has(m, "coefficient_law"))
      o.law = choice<CoefficientLaw>(m["coefficient_law"], "model.coefficient_law");
    if (has(m, "suction_recovery"))
      o.suction_recovery = number(m["suction_recovery"], "model.suction_recovery");
    if (has(m, "vortex_lift")) o.vortex_lift = number(m["vortex_lift"], "model.vortex_lift");
    if (has(m, "fit")) {
      const YAML::Node f = map_at(m, "model", "fit");
      RevolvingFit& c = o.fit;
      const std::vector<std::pair<const char*, double*>> fields{
          {"lift_offset", &c.lift_offset}, {"lift_amplitude", &c.lift_amplitude},
          {"lift_rate", &c.lift_rate},     {"lift_shift", &c.lift_shift},
          {"drag_offset", &c.drag_offset}, {"drag_amplitude", &c.drag_amplitude},
          {"drag_rate", &c.drag_rate},     {"drag_shift", &c.drag_shift}};
      Keys names;
      for (const auto& fd : fields) names.emplace_back(fd.first);
      check_keys(f, "model.fit", names);
      for (const auto& [key, target] : fields)
        if (has(f, key)) *target = number(f[key], std::string("model.fit.") + key);
    }
  }

  void read_simulation(const YAML::Node& s, SimulationOptions& o) const {
    const std::string P = "simulation";
    check_keys(s, P,
               {"steps_per_cycle", "samples_per_cycle", "min_cycles", "max_cycles", "tolerance",
                "start", "spanwise_phases", "history", "integrator", "cache_mib"});
    if (has(s, "integrator")) o.integrator = choice<Integrator>(s["integrator"], P + ".integrator");
    if (has(s, "cache_mib")) o.cache_mib = integer(s["cache_mib"], P + ".cache_mib");
    if (has(s, "steps_per_cycle"))
      o.steps_per_cycle = integer(s["steps_per_cycle"], P + ".steps_per_cycle");
    if (has(s, "samples_per_cycle"))
      o.samples_per_cycle = integer(s["samples_per_cycle"], P + ".samples_per_cycle");
    if (has(s, "min_cycles")) o.min_cycles = integer(s["min_cycles"], P + ".min_cycles");
    if (has(s, "max_cycles")) o.max_cycles = integer(s["max_cycles"], P + ".max_cycles");
    if (has(s, "tolerance")) o.tolerance = number(s["tolerance"], P + ".tolerance");
    if (has(s, "start")) o.start = choice<StartMode>(s["start"], P + ".start");
    if (has(s, "history")) o.history = choice<HistoryKeep>(s["history"], P + ".history");
    if (has(s, "spanwise_phases")) {
      const YAML::Node n = s["spanwise_phases"];
      if (!n.IsSequence())
        fail(P + ".spanwise_phases", &n, describe(n),
             "must be a list of cycle fractions in [0, 1)");
      o.spanwise_phases.clear();
      for (const auto& v : n) o.spanwise_phases.push_back(number(v, P + ".spanwise_phases"));
    }
  }
};

std::string read_file(const std::string& path) {
  auto refuse = [&](const std::string& why, const std::string& hint) {
    InputError e("(file)", "'" + path + "'", why, hint);
    e.locate(path, 0);
    throw e;
  };
  std::error_code ec;
  const auto status = std::filesystem::status(path, ec);
  if (std::filesystem::exists(status) && !std::filesystem::is_regular_file(status))
    refuse("the configuration is not a regular file",
           std::filesystem::is_directory(status) ? "it is a directory" : "a device or a pipe");
  if (std::filesystem::exists(status) && std::filesystem::file_size(path, ec) > kMaxInputFileBytes)
    refuse("the configuration file is larger than 16 MiB", "is this the right file?");
  std::ifstream in(path, std::ios::binary);
  if (!in)
    refuse("the configuration file could not be opened",
           std::filesystem::exists(path) ? "check its permissions" : "no such file");
  std::stringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

/// Set (or remove) the node at a dotted key path of `root`, creating maps on the way. A part
/// that is a whole number indexes a list (`flight.velocity.0`). `where` names the origin of the
/// override in messages (e.g. "command line (--set k=v)").
void apply_override(YAML::Node& root, const std::string& path, const std::string& text, bool remove,
                    const std::string& where) {
  auto fail = [&](const std::string& allowed) {
    InputError e(path, "'" + text + "'", allowed);
    e.locate(where, 0);
    throw e;
  };
  YAML::Node value;
  if (!remove) {
    try {
      value = YAML::Load(text);
    } catch (const YAML::ParserException& ex) {
      fail("the value is not valid YAML: " + ex.msg);
    }
  }
  if (!root.IsDefined() || root.IsNull()) root = YAML::Node(YAML::NodeType::Map);
  std::vector<std::string> parts;
  std::stringstream ss(path);
  for (std::string part; std::getline(ss, part, '.');) parts.push_back(part);
  if (parts.empty() || path.back() == '.' ||
      std::any_of(parts.begin(), parts.end(), [](const std::string& p) { return p.empty(); }))
    fail("the key path must be names joined by dots, e.g. gait.stroke.amplitude");
  // A list index: a whole number without leading zeros (one spelling per element).
  auto list_index = [](const std::string& part) -> long {
    if (part.empty() || part.size() > 6 || (part.size() > 1 && part[0] == '0') ||
        !std::all_of(part.begin(), part.end(), [](char ch) { return ch >= '0' && ch <= '9'; }))
      return -1;
    return std::stol(part);
  };
  YAML::Node cur = root;
  for (std::size_t i = 0; i < parts.size(); ++i) {
    const bool last = i + 1 == parts.size();
    if (cur.IsSequence()) {
      const long k = list_index(parts[i]);
      if (k < 0 || static_cast<std::size_t>(k) >= cur.size())
        fail(cur.size() == 0 ? "'" + parts[i] + "' indexes an empty list"
                             : "'" + parts[i] + "' must index the list (0 to " +
                                   std::to_string(cur.size() - 1) + ")");
      if (last) {
        if (remove) fail("a list element cannot be removed; set the whole list instead");
        cur[static_cast<std::size_t>(k)] = value;
        return;
      }
      YAML::Node next = cur[static_cast<std::size_t>(k)];
      cur.reset(next);
      continue;
    }
    if (!cur.IsMap()) fail("cannot set a key inside a non-map value");
    if (last) {
      if (remove)
        cur.remove(parts[i]);
      else
        cur[parts[i]] = value;
      return;
    }
    YAML::Node next = cur[parts[i]];
    if (!next.IsDefined() || next.IsNull()) {
      if (remove) return;                 // nothing to remove
      if (list_index(parts[i + 1]) >= 0)  // an element of a list that is not there
        fail("there is no list at '" + path.substr(0, path.rfind('.')) +
             "' to index; set the whole list, e.g. " + path.substr(0, path.rfind('.')) +
             "=[0, 0, 0]");
      cur[parts[i]] = YAML::Node(YAML::NodeType::Map);
      next = cur[parts[i]];
    }
    cur.reset(next);
  }
}

/// Refuses a key given twice in one map — a single key or a whole section (YAML parsers keep the
/// first silently) — naming both lines.
void check_duplicate_keys(const YAML::Node& node, const std::string& path,
                          const std::string& file) {
  if (node.IsSequence()) {
    std::size_t i = 0;
    for (const YAML::Node& v : node)
      check_duplicate_keys(v, path + "." + std::to_string(i++), file);
    return;
  }
  if (!node.IsMap()) return;
  std::map<std::string, int> seen;
  for (const auto& kv : node) {
    if (!kv.first.IsScalar()) continue;
    const std::string key = path.empty() ? kv.first.Scalar() : path + "." + kv.first.Scalar();
    const int line = kv.first.Mark().line + 1;
    const auto [first, fresh] = seen.emplace(kv.first.Scalar(), line);
    if (!fresh) {
      InputError e(key, "",
                   "is given twice, on lines " + std::to_string(first->second) + " and " +
                       std::to_string(line) + " (only one may stay)",
                   "merge the two, or delete the one you do not mean");
      e.locate(file, line);
      throw e;
    }
    check_duplicate_keys(kv.second, key, file);
  }
}

Source parse(const std::string& text, const std::string& name, const std::string& base_dir,
             const std::vector<std::string>& overrides) {
  Source src;
  src.file = name;
  src.base_dir = base_dir;
  try {
    src.root = YAML::Load(text);
  } catch (const YAML::ParserException& ex) {
    InputError e("(syntax)", "", "YAML syntax error: " + ex.msg);
    e.locate(name, ex.mark.line + 1);
    throw e;
  }
  check_duplicate_keys(src.root, "", name);
  for (const auto& o : overrides) {
    const auto eq = o.find('=');
    if (eq == std::string::npos || eq == 0) {
      InputError e("(--set)", "'" + o + "'", "must be key.path=value");
      e.locate("command line", 0);
      throw e;
    }
    const std::string path = o.substr(0, eq);
    apply_override(src.root, path, o.substr(eq + 1), false, "command line (--set " + o + ")");
    src.overrides[path] = "--set " + o;  // the last --set of a key wins
  }
  return src;
}

Model build(const Source& src, ModelSpec spec) {
  try {
    return Model(std::move(spec));
  } catch (InputError& e) {
    InputError located = e.rekeyed(written_key(src, e.key()));
    src.locate(located);
    throw located;
  }
}

std::string folder_of(const std::string& path) {
  const fs::path parent = fs::path(path).parent_path();
  return parent.empty() ? std::string(".") : parent.string();
}

}  // namespace

std::string closest_match(const std::string& word, const std::vector<std::string>& allowed) {
  std::string best;
  std::size_t best_d = std::max<std::size_t>(2, word.size() / 3) + 1;
  for (const auto& a : allowed) {
    std::vector<std::size_t> prev(a.size() + 1), cur(a.size() + 1);
    for (std::size_t j = 0; j <= a.size(); ++j) prev[j] = j;
    for (std::size_t i = 1; i <= word.size(); ++i) {
      cur[0] = i;
      for (std::size_t j = 1; j <= a.size(); ++j)
        cur[j] = std::min(
            {prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + (word[i - 1] == a[j - 1] ? 0u : 1u)});
      std::swap(prev, cur);
    }
    if (prev[a.size()] < best_d) {
      best_d = prev[a.size()];
      best = a;
    }
  }
  return best;
}

void locate_in_config(InputError& error, const std::string& path,
                      const std::vector<std::string>& overrides) {
  try {
    const Source src = parse(read_file(path), path, folder_of(path), overrides);
    InputError located = error.rekeyed(written_key(src, error.key()));
    src.locate(located);
    error = located;
  } catch (const InputError&) {
    error.locate(path, 0);  // the file changed under us: name it without a line
  }
}

ModelSpec load_spec(const std::string& path, const std::vector<std::string>& overrides) {
  const Source src = parse(read_file(path), path, folder_of(path), overrides);
  return Reader(src).read();
}

Model load_model(const std::string& path, const std::vector<std::string>& overrides) {
  const Source src = parse(read_file(path), path, folder_of(path), overrides);
  return build(src, Reader(src).read());
}

Model model_from_text(const std::string& text, const std::string& name,
                      const std::vector<std::string>& overrides, const std::string& base_dir) {
  const Source src = parse(text, name, base_dir, overrides);
  return build(src, Reader(src).read());
}

// --- CaseLoader -----------------------------------------------------------------------------

struct CaseLoader::Parsed {
  Source base;
};

CaseLoader::CaseLoader(const std::string& path, const std::vector<std::string>& sets,
                       const std::string& display_name)
    : CaseLoader(read_file(path), display_name.empty() ? path : display_name, folder_of(path),
                 sets) {}

CaseLoader::CaseLoader(std::string text, std::string name, std::string base_dir,
                       std::vector<std::string> sets)
    : text_(std::move(text)),
      name_(std::move(name)),
      base_dir_(std::move(base_dir)),
      sets_(std::move(sets)),
      parsed_(std::make_shared<Parsed>(Parsed{parse(text_, name_, base_dir_, sets_)})) {}

CaseLoader::CaseLoader(const CaseLoader& other)
    : text_(other.text_),
      name_(other.name_),
      base_dir_(other.base_dir_),
      sets_(other.sets_),
      parsed_(std::make_shared<Parsed>(Parsed{parse(text_, name_, base_dir_, sets_)})) {}

CaseLoader::~CaseLoader() = default;

/// The base document with a case's overrides applied: on a clone of the base (fast; the clone
/// has no line marks), or on the base itself when it is a fresh parse of its own.
static Source case_source(const Source& base, const studies::CaseSpec& c, bool clone = true) {
  Source src = base;
  if (clone)
    src.root.reset(YAML::Clone(base.root));  // rebind: assignment would write into the base
  for (const studies::Override& o : c.overrides) {
    const std::string shown = o.key + "=" + (o.remove ? "~" : o.text);
    apply_override(src.root, o.key, o.text, o.remove, "case (" + shown + ")");
    src.overrides[o.key] = "case " + shown;
  }
  return src;
}

namespace {
void add_offsets(ModelSpec& s, const studies::CaseSpec& c) {
  for (int i = 0; i < 3; ++i) {
    s.flight.velocity_offset(i) = c.velocity_offset[static_cast<std::size_t>(i)];
    s.flight.rates_offset(i) = c.rates_offset[static_cast<std::size_t>(i)];
  }
}
}  // namespace

/// f(source of the case), on a clone of the parsed base (fast; a clone has no line marks) and,
/// when that raises an InputError, again on a fresh parse, whose nodes know their lines.
template <class F>
static auto with_case_source(const Source& base, const studies::CaseSpec& c,
                             const std::function<Source()>& reparse, F&& f) {
  try {
    return f(case_source(base, c));
  } catch (const InputError&) {
    return f(case_source(reparse(), c, false));
  }
}

ModelSpec CaseLoader::spec(const studies::CaseSpec& c) const {
  return with_case_source(
      parsed_->base, c, [this] { return parse(text_, name_, base_dir_, sets_); },
      [&c](const Source& src) {
        ModelSpec s = Reader(src).read();
        add_offsets(s, c);
        return s;
      });
}

Model CaseLoader::build(const studies::CaseSpec& c) const {
  return with_case_source(
      parsed_->base, c, [this] { return parse(text_, name_, base_dir_, sets_); },
      [&c](const Source& src) {
        ModelSpec s = Reader(src).read();
        add_offsets(s, c);
        return ::flapline::io::build(src, std::move(s));
      });
}

std::optional<double> CaseLoader::number_at(const std::string& key) const {
  const Source& src = parsed_->base;
  auto scalar = [&src](const std::string& path) -> std::optional<YAML::Node> {
    const YAML::Node n = src.find(path);
    return n.IsDefined() ? std::optional<YAML::Node>(n) : std::nullopt;
  };
  auto as_number = [&](const YAML::Node& n) -> std::optional<double> {
    if (!n.IsScalar()) return std::nullopt;
    try {
      return n.as<double>();
    } catch (const YAML::BadConversion&) {
      return std::nullopt;
    }
  };
  if (auto n = scalar(key)) return as_number(*n);
  // Documented defaults of the vehicle's attitude and of a flight condition (0) when the section
  // that holds them is there.
  for (const char* k : {"vehicle.attitude.roll", "vehicle.attitude.pitch"})
    if (key == k && scalar("vehicle")) return 0.0;
  for (const char* k : {"flight.flight_path_angle", "flight.sideslip", "flight.turn_rate"})
    if (key == k && scalar("flight.airspeed")) return 0.0;
  // A side's key inherits the shared gait block's value.
  for (const char* side : {"gait.left.", "gait.right."})
    if (key.rfind(side, 0) == 0)
      if (auto n = scalar("gait." + key.substr(std::string(side).size()))) return as_number(*n);
  // Waveform fields left out take their defaults (configs/README.md): a constant given as a
  // number is the mean.
  const auto dot = key.rfind('.');
  if (dot != std::string::npos && key.rfind("gait.", 0) == 0) {
    const std::string field = key.substr(dot + 1), wave = key.substr(0, dot);
    std::string shared = wave;
    for (const char* side : {"gait.left.", "gait.right."})
      if (wave.rfind(side, 0) == 0) shared = "gait." + wave.substr(std::string(side).size());
    for (const std::string& w : {wave, shared})
      if (auto n = scalar(w); n && n->IsScalar()) return field == "mean" ? as_number(*n) : 0.0;
    const bool span_ratio =
        wave.size() >= 10 && wave.compare(wave.size() - 10, 10, "span_ratio") == 0;
    if (field == "mean") return span_ratio ? 1.0 : 0.0;
    if (field == "amplitude" || field == "phase") return 0.0;
  }
  return std::nullopt;
}

std::string CaseLoader::document(const studies::CaseSpec& c) const {
  Source src = case_source(parsed_->base, c);
  YAML::Node wing = src.root["wing"];
  if (wing.IsMap() && wing["table_file"].IsDefined() && wing["table_file"].IsScalar()) {
    const fs::path file = fs::absolute(fs::path(base_dir_) / wing["table_file"].Scalar());
    wing["table_file"] = file.lexically_normal().string();
  }
  YAML::Emitter out;
  out.SetDoublePrecision(17);
  out << src.root;
  return std::string(out.c_str()) + "\n";
}

studies::CaseBuilderFactory case_builders(const CaseLoader& loader) {
  return [&loader] {
    auto own = std::make_shared<CaseLoader>(loader);  // a copy parses anew: one per thread
    return [own](const studies::CaseSpec& c) { return own->build(c); };
  };
}

}  // namespace flapline::io
