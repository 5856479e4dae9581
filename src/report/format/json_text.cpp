#include "report/format/json_text.hpp"

#include <fmt/format.h>

#include <cmath>

#include "store/canonical_json.hpp"

namespace plumb::report {

void JsonText::separate() {
  if (after_key_) {
    after_key_ = false;
    return;
  }
  if (!first_) out_ += ',';
  first_ = false;
}

JsonText& JsonText::open(char bracket) {
  separate();
  out_ += bracket;
  open_.push_back(bracket);
  first_ = true;
  return *this;
}

JsonText& JsonText::end() {
  out_ += open_.back() == '{' ? '}' : ']';
  open_.pop_back();
  first_ = false;
  return *this;
}

JsonText& JsonText::key(std::string_view k) {
  separate();
  store::append_json_string(out_, k);
  out_ += ':';
  after_key_ = true;
  return *this;
}

JsonText& JsonText::value(std::string_view text) {
  separate();
  store::append_json_string(out_, text);
  return *this;
}

JsonText& JsonText::value(double number) {
  separate();
  if (!std::isfinite(number)) {
    out_ += "null";
    return *this;
  }
  char digits[40];
  // The shortest form that reads back as the same double.
  const std::string_view text(digits, static_cast<std::size_t>(fmt::format_to(digits, "{}", number) - digits));
  out_ += text;
  if (text.find_first_of(".e") == std::string_view::npos) out_ += ".0";  // still a float when read back
  return *this;
}

JsonText& JsonText::value(long long integer) {
  separate();
  store::append_json_integer(out_, integer);
  return *this;
}

JsonText& JsonText::value(bool flag) {
  separate();
  out_ += flag ? "true" : "false";
  return *this;
}

JsonText& JsonText::null() {
  separate();
  out_ += "null";
  return *this;
}

JsonText& JsonText::strings(const std::vector<std::string>& texts) {
  array();
  for (const auto& t : texts) value(std::string_view(t));
  return end();
}

}  // namespace plumb::report
