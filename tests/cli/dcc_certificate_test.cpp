// `certificate show N --format dcc`: the Digital Calibration Certificate of each certificate kind, made by the
// built binary from a scratch lab, validated with libxml2's xmlSchemaValidateDoc against the DCC 3.1.2 schema
// (D-SI 2.1.0) of shared/reference-data/dcc, offline, and read back by XPath. The expected values are the ones
// worked by hand in tests/cli/calibration_test.cpp and tests/cli/pipette_check_test.cpp (and the arithmetic
// below); the D-SI unit spellings are those of reference-data/dcc/README.md (\gram, \milli\gram, \micro\litre)
// and, for the others, of the D-SI 2.1.0 unit list as remembered (from memory).
#include <catch2/catch.hpp>

#include <set>

#include "support/dcc_xml.hpp"
#include "support/margin.hpp"
#include "support/run_plumb.hpp"

using plumb::test::grams_near;
using plumb::test::microlitres_near;
using plumb::test::percent_near;
using plumb::test::pp;
using plumb::test::run_plumb;
using plumb::test::ug;
using plumb::test::ul;
using plumb::test::xpath_text;
using plumb::test::xpath_texts;

namespace {

void ok(const std::vector<std::string>& args, const plumb::test::ScratchDir& dir) {
  const auto r = run_plumb(args, dir.path());
  INFO("plumb " << args[2] << " " << args[3] << "\nstderr: " << r.err);
  REQUIRE(r.status == 0);
}

/// The DCC of `selector`, checked to be well-formed and valid against the schema.
plumb::test::TestXmlDoc valid_dcc(const std::string& db, const std::string& selector,
                                  const plumb::test::ScratchDir& dir, const std::filesystem::path& schema) {
  const auto r =
      run_plumb({"--db", db, "certificate", "show", selector, "--format", "dcc", "--country", "DE"}, dir.path());
  INFO("stderr: " << r.err);
  REQUIRE(r.status == 0);
  CHECK(r.err.empty());
  auto doc = plumb::test::parse_xml(r.out);
  REQUIRE(doc);
  CHECK(plumb::test::validate_against(doc.get(), schema) == 0);
  return doc;
}

double number(const std::string& text) {
  std::size_t used = 0;
  const double v = std::stod(text, &used);
  REQUIRE(used == text.size());  // the whole text is the number
  return v;
}

/// Every unit text in the document is one of the D-SI spellings plumb should write (the schema accepts any
/// string, so a misspelt unit would validate).
void check_units(xmlDoc* doc) {
  const std::set<std::string> dsi = {"\\gram",
                                     "\\milli\\gram",
                                     "\\micro\\litre",
                                     "\\percent",
                                     "\\one",
                                     "\\degreecelsius",
                                     "\\hecto\\pascal",
                                     "\\kilogram\\metre\\tothe{-3}",
                                     "\\micro\\litre\\milli\\gram\\tothe{-1}"};
  std::vector<std::string> units = xpath_texts(doc, "//si:unit");
  for (const auto& list : xpath_texts(doc, "//si:unitXMLList"))
    for (const auto& u : plumb::test::list_items(list)) units.push_back(u);
  REQUIRE(!units.empty());
  for (const auto& u : units) {
    INFO("unit " << u);
    CHECK(dsi.count(u) == 1);
  }
}

// The calibration of tests/cli/calibration_test.cpp, recorded and certified: BAL-C (220 g, d = 0.1 mg, class I,
// e = 1 mg), four E2 weights with zero correction, readings giving E = +0.1, +0.2, +0.4, +0.6, +0.8 mg.
std::string certified_calibration(const plumb::test::ScratchDir& dir) {
  const auto db = plumb::test::calibration_lab(dir).string();
  dir.write("cal.csv", plumb::test::calibration_run_file());
  ok({"--db",        db,           "check",        "record",        "BAL-C",     "--procedure",
      "calibration", "--readings", "cal.csv",      "--temperature", "20C",        "--pressure",
      "1013.25hPa",     "--humidity", "50%",           "--air-formula", "oiml-r111", "--on",
      "2026-11-30",  "--as",       "A. Technician"},
     dir);
  ok({"--db", db, "certificate", "issue", "LAST", "--as", "Q. Manager"}, dir);
  return db;
}

const char* as_found = "//dcc:measurementResult[@refType='plumb_asFound']";

std::string in_as_found(const std::string& rest) {
  return std::string(as_found) + rest;
}

}  // namespace

