#include "report/chart/drawing.hpp"

namespace plumb::report {
namespace {

bool utf8_continuation(char c) {
  return (static_cast<unsigned char>(c) & 0xC0U) == 0x80U;
}

// A word wider than the line is cut at the last character boundary that still fits (at least one character).
void break_long_word(const TextMeasure& m, std::string_view word, const FontSpec& f, double wrap,
                     std::vector<std::string>& out) {
  while (!word.empty()) {
    std::size_t cut = 0;
    for (std::size_t i = 1; i <= word.size(); ++i) {
      if (i < word.size() && utf8_continuation(word[i])) continue;
      if (cut > 0 && m.width(word.substr(0, i), f) > wrap) break;
      cut = i;
    }
    out.emplace_back(word.substr(0, cut));
    word.remove_prefix(cut);
  }
}

void wrap_paragraph(const TextMeasure& m, std::string_view para, const FontSpec& f, double wrap,
                    std::vector<std::string>& out) {
  if (wrap <= 0 || m.width(para, f) <= wrap) {
    out.emplace_back(para);
    return;
  }
  std::string line;
  std::size_t pos = 0;
  while (pos <= para.size()) {
    const std::size_t space = para.find(' ', pos);
    const std::string_view word = para.substr(pos, space == std::string_view::npos ? para.size() - pos : space - pos);
    const std::string candidate = line.empty() ? std::string(word) : line + " " + std::string(word);
    if (m.width(candidate, f) <= wrap) {
      line = candidate;
    } else {
      if (!line.empty()) out.push_back(line);
      line.clear();
      if (m.width(word, f) <= wrap) {
        line = std::string(word);
      } else {
        std::vector<std::string> pieces;
        break_long_word(m, word, f, wrap, pieces);
        line = pieces.back();
        pieces.pop_back();
        out.insert(out.end(), pieces.begin(), pieces.end());
      }
    }
    if (space == std::string_view::npos) break;
    pos = space + 1;
  }
  if (!line.empty()) out.push_back(line);
}

}  // namespace

std::vector<std::string> wrap_text(const TextMeasure& measure, std::string_view text, const FontSpec& font,
                                   double wrap) {
  std::vector<std::string> out;
  std::size_t pos = 0;
  while (true) {
    const std::size_t nl = text.find('\n', pos);
    wrap_paragraph(measure, text.substr(pos, nl == std::string_view::npos ? text.size() - pos : nl - pos), font, wrap,
                   out);
    if (nl == std::string_view::npos) break;
    pos = nl + 1;
  }
  return out;
}

}  // namespace plumb::report
