#pragma once
// A row to insert: column -> exact value (an integer, a text or NULL). plumb stores no floating point, so
// these three are all a column can hold; a value is stored and recorded in the trail exactly as given.
// A double (or an optional one) does not compile into a Value: an exact value is written as decimal TEXT
// (Decimal::to_string, ExactMass::in_grams().to_string()), never through binary floating point.
#include <concepts>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <type_traits>
#include <vector>

namespace plumb::store {

class Value {
public:
  enum class Kind { null, integer, text };

  Value() = default;
  Value(std::nullptr_t) {}  // NOLINT(google-explicit-constructor): rows are written as {"column", value} lists
  template <class I, std::enable_if_t<std::is_integral_v<I> && std::is_signed_v<I>, int> = 0>
  Value(I v) : kind_(Kind::integer), integer_(static_cast<std::int64_t>(v)) {}  // NOLINT(google-explicit-constructor)
  Value(std::string v) : kind_(Kind::text), text_(std::move(v)) {}     // NOLINT(google-explicit-constructor)
  Value(const char* v) : kind_(Kind::text), text_(v) {}                // NOLINT(google-explicit-constructor)
  Value(std::string_view v) : kind_(Kind::text), text_(v) {}           // NOLINT(google-explicit-constructor)
  template <std::floating_point F>
  Value(F) = delete;  // exact values are decimal TEXT; see the file comment
  template <class T, std::enable_if_t<std::is_constructible_v<Value, const T&>, int> = 0>
  Value(const std::optional<T>& v) : Value(v ? Value(*v) : Value()) {}  // NOLINT(google-explicit-constructor)

  [[nodiscard]] Kind kind() const { return kind_; }
  [[nodiscard]] bool is_null() const { return kind_ == Kind::null; }
  [[nodiscard]] std::int64_t integer() const { return integer_; }
  [[nodiscard]] const std::string& text() const { return text_; }

private:
  Kind kind_ = Kind::null;
  std::int64_t integer_ = 0;
  std::string text_;
};

struct Field {
  std::string_view column;  ///< a column name (a string literal in plumb's code)
  Value value;
};

using Row = std::vector<Field>;

}  // namespace plumb::store
