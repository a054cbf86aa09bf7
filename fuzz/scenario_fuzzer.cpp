// libFuzzer target: any bytes as a scenario file, its relative paths resolved in the repository's
// scenarios/ folder (so a `<robot file="../models/courier.xml"/>` loads a real model). The reader
// must refuse what it cannot read with `path:line` errors and never crash, hang or read out of
// bounds.
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include "upright/runner/scenario/scenario_file.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  static const std::string dir = std::string(UPRIGHT_SOURCE_DIR) + "/scenarios";
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const upright::runner::ScenarioLoadResult loaded =
      upright::runner::ParseScenarioText(text, dir + "/fuzz.xml", dir);
  if (!loaded) {
    for (const auto& e : loaded.error()) (void)e.ToString();
  }
  return 0;
}
