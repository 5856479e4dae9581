#include "report/document/values.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

class Values {
 public:
  explicit Values(const Document& doc) : doc_(doc) {}

  json run() {
    const auto& h = doc_.header;
    section_ = "Header";
    add("Laboratory", h.lab_name);
    for (const auto& a : h.address_lines) add("Address", a);
    add("Accreditation", h.accreditation);
    add("Title", h.title);
    add("Certificate No.", h.number);
    add("Status", h.status);
    add("Issued", h.issued);
    add("Mark", h.watermark);
    for (const auto& b : doc_.blocks) std::visit([this](const auto& x) { block(x); }, b);
    section_ = "Footer";
    add("Footer", doc_.footer);
    return out_;
  }

 private:
  void add(const std::string& label, const std::string& value) {
    if (!value.empty()) out_.push_back({{"section", section_}, {"label", label}, {"value", value}});
  }
  void block(const Heading& h) { section_ = h.text; }
  void block(const KeyValues& kv) {
    for (const auto& [k, v] : kv.rows) add(k, v);
  }
  void block(const Table& t) {
    for (const auto& r : t.rows)
      for (std::size_t i = 0; i < r.size(); ++i)
        add((i < t.headers.size() ? t.headers[i] : std::string("column")) + (i && !r.empty() ? ", " + r[0] : ""), r[i]);
  }
  void block(const Paragraph& p) { add("Statement", p.text); }
  void block(const VerdictBox& v) {
    add("Verdict", v.verdict);
    add("Verdict detail", v.detail);
  }
  void block(const ChartBlock& c) { add("Chart", c.spec.title); }
  void block(const Signatures& s) {
    for (const auto& p : s.people) {
      add(p.role, p.name);
      add(p.role + ", function", p.function);
      add(p.role + ", meaning", p.meaning);
      add(p.role + ", signed at", p.signed_at);
    }
  }

  const Document& doc_;
  std::string section_;
  json out_ = json::array();
};

}  // namespace

json document_values(const Document& doc) {
  return Values(doc).run();
}

}  // namespace plumb::report
