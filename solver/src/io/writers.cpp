#include "flapline/io/writers.hpp"

#include <unistd.h>

#include <algorithm>
#include <cmath>
#include <cstdio>
#include <fstream>
#include <nlohmann/json.hpp>
#include <stdexcept>

#include "flapline/common/errors.hpp"
#include "flapline/common/math.hpp"
#include "flapline/io/resolved.hpp"
#include "flapline/simulation/summary_keys.hpp"
#include "flapline/version.hpp"

namespace flapline::io {
namespace {

void cell(std::string& out, double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, ",%.9g", v);
  out += buf;
}

std::string replace_all(std::string s, const std::string& from, const std::string& to) {
  for (std::size_t p = s.find(from); p != std::string::npos; p = s.find(from, p + to.size()))
    s.replace(p, from.size(), to);
  return s;
}

/// Machine-readable files never carry a negative zero.
double no_negative_zero(double v) {
  return v == 0.0 ? 0.0 : v;
}

}  // namespace

const std::vector<std::string>& history_columns() {
  static const std::vector<std::string> c{"time_s",
                                          "cycle",
                                          "phase",
                                          "X_N",
                                          "Y_N",
                                          "Z_N",
                                          "L_roll_Nm",
                                          "M_pitch_Nm",
                                          "N_yaw_Nm",
                                          "lift_N",
                                          "thrust_N",
                                          "right_X_N",
                                          "right_Y_N",
                                          "right_Z_N",
                                          "right_L_roll_Nm",
                                          "right_M_pitch_Nm",
                                          "right_N_yaw_Nm",
                                          "left_X_N",
                                          "left_Y_N",
                                          "left_Z_N",
                                          "left_L_roll_Nm",
                                          "left_M_pitch_Nm",
                                          "left_N_yaw_Nm",
                                          "power_air_W",
                                          "power_actuator_W",
                                          "right_stroke_deg",
                                          "right_deviation_deg",
                                          "right_pitch_deg",
                                          "right_span_ratio",
                                          "left_stroke_deg",
                                          "left_deviation_deg",
                                          "left_pitch_deg",
                                          "left_span_ratio",
                                          "inertial_X_N",
                                          "inertial_Y_N",
                                          "inertial_Z_N",
                                          "inertial_L_roll_Nm",
                                          "inertial_M_pitch_Nm",
                                          "inertial_N_yaw_Nm",
                                          "total_X_N",
                                          "total_Y_N",
                                          "total_Z_N",
                                          "total_L_roll_Nm",
                                          "total_M_pitch_Nm",
                                          "total_N_yaw_Nm",
                                          "power_mechanical_W",
                                          "power_inertial_W",
                                          "right_inertial_X_N",
                                          "right_inertial_Y_N",
                                          "right_inertial_Z_N",
                                          "right_inertial_L_roll_Nm",
                                          "right_inertial_M_pitch_Nm",
                                          "right_inertial_N_yaw_Nm",
                                          "left_inertial_X_N",
                                          "left_inertial_Y_N",
                                          "left_inertial_Z_N",
                                          "left_inertial_L_roll_Nm",
                                          "left_inertial_M_pitch_Nm",
                                          "left_inertial_N_yaw_Nm"};
  return c;
}

namespace {
/// One column per quantity, one row per history sample: time, cycle and phase first, then what
/// `row(r, put)` puts, in column order.
template <class Row>
std::vector<std::vector<double>> timed_table(std::size_t columns, const RunSummary& s, Row row) {
  std::vector<std::vector<double>> t(columns);
  for (auto& c : t) c.reserve(s.history.size());
  for (const HistoryRow& r : s.history) {
    std::size_t k = 0;
    const auto put = [&](double v) { t[k++].push_back(v); };
    const double cycles = r.loads.time * s.frequency;
    const double cycle = std::floor(cycles + 1e-9);
    put(r.loads.time);
    put(cycle);
    put(std::max(0.0, cycles - cycle));
    row(r, put);
  }
  return t;
}
}  // namespace

