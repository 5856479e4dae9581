// `weight recalibrate W --from-dcc FILE`: a reference weight's new certificate read from the DCC its
// calibration provider sent (the invented provider of tests/fixtures/dcc/provider_w100.xml), validated against
// the DCC 3.1.2 schema of shared/reference-data/dcc. The weight is W100 of the example lab (100 g, E2). The bad
// files, one each, are in tests/malformed/recalibrate_dcc_*.json.
#include <catch2/catch.hpp>

#include <fstream>
#include <nlohmann/json.hpp>
#include <sstream>

#include "support/dcc_xml.hpp"
#include "support/margin.hpp"
#include "support/paths.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::grams_near;
using plumb::test::run_plumb;
using plumb::test::ug;

namespace {

std::string provider_dcc() {
  std::ifstream in(plumb::test::source_dir() / "tests" / "fixtures" / "dcc" / "provider_w100.xml");
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

std::string replaced(std::string text, const std::string& from, const std::string& to) {
  const auto at = text.find(from);
  REQUIRE(at != std::string::npos);
  return text.replace(at, from.size(), to);
}

json certificate_named(const json& weight, const std::string& number) {
  for (const auto& c : weight["certificates"])
    if (c["certificate"] == number) return c;
  return json();
}

}  // namespace

TEST_CASE("weight recalibrate --from-dcc records the provider's certificate", "[cli][weights][dcc]") {
  const auto schema = plumb::test::dcc_schema_path();
  if (!schema) {
    WARN("skipped: the DCC schema of shared/reference-data/dcc was not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const std::string dcc = provider_dcc();
  // The fixture itself is a valid DCC (libxml2's own validation, not plumb's).
  auto fixture = plumb::test::parse_xml(dcc);
  REQUIRE(fixture);
  REQUIRE(plumb::test::validate_against(fixture.get(), *schema) == 0);
  dir.write("NMS-2027-0417.xml", dcc);

  auto r = run_plumb({"--db", db, "weight", "recalibrate", "W100", "--from-dcc", "NMS-2027-0417.xml", "--dcc-schema",
                      schema->string(), "--as", "Q. Manager"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("certificate NMS-2027-0417 (2027-02-18 to 2028-02-18)"));
  r = run_plumb({"--db", db, "weight", "show", "W100", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  const json c = certificate_named(json::parse(r.out), "NMS-2027-0417");
  REQUIRE(c.is_object());
  // The DCC gives the conventional mass 100.00004 g: correction 100.00004 - 100 = 0.00004 g = 0.04 mg; U = 0.00005 g
  // = 0.05 mg for k = 2; calibrated on the end of performance 2027-02-18; due as its recalibration statement says.
  CHECK_THAT(c["conventional_mass_g"].get<double>(), grams_near(100.00004, ug(0.001)));
  CHECK(c["correction_mg"].get<double>() == Approx(0.04).margin(1e-9).epsilon(0));
  CHECK(c["uncertainty_mg"].get<double>() == Approx(0.05).margin(1e-9).epsilon(0));
  CHECK(c["k"].get<double>() == Approx(2.0).margin(1e-12).epsilon(0));
  CHECK(c["calibrated_on"] == "2027-02-18");
  CHECK(c["due_on"] == "2028-02-18");

  // The same certificate twice is refused, as when typed.
  r = run_plumb({"--db", db, "weight", "recalibrate", "W100", "--from-dcc", "NMS-2027-0417.xml", "--dcc-schema",
                 schema->string(), "--as", "Q. Manager"},
                dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("NMS-2027-0417") && Catch::Contains("already recorded"));
}

TEST_CASE("weight recalibrate --from-dcc: a correction in mg in scientific notation, and --due",
          "[cli][weights][dcc]") {
  const auto schema = plumb::test::dcc_schema_path();
  if (!schema) {
    WARN("skipped: the DCC schema of shared/reference-data/dcc was not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  std::string dcc =
      replaced(provider_dcc(), "<dcc:uniqueIdentifier>NMS-2027-0417", "<dcc:uniqueIdentifier>NMS-2027-0418");
  // A correction of -2.5E-2 mg with U = 4.5E-2 mg: -0.000025 g and 0.000045 g, exactly (U within a third of
  // the E2 MPE at 100 g, 0.16 mg, OIML R 111-1:2004 Table 1).
  dcc = replaced(dcc, R"(<dcc:quantity refType="conventionalMass">
              <dcc:name><dcc:content lang="en">conventional mass</dcc:content></dcc:name>
              <si:real>
                <si:value>100.00004</si:value>
                <si:unit>\gram</si:unit>
                <si:expandedUnc>
                  <si:uncertainty>0.00005</si:uncertainty>)",
                 R"(<dcc:quantity refType="conventionalMassCorrection">
              <dcc:name><dcc:content lang="en">correction of the conventional mass</dcc:content></dcc:name>
              <si:real>
                <si:value>-2.5E-2</si:value>
                <si:unit>\milli\gram</si:unit>
                <si:expandedUnc>
                  <si:uncertainty>4.5E-2</si:uncertainty>)");
  // xs:date may carry a time zone; the certificate's date is the calendar day.
  dcc = replaced(dcc, "<dcc:endPerformanceDate>2027-02-18</dcc:endPerformanceDate>",
                 "<dcc:endPerformanceDate>2027-02-18+01:00</dcc:endPerformanceDate>");
  dir.write("cert.xml", dcc);
  const auto r = run_plumb({"--db", db, "weight", "recalibrate", "W100", "--from-dcc", "cert.xml", "--dcc-schema",
                            schema->string(), "--due", "2027-08-18", "--as", "Q. Manager"},
                           dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK_THAT(r.out, Catch::Contains("correction -0.000025 g, U = 0.000045 g (k = 2)"));
  const auto shown = run_plumb({"--db", db, "weight", "show", "W100", "--format", "json"}, dir.path());
  const json c = certificate_named(json::parse(shown.out), "NMS-2027-0418");
  REQUIRE(c.is_object());
  CHECK_THAT(c["conventional_mass_g"].get<double>(), grams_near(99.999975, ug(0.001)));  // 100 - 0.000025
  CHECK(c["calibrated_on"] == "2027-02-18");
  CHECK(c["due_on"] == "2027-08-18");  // --due wins over the provider's recommendation
}

TEST_CASE("weight recalibrate --from-dcc refuses an external entity and reads no file through it",
          "[cli][weights][dcc][security]") {
  const auto schema = plumb::test::dcc_schema_path();
  if (!schema) {
    WARN("skipped: the DCC schema of shared/reference-data/dcc was not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("secret.txt", "TOP-SECRET-CERTIFICATE-KEY");
  const std::string entity = "<!DOCTYPE dcc:digitalCalibrationCertificate [<!ENTITY leak SYSTEM \"" +
                             dir.file("secret.txt").string() + "\">]>\n";
  std::string dcc =
      replaced(provider_dcc(), "<dcc:digitalCalibrationCertificate ", entity + "<dcc:digitalCalibrationCertificate ");
  dcc = replaced(dcc, "<dcc:uniqueIdentifier>NMS-2027-0417", "<dcc:uniqueIdentifier>&leak;");
  dir.write("cert.xml", dcc);
  const std::vector<std::string> args = {"--db",           db,           "weight",    "recalibrate",
                                         "W100",           "--from-dcc", "cert.xml",  "--dcc-schema",
                                         schema->string(), "--as",       "Q. Manager"};
  plumb::test::prepare_login(args, dir.path());  // the member's account first: the refusal is what is compared
  const std::string before = plumb::test::dump_database(db);
  const auto r = run_plumb(args, dir.path());
  CHECK(r.status == 2);
  CHECK_THAT(r.err, Catch::Contains("DOCTYPE"));
  CHECK_THAT(r.err + r.out, !Catch::Contains("TOP-SECRET"));
  CHECK(plumb::test::dump_database(db) == before);
}
