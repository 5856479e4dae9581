#include "report/json_text.hpp"

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

JsonText& JsonText::object() {
  separate();
  out_ += '{';
  open_.push_back('{');
  first_ = true;
  return *this;
}

JsonText& JsonText::array() {
  separate();
  out_ += '[';
  open_.push_back('[');
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
  const std::size_t from = out_.size();
  fmt::format_to(std::back_inserter(out_), "{}", number);  // shortest round-trip form
  if (out_.find_first_of(".e", from) == std::string::npos) out_ += ".0";  // still a float when read back
  return *this;
}

JsonText& JsonText::value(long long integer) {
  separate();
  fmt::format_to(std::back_inserter(out_), "{}", integer);
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