std::vector<std::vector<double>> history_table(const RunSummary& s) {
  return timed_table(history_columns().size(), s, [](const HistoryRow& r, const auto& put) {
    for (const Wrench* w : {&r.loads.total}) {
      for (int i = 0; i < 3; ++i) put(w->force(i));
      for (int i = 0; i < 3; ++i) put(w->moment(i));
    }
    put(-r.loads.total.force.z());
    put(r.loads.total.force.x());
    for (const Wrench& w : r.loads.wing) {
      for (int i = 0; i < 3; ++i) put(w.force(i));
      for (int i = 0; i < 3; ++i) put(w.moment(i));
    }
    put(r.loads.power_air);
    put(r.loads.power_actuator);
    for (const WingAngles& a : r.angles) {
      put(a.stroke / kDegree);
      put(a.deviation / kDegree);
      put(a.pitch / kDegree);
      put(a.span_ratio);
    }
    const Wrench& in = r.loads.inertial;
    for (int i = 0; i < 3; ++i) put(in.force(i));
    for (int i = 0; i < 3; ++i) put(in.moment(i));
    for (int i = 0; i < 3; ++i) put(r.loads.total.force(i) + in.force(i));
    for (int i = 0; i < 3; ++i) put(r.loads.total.moment(i) + in.moment(i));
    put(r.loads.power_mechanical);
    put(r.loads.power_inertial);
    for (const WingDriveSample& d : r.loads.drive) {
      for (int i = 0; i < 3; ++i) put(d.inertial.force(i));
      for (int i = 0; i < 3; ++i) put(d.inertial.moment(i));
    }
  });
}

const std::vector<std::string>& drive_columns() {
  static const std::vector<std::string> c = [] {
    std::vector<std::string> out{"time_s", "cycle", "phase"};
    for (const char* wing : {"right", "left"}) {
      for (int j = 0; j < kJoints; ++j) {
        const std::string p = std::string(wing) + "_" + kJointNames[j] + "_";
        out.push_back(p + "rate_" + kJointRateUnits[j]);
        for (const char* part : {"torque_", "torque_aero_", "torque_inertial_", "torque_gravity_"})
          out.push_back(p + part + kJointForceUnits[j]);
        out.push_back(p + "power_W");
      }
      out.push_back(std::string(wing) + "_power_W");
      out.push_back(std::string(wing) + "_inertial_power_W");
    }
    out.push_back("pair_power_W");
    return out;
  }();
  return c;
}

std::vector<std::vector<double>> drive_table(const RunSummary& s) {
  return timed_table(drive_columns().size(), s, [](const HistoryRow& r, const auto& put) {
    for (const WingDriveSample& d : r.loads.drive) {
      for (std::size_t j = 0; j < static_cast<std::size_t>(kJoints); ++j) {
        put(d.rate[j]);
        put(d.torque[j]);
        put(d.torque_aero[j]);
        put(d.torque_inertial[j]);
        put(d.torque_gravity[j]);
        put(d.joint_power[j]);
      }
      put(d.power);
      put(d.power_inertial);
    }
    put(r.loads.power_mechanical);
  });
}

namespace {
/// A table with time, cycle and phase first, as history.csv and drive.csv print it.
std::string timed_csv(const std::vector<std::string>& names,
                      const std::vector<std::vector<double>>& t, std::size_t rows) {
  std::string out;
  for (std::size_t k = 0; k < names.size(); ++k) out += (k ? "," : "") + names[k];
  out += "\n";
  out.reserve(out.size() + rows * 12 * names.size());
  for (std::size_t r = 0; r < rows; ++r) {
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.9g,%d,%.6f", t[0][r], static_cast<int>(t[1][r]), t[2][r]);
    out += buf;
    for (std::size_t k = 3; k < t.size(); ++k) cell(out, no_negative_zero(t[k][r]));
    out += "\n";
  }
  return out;
}
}  // namespace

std::string history_csv(const RunSummary& s) {
  return timed_csv(history_columns(), history_table(s), s.history.size());
}

std::string drive_csv(const RunSummary& s) {
  return timed_csv(drive_columns(), drive_table(s), s.history.size());
}

const std::vector<std::string>& spanwise_numeric_columns() {
  static const std::vector<std::string> c{"strip",
                                          "radius_m",
                                          "span_fraction",
                                          "chord_m",
                                          "X_per_span_N_m",
                                          "Y_per_span_N_m",
                                          "Z_per_span_N_m",
                                          "lift_per_span_N_m",
                                          "normal_force_per_span_N_m",
                                          "circulation_m2_s",
                                          "alpha_deg",
                                          "tangential_speed_m_s",
                                          "induced_wash_m_s"};
  return c;
}

