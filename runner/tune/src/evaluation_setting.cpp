#include "evaluation_setting.hpp"

#include <algorithm>
#include <filesystem>
#include <utility>

#include "upright/base/number_text.hpp"
#include "upright/runner/common/text_format.hpp"

namespace upright::runner::internal {

std::string Where(const std::string& path, int line) {
  if (path.empty()) return "";
  return line > 0 ? path + ":" + std::to_string(line) + ": " : path + ": ";
}

std::string ValueText(double value) { return ShortestText(value); }

ControllerEntry WithValues(ControllerEntry entry, const std::vector<Knob>& knobs,
                           const std::vector<double>& values) {
  for (std::size_t k = 0; k < knobs.size(); ++k) {
    const std::string text = ValueText(values[k]);
    auto it = std::find_if(entry.config.begin(), entry.config.end(),
                           [&](const auto& kv) { return kv.first == knobs[k].setting; });
    if (it != entry.config.end()) {
      it->second = text;
    } else {
      entry.config.emplace_back(knobs[k].setting, text);
    }
  }
  return entry;
}

Scenario EvaluationScenario(const Scenario& scenario, std::size_t entry,
                            const std::vector<Knob>& knobs, const std::vector<double>& values) {
  Scenario one = scenario;
  ControllerEntry controller = scenario.controllers[entry];
  if (!values.empty()) controller = WithValues(std::move(controller), knobs, values);
  one.controllers = {std::move(controller)};
  one.baseline = 0;
  one.dispersions.clear();
  return one;
}

std::string ControllerElement(const ControllerEntry& entry) {
  // A module file by its absolute path, so the element reads the same from any scenario folder.
  const std::string module =
      entry.builtin ? entry.module : std::filesystem::absolute(entry.module).string();
  std::string xml = "<controller name=\"" + XmlEscaped(entry.name) + "\" " +
                    (entry.builtin ? "builtin" : "file") + "=\"" + XmlEscaped(module) + "\"";
  if (entry.rate_hz > 0) xml += " rate_hz=\"" + ShortestText(entry.rate_hz) + "\"";
  if (entry.true_state) xml += " true_state=\"true\"";
  if (entry.config.empty()) return xml + "/>";
  xml += ">\n";
  for (const auto& [key, value] : entry.config) {
    xml += "  <setting key=\"" + XmlEscaped(key) + "\" value=\"" + XmlEscaped(value) + "\"/>\n";
  }
  return xml + "</controller>";
}

}  // namespace upright::runner::internal
