// approx_guard PATH...: fails (exit 1) when a test compares with Catch's Approx without stating its margin.
//
// Catch's default Approx is relative 1.2e-5 (+-1.2 mg at 100 g): a check written Approx(x) passes answers
// that are wrong by far more than a balance resolves. Every Approx(...) must therefore be followed, in the
// same expression, by .epsilon(...) or by .margin(...) together with .epsilon(...); a margin alone is not
// enough because the default epsilon still applies beside it (Approx(998.2).margin(1e-5) accepts 998.21).
// Masses, volumes and percentages use tests/support/margin.hpp instead.
//
// PATH is a file, or a directory searched for *.cpp and *.hpp. Each offence is printed as "file:line: ...".
// Comments and string literals are skipped, so prose about the default does not count.
#include <algorithm>
#include <cctype>
#include <filesystem>
#include <fstream>
#include <iostream>
#include <sstream>
#include <string>
#include <vector>

namespace fs = std::filesystem;

namespace {

/// The source with comments and string/character literals blanked out (newlines kept for line numbers).
std::string code_only(const std::string& s) {
  std::string out = s;
  enum { code, line_comment, block_comment, string_lit, char_lit, raw_lit } state = code;
  std::string raw_end;
  for (std::size_t i = 0; i < s.size(); ++i) {
    const char c = s[i], next = i + 1 < s.size() ? s[i + 1] : '\0';
    const auto blank = [&](std::size_t k) {
      if (out[k] != '\n') out[k] = ' ';
    };
    switch (state) {
      case code:
        if (c == '/' && next == '/')
          state = line_comment, blank(i);
        else if (c == '/' && next == '*')
          state = block_comment, blank(i);
        else if (c == 'R' && next == '"' && (i == 0 || !std::isalnum(static_cast<unsigned char>(s[i - 1])))) {
          const std::size_t open = s.find('(', i + 2);
          if (open == std::string::npos) break;
          raw_end = ")" + s.substr(i + 2, open - i - 2) + "\"";
          for (std::size_t k = i; k <= open; ++k) blank(k);
          i = open;
          state = raw_lit;
        } else if (c == '"')
          state = string_lit, blank(i);
        else if (c == '\'' && !(i > 0 && std::isxdigit(static_cast<unsigned char>(s[i - 1]))))
          state = char_lit, blank(i);  // 1'000 digit separators are not literals
        break;
      case line_comment:
        if (c == '\n')
          state = code;
        else
          blank(i);
        break;
      case block_comment:
        blank(i);
        if (c == '*' && next == '/') blank(i + 1), ++i, state = code;
        break;
      case string_lit:
      case char_lit:
        blank(i);
        if (c == '\\')
          blank(i + 1), ++i;
        else if (c == (state == string_lit ? '"' : '\''))
          state = code;
        break;
      case raw_lit:
        if (s.compare(i, raw_end.size(), raw_end) == 0) {
          for (std::size_t k = i; k < i + raw_end.size(); ++k) blank(k);
          i += raw_end.size() - 1;
          state = code;
        } else {
          blank(i);
        }
        break;
    }
  }
  return out;
}

/// Index just past the parenthesis that closes the one at `open`, or npos.
std::size_t past_close(const std::string& s, std::size_t open) {
  int depth = 0;
  for (std::size_t i = open; i < s.size(); ++i) {
    if (s[i] == '(') ++depth;
    if (s[i] == ')' && --depth == 0) return i + 1;
  }
  return std::string::npos;
}

int line_of(const std::string& s, std::size_t pos) {
  int line = 1;
  for (std::size_t i = 0; i < pos; ++i) line += s[i] == '\n';
  return line;
}

/// The offences in one file, each as "path:line: reason".
std::vector<std::string> check_file(const fs::path& path) {
  std::ifstream in(path, std::ios::binary);
  std::stringstream buf;
  buf << in.rdbuf();
  const std::string code = code_only(buf.str());
  const std::string word = std::string("Appro") + "x(";  // split so this file does not match itself
  std::vector<std::string> found;
  for (std::size_t at = code.find(word); at != std::string::npos; at = code.find(word, at + 1)) {
    if (at > 0 && (std::isalnum(static_cast<unsigned char>(code[at - 1])) || code[at - 1] == '_')) continue;
    std::size_t i = past_close(code, at + word.size() - 1);
    bool margin = false, epsilon = false;
    // The member calls chained onto Approx(...): .margin(m), .epsilon(e), .scale(s), in any order.
    while (i != std::string::npos) {
      while (i < code.size() && std::isspace(static_cast<unsigned char>(code[i]))) ++i;
      if (i >= code.size() || code[i] != '.') break;
      std::size_t name_end = i + 1;
      while (name_end < code.size() &&
             (std::isalnum(static_cast<unsigned char>(code[name_end])) || code[name_end] == '_'))
        ++name_end;
      const std::string name = code.substr(i + 1, name_end - i - 1);
      if (name_end >= code.size() || code[name_end] != '(') break;
      margin = margin || name == "margin";
      epsilon = epsilon || name == "epsilon";
      i = past_close(code, name_end);
    }
    const std::string where = path.generic_string() + ":" + std::to_string(line_of(code, at)) + ": ";
    if (!margin && !epsilon)
      found.push_back(where +
                      "Approx(...) without .margin() or .epsilon(): Catch's default 1.2e-5 relative is "
                      "too loose; state the margin (tests/support/margin.hpp for masses, volumes and %)");
    else if (!epsilon)
      found.push_back(where +
                      "Approx(...).margin() without .epsilon(): the default 1.2e-5 relative epsilon still "
                      "applies beside the margin; add .epsilon(0) (or a stated epsilon)");
  }
  return found;
}

}  // namespace

int main(int argc, char** argv) {
  if (argc < 2) {
    std::cerr << "usage: approx_guard PATH...\n";
    return 2;
  }
  std::vector<fs::path> files;
  for (int a = 1; a < argc; ++a) {
    const fs::path p = argv[a];
    if (fs::is_directory(p)) {
      for (const auto& e : fs::recursive_directory_iterator(p))
        if (e.is_regular_file() && (e.path().extension() == ".cpp" || e.path().extension() == ".hpp"))
          files.push_back(e.path());
    } else if (fs::is_regular_file(p)) {
      files.push_back(p);
    } else {
      std::cerr << "approx_guard: " << p.string() << " is neither a file nor a directory\n";
      return 2;
    }
  }
  std::sort(files.begin(), files.end());
  std::size_t offences = 0;
  for (const auto& f : files)
    for (const auto& o : check_file(f)) {
      std::cout << o << "\n";
      ++offences;
    }
  std::cout << files.size() << " file(s) checked, " << offences << " Approx comparison(s) without a stated margin\n";
  return offences == 0 ? 0 : 1;
}
