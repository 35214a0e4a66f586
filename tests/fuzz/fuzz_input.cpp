// The fuzz input's loading and its properties. No reference value here: every comparison is of a
// case with its own rerun (resolved.yaml, a study case's document), which must agree bit for bit.
#include "fuzz_input.hpp"

#include <algorithm>
#include <cstdio>
#include <cstring>
#include <fstream>
#include <stdexcept>

#include "flapline/common/errors.hpp"
#include "flapline/io/config.hpp"
#include "flapline/io/resolved.hpp"
#include "flapline/simulation/run.hpp"

namespace flapline::fuzz {

namespace {

/// What a short run gave: how it ended and, when it ran, the cycle-mean wrench.
struct Outcome {
  enum class Kind { ran, input_error, blew_up } kind = Kind::ran;
  Eigen::Vector3d force = Eigen::Vector3d::Zero(), moment = Eigen::Vector3d::Zero();
  /// The same ending and the same bits (NaN included).
  bool same_as(const Outcome& o) const {
    return kind == o.kind && std::memcmp(force.data(), o.force.data(), sizeof(double) * 3) == 0 &&
           std::memcmp(moment.data(), o.moment.data(), sizeof(double) * 3) == 0;
  }
};

/// A short run of the case made small — one cycle, at most 6 strips per wing and 80 steps — so
/// that the run's own checks (the step size) and the loads see whatever the loader lets through.
/// An InputError (the step check) and a NumericalError (a run that blows up) are proper outcomes.
Outcome run_small(const Model& model) {
  ModelSpec spec = model.spec();
  spec.strips.count = std::min(spec.strips.count, 6);
  if (spec.simulation.steps_per_cycle > 80) {
    spec.simulation.steps_per_cycle = 80;
    spec.simulation.samples_per_cycle = 20;
  }
  spec.simulation.min_cycles = spec.simulation.max_cycles = 1;
  Outcome out;
  try {
    RunControl quick;
    quick.keep_history = false;
    const RunSummary r = simulate(Model(spec), quick);
    out.force = r.averages.mean.force;
    out.moment = r.averages.mean.moment;
  } catch (const InputError&) {
    out.kind = Outcome::Kind::input_error;
  } catch (const NumericalError&) {
    out.kind = Outcome::Kind::blew_up;
  }
  return out;
}

/// `text` (a YAML document written for `model`) must load again to the same case: the same
/// resolved configuration and the same short run, bit for bit. A refusal or a difference throws
/// std::logic_error (a finding).
void check_rerun(const Model& model, const std::string& text, const std::string& what,
                 const std::string& scratch_dir) {
  try {
    const Model again = io::model_from_text(text, what, {}, scratch_dir);
    if (io::resolved_yaml(again) != io::resolved_yaml(model))
      throw std::logic_error(what + " resolves to another configuration:\n" + text);
    if (!run_small(again).same_as(run_small(model)))
      throw std::logic_error(what + " reruns to other results:\n" + text);
  } catch (const InputError& e) {
    throw std::logic_error(what + " is refused: " + e.what() + "\n" + text);
  }
}

bool starts_with(const std::string& s, const char* prefix) {
  return s.rfind(prefix, 0) == 0;
}
}  // namespace

Input split(const std::uint8_t* data, std::size_t size) {
  Input in;
  const std::string all(reinterpret_cast<const char*>(data), size);
  std::size_t begin = 0;
  while (begin < all.size()) {
    std::size_t end = all.find('\n', begin);
    if (end == std::string::npos) end = all.size();
    std::string line = all.substr(begin, end - begin);
    if (!line.empty() && line.back() == '\r') line.pop_back();
    begin = end + 1;
    if (line == "#csv") {
      in.has_csv = true;
      if (begin < all.size()) in.csv = all.substr(begin);
      break;
    }
    in.text += line;
    in.text += '\n';
    if (starts_with(line, "#set ")) {
      in.sets.push_back(line.substr(5));
    } else if (starts_with(line, "#case ")) {
      in.has_case = true;
      const std::string o = line.substr(6);
      const std::size_t eq = o.find('=');
      if (eq == std::string::npos)
        in.study_case.overrides.push_back({o, "", true});
      else
        in.study_case.overrides.push_back({o.substr(0, eq), o.substr(eq + 1), false});
    }
  }
  return in;
}

bool load(const Input& input, const std::string& scratch_dir) {
  // The table file is this input's own: written when it has one, gone when it has none.
  const std::string csv_path = scratch_dir + "/wing.csv";
  if (input.has_csv)
    std::ofstream(csv_path, std::ios::binary | std::ios::trunc) << input.csv;
  else
    std::remove(csv_path.c_str());
  const std::string name = "fuzz.yaml";
  bool loaded = false;
  try {
    // resolved.yaml reruns the same case bit for bit.
    const Model model = io::model_from_text(input.text, name, input.sets, scratch_dir);
    check_rerun(model, io::resolved_yaml(model), "resolved.yaml", scratch_dir);
    loaded = true;
  } catch (const InputError&) {
  }
  if (input.has_case) {
    try {
      // The case's document runs as is: it loads to the same case.
      const io::CaseLoader loader(input.text, name, scratch_dir, input.sets);
      const Model model = loader.build(input.study_case);
      check_rerun(model, loader.document(input.study_case), "the case document", scratch_dir);
      loaded = true;
    } catch (const InputError&) {
    }
  }
  return loaded;
}

}  // namespace flapline::fuzz
