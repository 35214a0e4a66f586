#pragma once
/// \file
/// Reading a case from YAML (every key: configs/README.md). Errors are InputError located at the
/// file and line of the offending key; `--set key.path=value` overrides are located on the
/// command line.

#include <memory>
#include <optional>
#include <string>
#include <vector>

#include "flapline/case/model.hpp"
#include "flapline/common/errors.hpp"
#include "flapline/studies/design.hpp"
#include "flapline/studies/runner.hpp"

namespace flapline::io {

/// Parse a YAML file into a ModelSpec (SI units) after applying `overrides` ("key.path=value",
/// value in YAML flow syntax). Throws InputError located in the file.
ModelSpec load_spec(const std::string& path, const std::vector<std::string>& overrides = {});

/// Parse and build the Model (all validation); throws InputError located in the file.
Model load_model(const std::string& path, const std::vector<std::string>& overrides = {});

/// The same from YAML text; `name` stands for the file in messages and `base_dir` resolves
/// relative table files.
Model model_from_text(const std::string& text, const std::string& name,
                      const std::vector<std::string>& overrides = {},
                      const std::string& base_dir = ".");

/// Place an error raised after loading (e.g. by the run's step-size check) at the line of its key
/// in the config file, or on the command line when an override set it.
void locate_in_config(InputError& error, const std::string& path,
                      const std::vector<std::string>& overrides = {});

/// The closest allowed word to `word` (edit distance), or empty when none is close.
std::string closest_match(const std::string& word, const std::vector<std::string>& allowed);

/// The base configuration of a study, parsed once (with its `--set` overrides), from which every
/// case's Model is built by applying the case's overrides (the `--set` grammar: a dotted key path,
/// a whole-number part indexing a list as in `flight.velocity.0`, `remove` dropping the key).
/// Errors raised for a case's own override are located as "case (key=value)"; errors of the base
/// file keep its file and line. Not thread-safe: copy it per thread (a copy parses anew).
class CaseLoader {
 public:
  /// `display_name` stands for the file in messages (default: `path`; studies pass the file's
  /// name alone, so that their rows do not depend on how the path was spelled).
  CaseLoader(const std::string& path, const std::vector<std::string>& sets,
             const std::string& display_name = {});
  /// From text; `name` stands for the file in messages, `base_dir` resolves table files.
  CaseLoader(std::string text, std::string name, std::string base_dir,
             std::vector<std::string> sets);
  CaseLoader(const CaseLoader& other);
  CaseLoader& operator=(const CaseLoader&) = delete;
  ~CaseLoader();

  /// The case's ModelSpec / Model; throws InputError located as described above.
  ModelSpec spec(const studies::CaseSpec& c) const;
  Model build(const studies::CaseSpec& c) const;
  /// The number a key holds in the base configuration (after --set): the value written there,
  /// a side's key inheriting the shared gait value, a waveform field left out taking its default
  /// (mean 0, span ratio mean 1, amplitude 0, phase 0). Empty when the key holds no number.
  std::optional<double> number_at(const std::string& key) const;

  /// The case as a YAML document that runs as is: the base (with --set) and the case's
  /// overrides, a table file's path made absolute. Comments are not kept.
  std::string document(const studies::CaseSpec& c) const;

  const std::string& text() const noexcept { return text_; }
  const std::string& name() const noexcept { return name_; }
  const std::vector<std::string>& sets() const noexcept { return sets_; }

 private:
  struct Parsed;
  std::string text_, name_, base_dir_;
  std::vector<std::string> sets_;
  std::shared_ptr<const Parsed> parsed_;
};

/// Case builders for a study: each worker thread gets its own copy of `loader` (which must
/// outlive the study).
studies::CaseBuilderFactory case_builders(const CaseLoader& loader);

}  // namespace flapline::io
