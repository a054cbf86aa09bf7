#include "html_text.hpp"

#include "upright/runner/common/text_format.hpp"

namespace upright::runner::internal {

std::string Escape(std::string_view text) { return XmlEscaped(text); }

}  // namespace upright::runner::internal
