// libFuzzer entry point for the config loader (tools/fuzz; tests/fuzz/README.md).
#include <unistd.h>

#include <cstdint>
#include <filesystem>
#include <string>

#include "fuzz_input.hpp"

namespace {
/// A folder of this process for the table file.
const std::string& scratch_dir() {
  static const std::string dir = [] {
    const auto p =
        std::filesystem::temp_directory_path() / ("flapline_fuzz_" + std::to_string(::getpid()));
    std::filesystem::create_directories(p);
    return p.string();
  }();
  return dir;
}
}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const flapline::fuzz::Input input = flapline::fuzz::split(data, size);
  flapline::fuzz::load(input, scratch_dir());
  return 0;
}
