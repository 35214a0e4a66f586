#pragma once
/// \file
/// The full resolved configuration of a run: every key of the config grammar (configs/README.md)
/// with the value the run used — defaults filled in, a table file's rows inline, a flight
/// condition resolved into the body's velocity and rates — as JSON (summary.json's
/// `configuration`) and as YAML (resolved.yaml). Loading resolved.yaml gives the same case bit
/// for bit: a value typed in degrees is written as the shortest decimal that converts back to
/// the same double.

#include <nlohmann/json.hpp>
#include <string>

#include "flapline/case/model.hpp"

namespace flapline::io {

nlohmann::ordered_json resolved_configuration(const Model& model);

/// The same tree as YAML, block style, with a header comment.
std::string resolved_yaml(const Model& model);

}  // namespace flapline::io
