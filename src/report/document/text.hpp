#pragma once
// A Document as plain text, 78 columns: the same header, blocks and signatures as the PDF, so the text
// certificate says exactly what the PDF says. Charts, which text cannot draw, are named with their notes.
#include <string>

#include "report/document/document.hpp"

namespace plumb::report {

std::string render_text(const Document& doc);

/// Display columns of UTF-8 text (one per code point: plumb prints no wide characters).
std::size_t text_columns(const std::string& s);

}  // namespace plumb::report
