// Text pieces of the report: strings made safe for HTML and SVG (which the report writes as
// well-formed XML). Numbers come from upright/base/number_text.hpp, NaN as nothing
// (NanAs::kEmpty), so the same inputs always give the same bytes.
#pragma once

#include <string>
#include <string_view>

namespace upright::runner::internal {

// `text` with & < > " ' replaced by entity references, for element content and attribute values.
std::string Escape(std::string_view text);

}  // namespace upright::runner::internal