TEST_CASE("dcc: a calibration certificate validates and carries the hand-worked results", "[cli][dcc]") {
  const auto schema = plumb::test::dcc_schema_path();
  if (!schema) {
    WARN("skipped: the DCC schema of shared/reference-data/dcc was not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = certified_calibration(dir);
  auto doc = valid_dcc(db, "CC-2026-0001", dir, *schema);
  xmlDoc* d = doc.get();
  check_units(d);

  CHECK(xpath_text(d, "//dcc:coreData/dcc:uniqueIdentifier") == "CC-2026-0001");
  CHECK(xpath_text(d, "//dcc:coreData/dcc:countryCodeISO3166_1") == "DE");
  CHECK(xpath_text(d, "//dcc:coreData/dcc:beginPerformanceDate") == "2026-11-30");
  CHECK(xpath_text(d, "//dcc:coreData/dcc:endPerformanceDate") == "2026-11-30");
  CHECK(xpath_text(d, "//dcc:coreData/dcc:performanceLocation") == "laboratory");
  CHECK(xpath_text(d, "//dcc:items/dcc:item/dcc:identifications/dcc:identification/dcc:value") == "BAL-C");
  CHECK(xpath_text(d, "//dcc:calibrationLaboratory/dcc:contact/dcc:name/dcc:content") == "Example Calibration Lab");
  CHECK(xpath_text(d, "//dcc:customer/dcc:name/dcc:content") == "Example Calibration Lab");

  // E = I - m_ref with zero corrections: exact decimals (calibration_test.cpp).
  const std::string error = in_as_found("//dcc:quantity[@refType='plumb_error']/si:realListXMLList");
  CHECK(xpath_text(d, error + "/si:valueXMLList") == "0.0001 0.0002 0.0004 0.0006 0.0008");
  CHECK(xpath_text(d, error + "/si:labelXMLList") == "W20 W50 W100 W100+W50 W200");
  const auto U = plumb::test::list_items(xpath_text(d, error + "/si:expandedUncXMLList/si:uncertaintyXMLList"));
  const auto k = plumb::test::list_items(xpath_text(d, error + "/si:expandedUncXMLList/si:coverageFactorXMLList"));
  const auto p = plumb::test::list_items(xpath_text(d, error + "/si:expandedUncXMLList/si:coverageProbabilityXMLList"));
  REQUIRE(U.size() == 5);
  REQUIRE(k.size() == 5);
  REQUIRE(p.size() == 5);
  // At W100 (calibration_test.cpp, by hand): u_c = 11/120 mg, nu_eff = 82.36, 2.03 < k < 2.05 (GUM Table G.2),
  // so 0.18608 mg < U < 0.18792 mg.
  CHECK(number(k[2]) > 2.03);
  CHECK(number(k[2]) < 2.05);
  CHECK(number(U[2]) > 0.00018608);
  CHECK(number(U[2]) < 0.00018792);
  // Coverage probability 95.45 % of GUM 6.2.2 (2 Phi(2) - 1 = erf(sqrt 2) = 0.9544997, JCGM 100:2008).
  for (const auto& each : p) CHECK(number(each) == Approx(0.9544997).margin(5e-8).epsilon(0));
  CHECK(xpath_text(d, in_as_found("//dcc:quantity[@refType='plumb_error']//dcc:conformityXMLList")) ==
        "pass pass pass pass pass");
  // OIML R 76-1 Table 6 (from memory, as in calibration_test.cpp): 1 mg at 20 g, 2 mg at 100 g.
  const auto tolerance = plumb::test::list_items(
      xpath_text(d, in_as_found("//dcc:quantity[@refType='plumb_tolerance']/si:realListXMLList/si:valueXMLList")));
  REQUIRE(tolerance.size() == 5);
  CHECK_THAT(number(tolerance[0]), grams_near(0.001, ug(0.001)));
  CHECK_THAT(number(tolerance[2]), grams_near(0.002, ug(0.001)));

  // Repeatability: s = sqrt(10 x 0.0025 / 9) mg = 0.0527046 mg (calibration_test.cpp).
  CHECK_THAT(number(xpath_text(d, in_as_found("//dcc:quantity[@refType='plumb_standardDeviation']/si:real/si:value"))),
             grams_near(0.0000527046, ug(0.0001)));
  CHECK(xpath_text(d, in_as_found("//dcc:quantity[@refType='plumb_standardDeviation']/si:real/si:unit")) == "\\gram");
  // Eccentricity: largest deviation +0.0002 g at front-left.
  CHECK(xpath_text(d, in_as_found("//dcc:quantity[@refType='plumb_maxDeviation']/si:real/si:value")) == "0.0002");
  // Air density, OIML R 111-1 Annex E by hand at 20 degC, 1013.25 hPa, 50 %: 1.199294 kg/m3.
  CHECK(number(xpath_text(d, in_as_found("//dcc:influenceCondition[@refType='plumb_airDensity']//si:value"))) ==
        Approx(1.199294).epsilon(2e-6));
  CHECK(xpath_text(d, in_as_found("//dcc:influenceCondition[@refType='plumb_airTemperature']//si:value")) == "20");

  // Traceability: the four weights with their certificates and U, k (k = 2: 0.9545, normal distribution).
  CHECK(xpath_texts(d, in_as_found("//dcc:measuringEquipment[@refType='plumb_referenceWeight']")).size() == 4);
  const auto certificates =
      xpath_texts(d, in_as_found("//dcc:measuringEquipment//dcc:identification[dcc:issuer='other']/dcc:value"));
  CHECK(certificates == std::vector<std::string>{"RC-W100", "RC-W20", "RC-W50", "RC-W200"});
  CHECK(xpath_texts(d, in_as_found("//dcc:measuringEquipment//si:coverageProbability"))[0] == "0.9545");
  CHECK(xpath_texts(d, in_as_found("//dcc:measuringEquipment//si:uncertainty"))[0] == "0.00005");

  // Statements: conformity, decision rule, and the draft standing (not valid).
  CHECK(xpath_text(d, "//dcc:statement[@refType='plumb_conformity']/dcc:conformity") == "pass");
  CHECK_THAT(xpath_text(d, "//dcc:statement[@refType='plumb_decisionRule']/dcc:declaration/dcc:content"),
             Catch::Contains("simple acceptance") && Catch::Contains("ILAC G8:09/2019"));
  CHECK(xpath_text(d, "//dcc:statement[@refType='plumb_dueDate']/dcc:date") == "2027-11-30");
  CHECK(xpath_text(d, "//dcc:statement[@refType='plumb_certificateStatus']/dcc:valid") == "false");
  CHECK_THAT(xpath_text(d, "//dcc:statement[@refType='plumb_certificateStatus']/dcc:declaration/dcc:content"),
             Catch::StartsWith("DRAFT"));
  CHECK(xpath_texts(d, "//dcc:respPerson/dcc:role") == std::vector<std::string>{"performed by", "issued by"});

  // Approved: the approver with the meaning and time of the signature, and the certificate valid.
  ok({"--db", db, "certificate", "approve", "CC-2026-0001", "--as", "R. Reviewer", "--meaning",
      "reviewed and approved"},
     dir);
  doc = valid_dcc(db, "CC-2026-0001", dir, *schema);
  d = doc.get();
  CHECK(xpath_text(d, "//dcc:statement[@refType='plumb_certificateStatus']/dcc:valid") == "true");
  CHECK_THAT(xpath_text(d, "//dcc:statement[@refType='plumb_certificateStatus']/dcc:declaration/dcc:content"),
             Catch::StartsWith("APPROVED by R. Reviewer"));
  CHECK(xpath_text(d, "//dcc:respPerson[dcc:role='approved by']/dcc:person/dcc:name/dcc:content") == "R. Reviewer");
  CHECK(xpath_text(d, "//dcc:respPerson[dcc:role='approved by']/dcc:mainSigner") == "true");
  CHECK_THAT(xpath_text(d, "//dcc:respPerson[dcc:role='approved by']/dcc:description/dcc:content"),
             Catch::Contains("reviewed and approved") && Catch::Contains("recorded at 20"));
}

TEST_CASE("dcc: a broken DCC fails validation (the test's validation can fail)", "[cli][dcc]") {
  const auto schema = plumb::test::dcc_schema_path();
  if (!schema) {
    WARN("skipped: the DCC schema of shared/reference-data/dcc was not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = certified_calibration(dir);
  const auto r =
      run_plumb({"--db", db, "certificate", "show", "LAST", "--format", "dcc", "--country", "DE"}, dir.path());
  REQUIRE(r.status == 0);

  // A required element removed.
  auto doc = plumb::test::parse_xml(r.out);
  REQUIRE(doc);
  REQUIRE(plumb::test::validate_against(doc.get(), *schema) == 0);
  auto id = plumb::test::xpath_nodes(doc.get(), "//dcc:coreData/dcc:uniqueIdentifier");
  REQUIRE(id.size() == 1);
  xmlUnlinkNode(id[0]);
  xmlFreeNode(id[0]);
  CHECK(plumb::test::validate_against(doc.get(), *schema) != 0);

  // A value that is not a number.
  doc = plumb::test::parse_xml(r.out);
  auto values = plumb::test::xpath_nodes(doc.get(), "//si:real/si:value");
  REQUIRE(!values.empty());
  xmlNodeSetContent(values[0], BAD_CAST "about 20");
  CHECK(plumb::test::validate_against(doc.get(), *schema) != 0);

  // A coverage factor below 1 (D-SI kValueType).
  doc = plumb::test::parse_xml(r.out);
  auto factors = plumb::test::xpath_nodes(doc.get(), "//si:coverageFactor");
  REQUIRE(!factors.empty());
  xmlNodeSetContent(factors[0], BAD_CAST "0.5");
  CHECK(plumb::test::validate_against(doc.get(), *schema) != 0);

  // A misspelt unit still validates: the schema does not check units, which is why check_units does.
  doc = plumb::test::parse_xml(r.out);
  auto units = plumb::test::xpath_nodes(doc.get(), "//si:real/si:unit");
  REQUIRE(!units.empty());
  xmlNodeSetContent(units[0], BAD_CAST "\\gramm");
  CHECK(plumb::test::validate_against(doc.get(), *schema) == 0);
}

TEST_CASE("dcc: a pipette certificate validates and carries the ISO 8655-6 results", "[cli][dcc][pipette]") {
  const auto schema = plumb::test::dcc_schema_path();
  if (!schema) {
    WARN("skipped: the DCC schema of shared/reference-data/dcc was not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("sm02.csv",
            "reading\n100.00003\n100.00004\n100.00002\n100.00003\n100.00005\n100.00003\n100.00002\n100.00004\n"
            "100.00003\n100.00003\n");
  ok({"--db", db, "balance", "add", "SM-02", "--capacity", "120g", "--readability", "0.01mg", "--every", "7d",
      "--smallest-net", "50mg", "--location", "Weighing room", "--since", "2026-01-05"},
     dir);
  ok({"--db", db, "check", "record", "SM-02", "--weight", "W100", "--readings", "sm02.csv", "--on", "2026-11-30",
      "--as", "A. Technician"},
     dir);
  ok({"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed", "--every", "3mo", "--location",
      "Lab 2", "--since", "2026-06-01", "--as", "Q. Manager"},
     dir);
  std::string w = "volume,channel,reading\n";
  for (const char* reading :
       {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992", "0.09975", "0.09969", "0.09983", "0.09961", "0.09977"})
    w += std::string("100uL,1,") + reading + "\n";
  dir.write("w.csv", w);
  ok({"--db",      db,           "check",        "record", "P-07",       "--procedure", "gravimetric",
      "--balance", "SM-02",      "--water-temp", "20C",     "--pressure", "1013hPa",        "--humidity",
      "50%",        "--readings", "w.csv",        "--on",   "2026-12-01", "--as",        "A. Technician"},
     dir);
  ok({"--db", db, "certificate", "issue", "LAST", "--as", "Q. Manager"}, dir);
  auto doc = valid_dcc(db, "PC-2026-0001", dir, *schema);
  xmlDoc* d = doc.get();
  check_units(d);
  CHECK(xpath_text(d, "//dcc:coreData/dcc:uniqueIdentifier") == "PC-2026-0001");
  CHECK(xpath_text(d, "//dcc:coreData/dcc:endPerformanceDate") == "2026-12-01");
  CHECK(xpath_text(d, "//dcc:items/dcc:item/dcc:name/dcc:content") == "Pipette P-07");

  // By hand (pipette_check_test.cpp): Z = 1.0028509 uL/mg; mean volume 99.731 mg x Z = 100.01532 uL;
  // e_s = +0.01532 uL = +0.01532 %; s_r = 0.1048020 uL; CV = 0.10479 %; limits 0.8 uL and 0.3 uL
  // (ISO 8655-2:2002 Table 1, from memory).
  const auto list_value = [&](const char* ref_type) {
    return number(
        xpath_text(d, std::string("//dcc:quantity[@refType='") + ref_type + "']/si:realListXMLList/si:valueXMLList"));
  };
  CHECK_THAT(list_value("plumb_meanVolume"), microlitres_near(100.01532, ul(0.000005)));
  CHECK_THAT(list_value("plumb_systematicError"), microlitres_near(0.01532, ul(0.000005)));
  CHECK_THAT(list_value("plumb_systematicErrorRelative"), percent_near(0.01532, pp(0.000005)));
  CHECK_THAT(list_value("plumb_randomError"), microlitres_near(0.1048020, ul(0.0000005)));
  CHECK_THAT(list_value("plumb_coefficientOfVariation"), percent_near(0.10479, pp(0.000005)));
  CHECK_THAT(list_value("plumb_systematicErrorLimit"), microlitres_near(0.8, ul(1e-9)));
  CHECK_THAT(list_value("plumb_randomErrorLimit"), microlitres_near(0.3, ul(1e-9)));
  CHECK(xpath_text(d, "//dcc:quantity[@refType='plumb_meanVolume']/si:realListXMLList/si:unitXMLList") ==
        "\\micro\\litre");
  CHECK(xpath_text(d, "//dcc:quantity[@refType='plumb_systematicError']//dcc:conformity") == "pass");
  CHECK(number(xpath_text(d, "//dcc:influenceCondition[@refType='plumb_zFactor']//si:value")) ==
        Approx(1.0028509).margin(0.00000005).epsilon(0));
  CHECK(number(xpath_text(d, "//dcc:influenceCondition[@refType='plumb_waterDensity']//si:value")) ==
        Approx(998.20675).margin(0.000005).epsilon(0));
  // The balance used and the weight behind its check: W100, conventional mass 100 g + 0.03 mg.
  CHECK(xpath_text(d, "//dcc:measuringEquipment[@refType='plumb_balanceUsed']//dcc:identification/dcc:value") ==
        "SM-02");
  CHECK(xpath_text(d, "//dcc:measuringEquipment[@refType='plumb_referenceWeight']//si:value") == "100.00003");
  CHECK_THAT(xpath_text(d, "//dcc:statement[@refType='plumb_caution']/dcc:declaration/dcc:content"),
             Catch::Contains("clinical"));
}

TEST_CASE("dcc: a weekly check certificate validates, and withdrawn it says so and is not valid", "[cli][dcc]") {
  const auto schema = plumb::test::dcc_schema_path();
  if (!schema) {
    WARN("skipped: the DCC schema of shared/reference-data/dcc was not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  // Five 100.0003 and five 100.0004 on BAL-A with W100 (conventional mass 100 g + 0.03 mg = 100.00003 g):
  // mean 100.00035 g, bias 100.00035 - 100.00003 = 0.00032 g; s = sqrt(10 x (0.05 mg)^2 / 9) = 0.0527046 mg.
  std::string readings = "reading\n";
  for (int i = 0; i < 10; ++i) readings += i % 2 ? "100.0004\n" : "100.0003\n";
  dir.write("r.csv", readings);
  ok({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on", "2026-11-30", "--as",
      "A. Technician"},
     dir);
  ok({"--db", db, "certificate", "issue", "LAST", "--as", "Q. Manager"}, dir);
  auto doc = valid_dcc(db, "BC-2026-0001", dir, *schema);
  xmlDoc* d = doc.get();
  check_units(d);
  const auto value = [&](const char* ref_type) {
    return number(xpath_text(d, std::string("//dcc:result[@refType='plumb_readings']//dcc:quantity[@refType='") +
                                    ref_type + "']/si:real/si:value"));
  };
  CHECK(value("plumb_count") == 10);
  CHECK_THAT(value("plumb_referenceValue"), grams_near(100.00003, ug(0.001)));
  CHECK_THAT(value("plumb_mean"), grams_near(100.00035, ug(0.001)));
  CHECK_THAT(value("plumb_bias"), grams_near(0.00032, ug(0.001)));
  CHECK_THAT(value("plumb_standardDeviation"), grams_near(0.0000527046, ug(0.0001)));
  CHECK(xpath_text(d, "//dcc:measuringEquipment//dcc:identification[dcc:issuer='other']/dcc:value") == "RC-2291");
  CHECK(xpath_text(d, "//dcc:statement[@refType='plumb_conformity']/dcc:conformity") == "pass");

  ok({"--db", db, "check", "void", "1", "--reason", "recorded on the wrong balance", "--as", "Q. Manager"}, dir);
  doc = valid_dcc(db, "BC-2026-0001", dir, *schema);
  d = doc.get();
  CHECK(xpath_text(d, "//dcc:statement[@refType='plumb_certificateStatus']/dcc:valid") == "false");
  CHECK_THAT(xpath_text(d, "//dcc:statement[@refType='plumb_certificateStatus']/dcc:declaration/dcc:content"),
             Catch::StartsWith("WITHDRAWN") && Catch::Contains("recorded on the wrong balance"));
}

TEST_CASE("dcc: a replacement names the certificate it replaces, and the replaced one is superseded", "[cli][dcc]") {
  const auto schema = plumb::test::dcc_schema_path();
  if (!schema) {
    WARN("skipped: the DCC schema of shared/reference-data/dcc was not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("r.csv", "reading\n" + std::string("100.0003\n100.0004\n100.0003\n100.0003\n100.0004\n") +
                       "100.0003\n100.0004\n100.0003\n100.0003\n100.0004\n");
  ok({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "r.csv", "--on", "2026-11-30", "--as",
      "A. Technician"},
     dir);
  ok({"--db", db, "certificate", "issue", "LAST", "--as", "Q. Manager"}, dir);
  ok({"--db", db, "check", "correct", "1", "--on", "2026-11-29", "--reason", "date typed wrong", "--as", "Q. Manager"},
     dir);
  auto doc = valid_dcc(db, "BC-2026-0002", dir, *schema);
  CHECK(xpath_text(doc.get(), "//dcc:statement[@refType='plumb_replaces']/dcc:declaration/dcc:content") ==
        "This certificate replaces certificate BC-2026-0001 (reason: date typed wrong).");
  CHECK(xpath_text(doc.get(), "//dcc:coreData/dcc:endPerformanceDate") == "2026-11-29");
  doc = valid_dcc(db, "BC-2026-0001", dir, *schema);
  CHECK(xpath_text(doc.get(), "//dcc:statement[@refType='plumb_certificateStatus']/dcc:valid") == "false");
  CHECK_THAT(xpath_text(doc.get(), "//dcc:statement[@refType='plumb_certificateStatus']/dcc:declaration/dcc:content"),
             Catch::StartsWith("SUPERSEDED by certificate BC-2026-0002"));
}

TEST_CASE("dcc: the item's maker, model, serial and asset tag, and the lab's address from the layout", "[cli][dcc]") {
  const auto schema = plumb::test::dcc_schema_path();
  if (!schema) {
    WARN("skipped: the DCC schema of shared/reference-data/dcc was not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  // An invented maker and model.
  ok({"--db",
      db,
      "balance",
      "add",
      "BAL-M",
      "--capacity",
      "220g",
      "--readability",
      "0.1mg",
      "--every",
      "7d",
      "--smallest-net",
      "200mg",
      "--maker",
      "Invented Weighing Works",
      "--model",
      "IW-220",
      "--serial",
      "SN 0042-7",
      "--asset-tag",
      "LAB-0815",
      "--location",
      "Room 2",
      "--since",
      "2026-01-05"},
     dir);
  dir.write("r.csv", "reading\n" + std::string("100.0003\n100.0004\n100.0003\n100.0003\n100.0004\n") +
                       "100.0003\n100.0004\n100.0003\n100.0003\n100.0004\n");
  ok({"--db", db, "check", "record", "BAL-M", "--weight", "W100", "--readings", "r.csv", "--on", "2026-11-30", "--as",
      "A. Technician"},
     dir);
  dir.write("layout.json", R"({"address_lines": ["Building 4, Room 2.17", "1 Example Street, Exampletown"],
    "accreditation": "EX-K-00000", "signatories": [{"role": "Performed by", "name": "{operator}"}]})");
  ok({"--db", db, "certificate", "issue", "LAST", "--layout", "layout.json", "--as", "Q. Manager"}, dir);
  auto doc = valid_dcc(db, "LAST", dir, *schema);
  xmlDoc* d = doc.get();
  CHECK(xpath_text(d, "//dcc:item/dcc:manufacturer/dcc:name/dcc:content") == "Invented Weighing Works");
  CHECK(xpath_text(d, "//dcc:item/dcc:model") == "IW-220");
  CHECK(xpath_text(d, "//dcc:item//dcc:identification[dcc:issuer='manufacturer']/dcc:value") == "SN 0042-7");
  CHECK(xpath_text(d, "//dcc:item//dcc:identification[dcc:issuer='owner']/dcc:value") == "LAB-0815");
  CHECK_THAT(xpath_text(d, "//dcc:item/dcc:description/dcc:content"), Catch::Contains("location: Room 2"));
  CHECK(xpath_texts(d, "//dcc:calibrationLaboratory//dcc:location/dcc:further/dcc:content") ==
        std::vector<std::string>{"Building 4, Room 2.17", "1 Example Street, Exampletown"});
  CHECK(xpath_text(d, "//dcc:calibrationLaboratory/dcc:calibrationLaboratoryCode") == "EX-K-00000");
}
