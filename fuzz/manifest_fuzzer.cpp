// libFuzzer target: any bytes as a results folder's manifest.json, through the report's JSON
// parser (strict RFC 8259, nesting limited) and its reading of the manifest's fields.
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "manifest_info.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  (void)upright::runner::internal::ParseManifest(text, "manifest.json");
  return 0;
}
