#pragma once
// The config loader's fuzz input (tools/fuzz, tests/fuzz/README.md): YAML text with the command
// line folded into comment lines, so that every config in the repository is a seed as it is.
//   #set key.path=value     one --set override of the base configuration
//   #case key.path=value    one override of a study case (CaseLoader::build); `#case key.path`
//                           alone removes the key
//   #csv                    every line after it is the planform table file `wing.csv`
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "flapline/studies/design.hpp"

namespace flapline::fuzz {

struct Input {
  std::string text;               ///< the YAML document (the #set/#case lines stay in as comments)
  std::vector<std::string> sets;  ///< --set strings
  studies::CaseSpec study_case;   ///< the #case overrides
  bool has_case = false;
  bool has_csv = false;
  std::string csv;  ///< the table file's text (after #csv)
};

Input split(const std::uint8_t* data, std::size_t size);

/// Load the input as the CLI and a study would: the Model from the text with its --set strings,
/// its resolved configuration, which must load again to the same resolved configuration, one
/// cycle of the case made small, and the study case when there is one. `scratch_dir` holds the
/// table file (relative table paths resolve there). Returns true when it loaded, false when an
/// InputError refused it; any other exception or a broken round trip escapes (std::logic_error) and
/// is a finding.
bool load(const Input& input, const std::string& scratch_dir);

}  // namespace flapline::fuzz
