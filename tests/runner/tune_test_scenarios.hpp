// The scenario the tune tests play: a parked courier (the demo robot) shoved once for 2.5 s, with
// the controllers and seeds a test names.
#pragma once

#include <string>

namespace upright::runner::testing {

inline bool Contains(const std::string& text, const std::string& part) {
  return text.find(part) != std::string::npos;
}

// The scenario text with `controllers` (<controller> elements) and `seeds` ("1 2").
inline std::string ShoveText(const std::string& controllers, const std::string& seeds = "1",
                             const std::string& baseline = "") {
  return R"(<scenario name="shove" schema="1" duration_s="2.5">
  <description>Test: a parked courier shoved once.</description>
  <robot file="../models/courier.xml"/>
  <timeline>
    <push at_s="0.5" shape="half-sine" peak_N="160" duration_s="0.3" height_m="0.45"/>
  </timeline>
  <controllers)" +
         (baseline.empty() ? std::string() : " baseline=\"" + baseline + "\"") + ">" + controllers +
         R"(</controllers>
  <seeds list=")" +
         seeds +
         R"("/>
</scenario>)";
}

inline constexpr const char* kAllFour = R"(<controller name="lqr" builtin="lqr"/>
    <controller name="hinf" builtin="hinf"/>
    <controller name="lqg" builtin="lqg"/>
    <controller name="pid" builtin="pid"/>)";

}  // namespace upright::runner::testing
