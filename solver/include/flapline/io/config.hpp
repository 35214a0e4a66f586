#pragma once
/// \file
/// Reading a case from YAML (every key: configs/README.md). Errors are InputError located at the
/// file and line of the offending key; `--set key.path=value` overrides are located on the
/// command line.

#include <string>
#include <vector>

#include "flapline/common/errors.hpp"
#include "flapline/simulation/model.hpp"

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

}  // namespace flapline::io
