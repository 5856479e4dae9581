#pragma once
// A JSON object written straight to text, for results a batch import stores once per run: building an
// nlohmann::json object (a map node and a key string per member) and then dumping it cost more than the
// statistics it records. Parsed back, the text equals the nlohmann object built from the same values; the
// caller gives keys in sorted order, which is also how nlohmann writes them, so the stored text has the
// same shape whichever way it was made.
#include <string>
#include <string_view>
#include <vector>

namespace plumb::report {

class JsonText {
public:
  explicit JsonText(std::string& out) : out_(out) {}

  /// Opens an object ("{") or an array ("[") as the next value; close with end().
  JsonText& object() { return open('{'); }
  JsonText& array() { return open('['); }
  JsonText& end();
  /// The next member's key (objects only; keys in sorted order).
  JsonText& key(std::string_view k);

  JsonText& value(std::string_view text);
  JsonText& value(const char* text) { return value(std::string_view(text)); }
  /// Shortest text that reads back as the same double; integral values keep a ".0" and a non-finite value is
  /// null, as nlohmann writes them.
  JsonText& value(double number);
  JsonText& value(long long integer);
  JsonText& value(bool flag);
  JsonText& null();
  JsonText& strings(const std::vector<std::string>& texts);

private:
  JsonText& open(char bracket);
  void separate();
  std::string& out_;
  std::vector<char> open_;  ///< '{' or '[' per open level
  bool first_ = true;       ///< no member yet in the innermost level
  bool after_key_ = false;  ///< a key was written; its value comes next
};

}  // namespace plumb::report