std::vector<std::vector<double>> spanwise_table(const RunSummary& s) {
  std::vector<std::vector<double>> t(spanwise_numeric_columns().size());
  for (const SpanwiseRow& r : s.spanwise) {
    std::size_t k = 0;
    for (double v : {static_cast<double>(r.strip + 1), r.radius, r.span_fraction, r.chord,
                     r.force_per_span.x(), r.force_per_span.y(), r.force_per_span.z(),
                     -r.force_per_span.z(), r.normal_force_per_span, r.circulation,
                     r.alpha / kDegree,  // NaN in the cycle-mean rows
                     r.tangential_speed, r.induced_wash})
      t[k++].push_back(v);
  }
  return t;
}

std::string spanwise_csv(const RunSummary& s) {
  std::string out = "phase,wing";
  for (const std::string& c : spanwise_numeric_columns()) out += "," + c;
  out += "\n";
  const std::vector<std::vector<double>> t = spanwise_table(s);
  for (std::size_t i = 0; i < s.spanwise.size(); ++i) {
    const SpanwiseRow& r = s.spanwise[i];
    char buf[64];
    if (r.cycle_mean)
      std::snprintf(buf, sizeof buf, "mean,%s,%d", std::string(to_string(r.side)).c_str(),
                    r.strip + 1);
    else
      std::snprintf(buf, sizeof buf, "%.6f,%s,%d", r.phase, std::string(to_string(r.side)).c_str(),
                    r.strip + 1);
    out += buf;
    for (std::size_t k = 1; k < t.size(); ++k) {
      if (std::isfinite(t[k][i]))
        cell(out, t[k][i]);
      else
        out += ",";  // the angle of attack of a cycle-mean row
    }
    out += "\n";
  }
  return out;
}

std::string summary_json(const RunSummary& s, const std::string& config_path, const Model* model,
                         const std::vector<std::string>& overrides) {
  using nlohmann::json;
  json j;
  j["version"] = kVersion;
  j["title"] = s.title;
  if (!config_path.empty()) j["config"] = config_path;
  if (model) {
    j["overrides"] = overrides;
    j["configuration"] = json::parse(resolved_configuration(*model).dump());
  }
  j["model"] = s.model_label;
  j["status"] = std::string(to_string(s.status));
  j["message"] = s.message;
  j["warnings"] = s.warnings;
  // Every scalar from the frozen key list (simulation/summary_keys.hpp), nested by its path.
  for (const SummaryKey& k : summary_keys()) {
    if (k.vehicle && !s.vehicle) continue;  // without a vehicle, nothing changes
    if (k.inflow && !s.inflow) continue;
    const std::optional<double> v = k.value(s);
    json& slot = j[json::json_pointer("/" + replace_all(k.path, ".", "/"))];
    if (!v)
      slot = nullptr;
    else if (k.integer)
      slot = static_cast<long long>(*v);
    else
      slot = no_negative_zero(*v);
  }
  j["conventions"] =
      "body axes: x forward, y toward the right wing, z down; L roll (+ right wing down), "
      "M pitch (+ nose up), N yaw (+ nose right); lift = -Z, thrust = X, side force = Y; "
      "moments about the body origin";
  j["cautions"] = kCautions;
  return j.dump(2) + "\n";
}

