#pragma once
// Lays a Document out on A4 pages and writes PDF with cairo (pango for text): the header on every page
// (full on the first, one line after), tables split between rows with their header repeated, other
// blocks kept whole, and "number, page x of y" in the footer of every page.
#include <string>
#include <vector>

#include "report/document/document.hpp"

namespace plumb::report {

struct RenderedPdf {
  std::string bytes;
  int pages = 0;
  std::vector<std::string> warnings;  ///< e.g. a logo that could not be read (the PDF is drawn without it)
};

RenderedPdf render_pdf(const Document& doc);

}  // namespace plumb::report
