#include "scenario_reading.hpp"

#include <array>
#include <charconv>
#include <cmath>
#include <filesystem>
#include <system_error>

#include "upright/base/number_text.hpp"

namespace upright::runner::internal {

void ReadContext::Error(const model::XmlElement& element, const std::string& message) const {
  doc->AddError(element.line(), element.label() + ": " + message);
}

void ReadContext::FieldError(const model::XmlElement& element, std::string_view attribute,
                             const std::string& value, const std::string& rule) const {
  doc->AddError(element.line(),
                element.label() + " " + std::string(attribute) + " = " + value + ": " + rule);
}

std::string ReadContext::Robot() const {
  return "robot '" + (model != nullptr ? model->name : std::string()) + "' (" + model_file + ")";
}

double RequiredNumber(model::XmlElement& element, std::string_view attribute, bool* ok) {
  const std::optional<double> value = element.Double(attribute, model::Presence::kRequired);
  if (!value) {
    *ok = false;
    return 0;
  }
  return *value;
}

double OptionalNumber(model::XmlElement& element, std::string_view attribute, double fallback,
                      bool* ok) {
  if (!element.Has(attribute)) return fallback;
  const std::optional<double> value = element.Double(attribute, model::Presence::kOptional);
  if (!value) {
    *ok = false;
    return fallback;
  }
  return *value;
}

bool OptionalBool(model::XmlElement& element, std::string_view attribute, bool fallback, bool* ok) {
  static constexpr std::array<std::string_view, 2> kBool = {"false", "true"};
  if (!element.Has(attribute)) return fallback;
  const std::optional<std::size_t> choice =
      element.Choice(attribute, kBool, model::Presence::kOptional);
  if (!choice) {
    *ok = false;
    return fallback;
  }
  return *choice == 1;
}

std::string Num(double value) { return WholeOrShortestText(value); }

std::string Approx(double value) { return SignificantText(value, 6); }

std::string Quote(std::string_view text) {
  std::string quoted;
  quoted.reserve(text.size() + 2);
  quoted.append(1, '\'').append(text).append(1, '\'');
  return quoted;
}

std::string ResolvePath(const std::string& base_dir, const std::string& file) {
  const std::filesystem::path given(file);
  if (given.is_absolute() || base_dir.empty()) return file;
  return (std::filesystem::path(base_dir) / given).string();
}

bool IsSafeName(std::string_view name) {
  if (name.empty() || name == "." || name == "..") return false;
  for (const char c : name) {
    const bool allowed = (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') ||
                         (c >= '0' && c <= '9') || c == '.' || c == '_' || c == '-';
    if (!allowed) return false;
  }
  return true;
}

std::optional<double> ReadEventStart(model::XmlElement& event, const ReadContext& context) {
  const std::optional<double> at_s = event.Double("at_s", model::Presence::kRequired);
  if (!at_s) return std::nullopt;
  if (!context.duration_s) {
    if (*at_s >= 0) return at_s;
    context.FieldError(event, "at_s", Num(*at_s), "must be >= 0");
    return std::nullopt;
  }
  if (*at_s >= 0 && *at_s < *context.duration_s) return at_s;
  context.FieldError(
      event, "at_s", Num(*at_s),
      "must be in [0, " + Num(*context.duration_s) + ") (the scenario's duration_s)");
  return std::nullopt;
}

}  // namespace upright::runner::internal
