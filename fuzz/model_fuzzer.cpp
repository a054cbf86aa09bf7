// libFuzzer target: any bytes as a robot model file. The reader must refuse what it cannot read
// with its errors and never crash, hang or read out of bounds (AddressSanitizer and
// UndefinedBehaviorSanitizer watch it); a model it accepts must also pass ValidateModel.
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "upright/model/model_file.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const auto loaded = upright::model::ParseModelText(text, "fuzz.xml");
  if (loaded && !upright::model::ValidateModel(*loaded)) std::abort();
  if (!loaded) {
    for (const auto& e : loaded.error()) (void)e.ToString();
  }
  return 0;
}
