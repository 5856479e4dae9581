// The Recorder writes audit records' canonical JSON by hand for speed; the hash chain is only verifiable if
// that text is byte for byte what nlohmann::json::dump() writes for the same record (the form `audit verify`
// rebuilds). The oracle here is nlohmann::json itself.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>
#include <thread>

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
    // Split literals end the hex escapes before the letters that follow them.
    "UTF-8: 20 \xc2\xb0""C, \xce\xbc""g, \xe2\x80\x94 dash, \xf0\x9f\x98\x80",  // NOLINT(bugprone-suspicious-missing-comma)
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

TEST_CASE("SHA-256 of the FIPS 180-2 test messages, repeatedly and from two threads", "[canonical_json]") {
  // Digests from FIPS 180-2, appendix B (one-block and two-block messages) and of the empty message.
  const auto check_all = [] {
    bool all = true;
    for (int i = 0; i < 100; ++i)
      all = all && store::sha256_hex("abc") == "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad" &&
            store::sha256_hex("abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq") ==
                "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1" &&
            store::sha256_hex("") == "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855";
    return all;
  };
  bool other_thread = false;
  std::thread t([&] { other_thread = check_all(); });
  const bool this_thread = check_all();
  t.join();
  CHECK(this_thread);
  CHECK(other_thread);
}

TEST_CASE("every special byte at every place of a word-sized scan equals nlohmann::json::dump()", "[audit][json]") {
  // The escaping scans eight bytes at a time; a special byte in any lane, or two in one word, must be found.
  std::vector<std::string> specials;
  specials.reserve(39);
  for (int b = 0; b < 0x20; ++b) specials.emplace_back(1, static_cast<char>(b));
  for (const char* s : {"\"", "\\", "\x7f", "\xc3\xa9", "\xe2\x82\xac", "\"\\", "\\\""}) specials.emplace_back(s);
  long long compared = 0, equal = 0;
  for (const auto& special : specials)
    for (std::size_t at = 0; at <= 24; ++at)
      for (const std::size_t length : {std::size_t{24}, std::size_t{31}}) {
        std::string text(length, 'a');
        for (std::size_t k = 0; k < length; ++k) text[k] = static_cast<char>('A' + k % 26);
        text.insert(std::min(at, text.size()), special);
        if (at % 5 == 0) text += special;  // a second one further on
        std::string out;
        store::append_json_string(out, text);
        ++compared;
        if (out == json(text).dump()) ++equal;
      }
  CHECK(compared == 39LL * 25 * 2);
  CHECK(equal == compared);
}
