// The Recorder writes audit records' canonical JSON by hand for speed; the hash chain is only verifiable if
// that text is byte for byte what nlohmann::json::dump() writes for the same record (the form `audit verify`
// rebuilds). The oracle here is nlohmann::json itself.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include "store/audit_trail.hpp"
#include "store/canonical_json.hpp"
#include "store/recorder.hpp"

using namespace plumb;
using nlohmann::json;

namespace {

const std::vector<std::string> awkward_texts = {
    "",
    "plain text",
    "quote \" and backslash \\ and slash /",
    "tab\there, newline\nthere, return\r, form feed\f, backspace\b",
    "control \x01 and \x1f and DEL \x7f",
    "UTF-8: 20 \xc2\xb0""C, \xce\xbc""g, \xe2\x80\x94 dash, \xf0\x9f\x98\x80",
    R"({"check_runs":[{"id":1,"results_json":{"sha256":"ab"}}]})",
};

}  // namespace

TEST_CASE("hand-written JSON strings equal nlohmann::json::dump()", "[audit][json]") {
  for (const auto& text : awkward_texts) {
    INFO(text);
    std::string out;
    store::append_json_string(out, text);
    CHECK(out == json(text).dump());
  }
  std::string out;
  store::append_json_value(out, store::Value(std::int64_t{-9007199254740993}));
  CHECK(out == json(std::int64_t{-9007199254740993}).dump());
  out.clear();
  store::append_json_value(out, store::Value());
  CHECK(out == "null");
}

TEST_CASE("a text that is not UTF-8 is refused as nlohmann::json refuses it", "[audit][json]") {
  std::string out;
  CHECK_THROWS_AS(store::append_json_string(out, "bad \xff byte"), json::type_error);
}

TEST_CASE("the Recorder's canonical audit text is the dump of the record audit verify rebuilds", "[audit][json]") {
  for (std::size_t i = 0; i < awkward_texts.size(); ++i) {
    store::AuditRecord r;
    r.seq = static_cast<std::int64_t>(i) + 1;
    r.at = "2026-12-02T04:00:00Z";
    r.os_user = awkward_texts[(i + 1) % awkward_texts.size()];
    r.actor = awkward_texts[i];
    r.action = i % 2 ? "insert" : "insert rows";
    r.table_name = "check_runs";
    r.row_key = "id=" + std::to_string(i);
    r.after_json = awkward_texts[(i + 2) % awkward_texts.size()];
    if (i % 3 == 0) r.reason = awkward_texts[(i + 3) % awkward_texts.size()];
    store::AuditContent c;
    c.seq = r.seq;
    c.at = r.at;
    c.os_user = r.os_user;
    c.actor = r.actor;
    c.action = r.action;
    c.table_name = r.table_name;
    c.row_key = r.row_key;
    c.after_json = &*r.after_json;
    c.reason = r.reason ? &*r.reason : nullptr;
    INFO("record " << i);
    CHECK(store::canonical_audit_json(c) == r.hashed_content().dump());
  }
}
