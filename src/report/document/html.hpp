#pragma once
// A Document as one self-contained HTML page (styles inline, charts as inline SVG, nothing fetched): the same
// header, blocks and signatures as the PDF and the text, for a browser or an e-mail to a customer. A draft or
// withdrawn certificate carries its mark across the page on screen and in print.
#include <string>

#include "report/document/document.hpp"

namespace plumb::report {

std::string render_html(const Document& doc);

}  // namespace plumb::report
