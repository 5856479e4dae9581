#include "core/dates.hpp"

#include <fmt/format.h>

#include <charconv>
#include <chrono>
#include <ctime>

#include "core/errors.hpp"

namespace plumb {
namespace {

bool parse_int(std::string_view s, int& out) {
  if (s.empty()) return false;
  for (char c : s)
    if (c < '0' || c > '9') return false;
  auto [p, ec] = std::from_chars(s.data(), s.data() + s.size(), out);
  return ec == std::errc() && p == s.data() + s.size();
}

}  // namespace

Date parse_date(std::string_view text, std::string_view field) {
  int y = 0, m = 0, d = 0;
  const bool shaped = text.size() == 10 && text[4] == '-' && text[7] == '-' && parse_int(text.substr(0, 4), y) &&
                      parse_int(text.substr(5, 2), m) && parse_int(text.substr(8, 2), d);
  if (!shaped)
    throw InputError(fmt::format("{} \"{}\" is not a date in the form YYYY-MM-DD.", field, text));
  const Date ymd{date::year{y}, date::month{static_cast<unsigned>(m)}, date::day{static_cast<unsigned>(d)}};
  if (!ymd.ok() || y < 1900 || y > 2999)
    throw InputError(fmt::format("{} \"{}\" is not a valid calendar date.", field, text));
  return ymd;
}

std::string to_string(Date d) {
  // Written by hand for the years plumb accepts: the library's %F goes through an iostream and a locale,
  // which a batch import pays for several times per run. Other years keep the library's form.
  const int y = static_cast<int>(d.year());
  if (!d.ok() || y < 0 || y > 9999) return date::format("%F", date::sys_days{d});
  const unsigned m = static_cast<unsigned>(d.month()), day = static_cast<unsigned>(d.day());
  std::string out = "0000-00-00";
  out[0] = static_cast<char>('0' + y / 1000);
  out[1] = static_cast<char>('0' + y / 100 % 10);
  out[2] = static_cast<char>('0' + y / 10 % 10);
  out[3] = static_cast<char>('0' + y % 10);
  out[5] = static_cast<char>('0' + m / 10);
  out[6] = static_cast<char>('0' + m % 10);
  out[8] = static_cast<char>('0' + day / 10);
  out[9] = static_cast<char>('0' + day % 10);
  return out;
}

int days_between(Date a, Date b) {
  return static_cast<int>((date::sys_days{b} - date::sys_days{a}).count());
}

Date add_days(Date d, int days) { return Date{date::sys_days{d} + date::days{days}}; }

Date today_utc() { return Date{date::floor<date::days>(std::chrono::system_clock::now())}; }

Date today_local() {
  // The C library applies TZ and the system's zone rules; a bench date is the date on the wall of the lab.
  const std::time_t now = std::time(nullptr);
  std::tm local{};
  if (localtime_r(&now, &local) == nullptr) return today_utc();
  return Date{date::year{local.tm_year + 1900}, date::month{static_cast<unsigned>(local.tm_mon + 1)},
              date::day{static_cast<unsigned>(local.tm_mday)}};
}

Interval Interval::parse(std::string_view text, std::string_view field) {
  std::size_t digits = 0;
  while (digits < text.size() && text[digits] >= '0' && text[digits] <= '9') ++digits;
  int count = 0;
  const std::string_view unit = text.substr(digits);
  Interval i;
  if (digits == 0 || digits > 4 || !parse_int(text.substr(0, digits), count) || count < 1) {
    throw InputError(fmt::format("{} \"{}\" is not an interval (use a count and d, w, mo or y, e.g. 7d, 6mo).", field, text));
  }
  i.count = count;
  if (unit == "d") i.unit = Unit::day;
  else if (unit == "w") i.unit = Unit::week;
  else if (unit == "mo") i.unit = Unit::month;
  else if (unit == "y") i.unit = Unit::year;
  else
    throw InputError(fmt::format("{} \"{}\" is not an interval (use a count and d, w, mo or y, e.g. 7d, 6mo).", field, text));
  return i;
}

std::string Interval::to_string() const {
  switch (unit) {
    case Unit::day: return fmt::format("{}d", count);
    case Unit::week: return fmt::format("{}w", count);
    case Unit::month: return fmt::format("{}mo", count);
    case Unit::year: return fmt::format("{}y", count);
  }
  return {};
}

double Interval::approx_days() const {
  switch (unit) {
    case Unit::day: return count;
    case Unit::week: return 7.0 * count;
    case Unit::month: return 30.436875 * count;
    case Unit::year: return 365.2425 * count;
  }
  return 0;
}

Date add_interval(Date d, Interval i) {
  switch (i.unit) {
    case Interval::Unit::day: return add_days(d, i.count);
    case Interval::Unit::week: return add_days(d, 7 * i.count);
    case Interval::Unit::month:
    case Interval::Unit::year: {
      const auto months = date::months{i.unit == Interval::Unit::month ? i.count : 12 * i.count};
      Date r = d + months;
      if (!r.ok()) r = r.year() / r.month() / date::last;
      return r;
    }
  }
  return d;
}

}  // namespace plumb
