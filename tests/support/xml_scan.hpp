#pragma once
// A minimal reader of the elements in plumb's chart SVG, enough to assert on them: finds every element
// with a given name and returns its attributes and its text. Header-only so it needs no build change;
// not a general XML parser (no CDATA, no comments inside the searched elements).
#include <map>
#include <string>
#include <vector>

namespace plumb::test {

struct XmlElement {
  std::map<std::string, std::string> attributes;
  std::string text;
  [[nodiscard]] std::string attr(const std::string& k) const {
    auto it = attributes.find(k);
    return it == attributes.end() ? std::string() : it->second;
  }
};

inline std::string xml_unescape(std::string s) {
  const std::pair<const char*, const char*> entities[] = {
      {"&lt;", "<"}, {"&gt;", ">"}, {"&quot;", "\""}, {"&apos;", "'"}, {"&amp;", "&"}};
  for (const auto& [from, to] : entities) {
    for (auto p = s.find(from); p != std::string::npos; p = s.find(from, p + 1)) s.replace(p, std::string(from).size(), to);
  }
  return s;
}

inline std::vector<XmlElement> xml_elements(const std::string& xml, const std::string& name) {
  std::vector<XmlElement> out;
  const std::string open = "<" + name;
  for (auto p = xml.find(open); p != std::string::npos; p = xml.find(open, p + 1)) {
    const char next = xml[p + open.size()];
    if (next != ' ' && next != '>' && next != '/' && next != '\n') continue;
    XmlElement e;
    std::size_t i = p + open.size();
    while (i < xml.size() && xml[i] != '>' && !(xml[i] == '/' && xml[i + 1] == '>')) {
      if (xml[i] == ' ' || xml[i] == '\n') {
        ++i;
        continue;
      }
      const auto eq = xml.find('=', i);
      const auto q1 = xml.find('"', eq);
      const auto q2 = xml.find('"', q1 + 1);
      e.attributes[xml.substr(i, eq - i)] = xml_unescape(xml.substr(q1 + 1, q2 - q1 - 1));
      i = q2 + 1;
    }
    if (xml[i] == '>') {
      const auto close = xml.find("</" + name + ">", i);
      e.text = xml_unescape(xml.substr(i + 1, close - i - 1));
    }
    out.push_back(std::move(e));
  }
  return out;
}

inline std::size_t count_of(const std::string& haystack, const std::string& needle) {
  std::size_t n = 0;
  for (auto p = haystack.find(needle); p != std::string::npos; p = haystack.find(needle, p + 1)) ++n;
  return n;
}

}  // namespace plumb::test
