#pragma once
// The text a reader sees in a rendering, for comparing renderings of one document: HTML without its markup, a
// PDF through poppler's pdftotext, any text without its white space (line breaks differ between renderings).
#include <cctype>
#include <cstdio>
#include <filesystem>
#include <regex>
#include <string>
#include <utility>
#include <vector>

namespace plumb::test {

inline std::string without_spaces(const std::string& s) {
  std::string out;
  for (char c : s)
    if (!std::isspace(static_cast<unsigned char>(c))) out += c;
  return out;
}

/// The text of an HTML page: style sheet and tags dropped, the five entities plumb writes decoded.
inline std::string html_text(std::string html) {
  html = std::regex_replace(html, std::regex("<style>[^]*?</style>"), " ");
  html = std::regex_replace(html, std::regex("<[^>]*>"), " ");
  for (const auto& [entity, c] : std::vector<std::pair<std::string, std::string>>{
           {"&lt;", "<"}, {"&gt;", ">"}, {"&quot;", "\""}, {"&#39;", "'"}, {"&amp;", "&"}}) {
    for (std::size_t at = html.find(entity); at != std::string::npos; at = html.find(entity, at + c.size()))
      html.replace(at, entity.size(), c);
  }
  return html;
}

inline bool have_pdftotext() {
  return std::system("pdftotext -v >/dev/null 2>&1") == 0;
}

/// `pdftotext -raw` of a PDF file (empty when it cannot be read).
inline std::string pdf_text(const std::filesystem::path& pdf) {
  std::string text;
  if (FILE* p = popen(("pdftotext -raw '" + pdf.string() + "' - 2>/dev/null").c_str(), "r")) {
    char buf[4096];
    std::size_t n;
    while ((n = fread(buf, 1, sizeof buf, p)) > 0) text.append(buf, n);
    pclose(p);
  }
  return text;
}

}  // namespace plumb::test
