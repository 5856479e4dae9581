// Untrusted XML (report/dcc/xml_input.hpp): the attacks a provider's file could carry are refused before any
// of its content is used: an external entity (XXE), entity expansion ("billion laughs"), an oversized file,
// and text that is not XML. The end-to-end XXE case, with a secret file beside it, is in
// tests/cli/weight_dcc_import_test.cpp.
#include <catch2/catch.hpp>

#include <string>

#include "core/errors.hpp"
#include "report/dcc/xml_input.hpp"

namespace dcc = plumb::report::dcc;
using Catch::Matchers::Contains;

TEST_CASE("untrusted XML: a DOCTYPE is refused, with its line, whatever it declares", "[dcc][security]") {
  const std::string xxe =
      "<?xml version=\"1.0\"?>\n<!DOCTYPE r [<!ENTITY x SYSTEM \"file:///etc/passwd\">]>\n<r>&x;</r>\n";
  CHECK_THROWS_WITH(dcc::parse_untrusted_xml(xxe, "--from-dcc f.xml"),
                    Contains("--from-dcc f.xml line 2") && Contains("DOCTYPE"));
  // Nested internal entities, each ten of the one before: 10^9 "a" if expanded. Refused without expanding, by
  // libxml2's own entity checks or by the DOCTYPE rule, either way before plumb reads a value.
  std::string laughs = "<?xml version=\"1.0\"?>\n<!DOCTYPE r [<!ENTITY e0 \"aaaaaaaaaa\">";
  for (int level = 1; level <= 9; ++level) {
    laughs += "<!ENTITY e" + std::to_string(level) + " \"";
    for (int i = 0; i < 10; ++i) laughs += "&e" + std::to_string(level - 1) + ";";
    laughs += "\">";
  }
  laughs += "]>\n<r>&e9;</r>\n";
  CHECK_THROWS_AS(dcc::parse_untrusted_xml(laughs, "f.xml"), plumb::InputError);
}

TEST_CASE("untrusted XML: too large, or not XML, is refused in one sentence", "[dcc][security]") {
  std::string big = "<r>" + std::string(dcc::max_xml_bytes, 'a') + "</r>";
  CHECK_THROWS_WITH(dcc::parse_untrusted_xml(big, "f.xml"), Contains("larger than 4 MiB"));
  CHECK_THROWS_WITH(dcc::parse_untrusted_xml("a,b\n1,2\n", "f.xml"),
                    Contains("not well-formed XML") && Contains("line 1"));
  CHECK_THROWS_WITH(dcc::parse_untrusted_xml("<r>\n<open>\n</r>", "f.xml"), Contains("line 3"));
  CHECK_THROWS_AS(dcc::parse_untrusted_xml("", "f.xml"), plumb::InputError);
}

TEST_CASE("untrusted XML: an ordinary document parses", "[dcc]") {
  const auto doc = dcc::parse_untrusted_xml("<?xml version=\"1.0\"?>\n<r a=\"1\"><s>text</s></r>\n", "f.xml");
  REQUIRE(doc);
  CHECK(std::string(reinterpret_cast<const char*>(xmlDocGetRootElement(doc.get())->name)) == "r");
}