std::string state_space_json(const StateSpace& ss, const Model& model) {
  using nlohmann::json;
  auto rows = [](const Eigen::MatrixXd& m) {
    json out = json::array();
    for (Eigen::Index i = 0; i < m.rows(); ++i) {
      json row = json::array();
      for (Eigen::Index j = 0; j < m.cols(); ++j) row.push_back(m(i, j));
      out.push_back(row);
    }
    return out;
  };
  const Eigen::Index n = model.strips_per_wing();
  json j;
  j["model"] = std::string(to_string(model.aero_options().kind));
  j["time_s"] = ss.time;
  j["strips_per_wing"] = n;
  j["equations"] = "dx/dt = A x + B u, y = C x + D u";
  j["state"] =
      "x = [x1 of strips 1..N of the right wing, then of the left wing; x2 likewise] "
      "(lag states, m/s): " +
      std::to_string(ss.A.rows()) + " entries";
  j["input"] =
      "u = kinematic three-quarter-chord normal-wash w_3/4 of each strip (m/s), right "
      "wing first: " +
      std::to_string(ss.B.cols()) + " entries";
  j["output"] = "y = bound circulation of each strip (m^2/s), right wing first: " +
                std::to_string(ss.C.rows()) + " entries";
  j["A"] = rows(ss.A);
  j["B"] = rows(ss.B);
  j["C"] = rows(ss.C);
  j["D"] = rows(ss.D);
  return j.dump() + "\n";
}

void OutputFolder::add(std::string name, std::string content) {
  files_.emplace_back(std::move(name), std::move(content));
}

std::vector<std::filesystem::path> OutputFolder::paths() const {
  std::vector<std::filesystem::path> out;
  for (const auto& f : files_) out.push_back(dir_ / f.first);
  return out;
}

void OutputFolder::check_claimable(const std::filesystem::path& dir, const std::string& option) {
  namespace fs = std::filesystem;
  std::error_code ec;
  if (!fs::exists(dir, ec)) return;
  if (!fs::is_directory(dir, ec))
    throw InputError(option, dir.string(), "is a file, not a folder",
                     "choose a folder for the results");
  if (fs::is_empty(dir, ec) || fs::exists(dir / kMarker, ec)) return;
  throw InputError(option, dir.string(),
                   "holds files flapline did not write; results go to a new or empty folder, or "
                   "one an earlier flapline run wrote (it replaces that run's files)",
                   "choose another folder with -o");
}

namespace {
/// The file names an earlier run listed in the marker (none when there is no marker).
std::vector<std::string> marked_files(const std::filesystem::path& marker) {
  std::vector<std::string> out;
  std::ifstream in(marker);
  std::string line;
  while (std::getline(in, line))
    if (!line.empty() && line[0] != '#' && line.find('/') == std::string::npos && line != ".." &&
        line != ".")
      out.push_back(line);
  return out;
}
}  // namespace

void OutputFolder::commit() {
  if (own_ == Ownership::files) {
    write_all();
    return;
  }
  namespace fs = std::filesystem;
  check_claimable(dir_);
  const std::vector<std::string> earlier = marked_files(dir_ / kMarker);
  std::string marker = "# Written by flapline " + std::string(kVersion) +
                       ": the next run into this folder rewrites these files and removes the ones "
                       "it does not write again.\n";
  for (const auto& f : files_) marker += f.first + "\n";
  files_.emplace_back(kMarker, std::move(marker));
  write_all();  // the files and the marker, all or none
  files_.pop_back();
  std::error_code ec;
  for (const std::string& name : earlier)
    if (std::none_of(files_.begin(), files_.end(), [&](const auto& f) { return f.first == name; }))
      fs::remove(dir_ / name, ec);
}

void OutputFolder::write_all() {
  namespace fs = std::filesystem;
  std::error_code ec;
  const bool created = !fs::exists(dir_);
  fs::create_directories(dir_, ec);
  if (ec)
    throw std::runtime_error("cannot create output folder " + dir_.string() + ": " + ec.message());
  const std::string tag = ".tmp-" + std::to_string(::getpid());
  std::vector<fs::path> temps;
  auto clean = [&] {
    for (const auto& t : temps) fs::remove(t, ec);
    if (created) fs::remove(dir_, ec);
  };
  for (const auto& [name, content] : files_) {
    const fs::path tmp = dir_ / (name + tag);
    temps.push_back(tmp);
    std::ofstream out(tmp, std::ios::binary | std::ios::trunc);
    out << content;
    out.close();
    if (!out) {
      clean();
      throw std::runtime_error("cannot write " + (dir_ / name).string());
    }
  }
  for (std::size_t i = 0; i < files_.size(); ++i) {
    fs::rename(temps[i], dir_ / files_[i].first, ec);
    if (ec) {
      clean();
      throw std::runtime_error("cannot rename " + temps[i].string() + ": " + ec.message());
    }
  }
}

}  // namespace flapline::io
