// ridgecal report: escaping of user-supplied text for HTML and inline SVG.
#pragma once

#include <string>
#include <string_view>

namespace ridgecal::report {

/// Escape text for HTML/XML element content and quoted attribute values.
///  - & < > " ' become character references, so markup in names is shown literally;
///  - control characters become visible, so a reviewer sees that a name holds
///    one: a newline shows as U+21B5 (a return arrow), a tab as U+21E5, and any
///    other C0 control or DEL as "[U+000D]"-style ASCII text;
///  - C1 controls, and bytes that are not valid UTF-8, become U+FFFD;
///  - all other UTF-8 text (non-ASCII names, units such as degrees) is kept.
/// The result is valid UTF-8 and valid XML 1.0 character data.
std::string html_escape(std::string_view text);

/// True when `text` is well-formed UTF-8 (no overlongs, no surrogates).
bool is_valid_utf8(std::string_view text);

}  // namespace ridgecal::report
