// The calibration certificate states the uncertainty of a weighing result in normal use and the minimum weight
// from calibration beside the USP <41> one, in every rendering (text, JSON, HTML, PDF); `balance show` shows the
// same; a balance without declared terms gets the one line that says so.
//
// The calibration is the example of tests/cli/calibration_test.cpp (E = +0.1, +0.2, +0.4, +0.6, +0.8 mg at 20, 50,
// 100, 150, 200 g, d = 0.1 mg). Its error over the range by hand (least squares with x = m; fitted against x = R the
// slope is lower by about 4e-6 of itself, 1.6e-11, inside the margin on b): xbar = 104 g, Sxx = 21320 g^2, Sxy = 83.6
// mg g, a1 = 83.6 / 21320 = 3.9212008e-6, a0 = 0.42 mg - 104 g x a1 = 0.0121951 mg. alpha_E, beta_E and k of the
// calibration's u(E) approximation are read from the certificate (checked by hand in range_approximation_test);
// everything added to them is worked here.
#include <catch2/catch.hpp>

#include <cctype>
#include <cmath>
#include <cstdio>
#include <regex>

#include <nlohmann/json.hpp>

#include "support/dcc_xml.hpp"
#include "support/margin.hpp"
#include "support/rendered_text.hpp"
#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::grams_near;
using plumb::test::mg;
using plumb::test::run_plumb;
using plumb::test::ug;

namespace {

void in_use_ok(const plumb::test::RunResult& r) {
  INFO(r.err);
  REQUIRE(r.status == 0);
}

/// The number after `label` in whitespace-free text, or NaN when absent.
double number_after(const std::string& squeezed, const std::string& label) {
  std::smatch m;
  const std::regex re(std::regex_replace(label, std::regex(R"([<>()^+*.?])"), R"(\$&)") + "([-+0-9.e]+)");
  if (!std::regex_search(squeezed, m, re)) return std::nan("");
  return std::stod(m[1].str());
}

struct InUseRenderings {
  std::string text, html, pdf, json;
  std::string values;  // the JSON rendering's labelled values, each label followed by its value
};

InUseRenderings in_use_renderings(const std::string& db, const std::string& number,
                                  const plumb::test::ScratchDir& dir) {
  InUseRenderings r;
  auto out = run_plumb({"--db", db, "certificate", "show", number}, dir.path());
  in_use_ok(out);
  r.text = plumb::test::without_spaces(out.out);
  out = run_plumb({"--db", db, "certificate", "show", number, "--format", "html"}, dir.path());
  in_use_ok(out);
  r.html = plumb::test::without_spaces(plumb::test::html_text(out.out));
  out = run_plumb({"--db", db, "certificate", "show", number, "--format", "json"}, dir.path());
  in_use_ok(out);
  r.json = out.out;
  const json stored = json::parse(out.out);
  for (const auto& v : stored.at("rendering"))
    r.values += v.value("label", "") + " " + (v["value"].is_string() ? v["value"].get<std::string>() : "") + "\n";
  r.values = plumb::test::without_spaces(r.values);
  const std::string pdf = number + ".pdf";
  in_use_ok(run_plumb({"--db", db, "certificate", "show", number, "--format", "pdf", "--output", pdf}, dir.path()));
  r.pdf = plumb::test::without_spaces(plumb::test::pdf_text(dir.file(pdf)));
  return r;
}

}  // namespace

TEST_CASE("the calibration certificate states U(W) in use and both minimum weights in every rendering, by hand",
          "[cli][calibration][in-use][certificate]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::calibration_lab(dir).string();
  dir.write("cal.csv", plumb::test::calibration_run_file());
  // Weekly check at 100 g, readings in 0.1 mg above 100 g: 3 4 2 3 5 3 2 4 3 3; mean 3.2, sum of squared
  // deviations 7.6, s = sqrt(7.6 / 9) x 0.1 mg = 0.09189366 mg > 0.41 d = 0.041 mg, so the USP <41> minimum weight
  // is 2000 x 0.09189366 mg = 0.18378732 g (USP <41>: 2 s / m <= 0.10 %).
  dir.write("wk.csv",
            "reading\n100.0003\n100.0004\n100.0002\n100.0003\n100.0005\n100.0003\n100.0002\n100.0004\n"
            "100.0003\n100.0003\n");
  const std::vector<std::vector<std::string>> steps = {
      {"check", "record", "BAL-C", "--procedure", "calibration", "--readings", "cal.csv", "--on", "2026-11-30", "--as",
       "A. Technician"},
      {"certificate", "issue", "LAST", "--as", "Q. Manager"}};
  for (auto step : steps) {
    step.insert(step.begin(), {"--db", db});
    in_use_ok(run_plumb(step, dir.path()));
  }

  // No terms declared: one line says so, in every rendering; `balance show` says so too.
  {
    const auto r = in_use_renderings(db, "LAST", dir);
    const std::string line = plumb::test::without_spaces("No terms of normal use are declared for BAL-C");
    CHECK_THAT(r.text, Catch::Contains(line));
    CHECK_THAT(r.html, Catch::Contains(line));
    CHECK_THAT(r.values, Catch::Contains(line));
    CHECK_THAT(r.pdf, Catch::Contains(line));
    CHECK_THAT(r.text, !Catch::Contains("Minimumweightfromcalibration"));
    const auto show = run_plumb({"--db", db, "balance", "show", "BAL-C"}, dir.path());
    in_use_ok(show);
    CHECK_THAT(show.out, Catch::Contains("no terms of normal use declared"));
  }

  const std::vector<std::vector<std::string>> declare = {
      {"balance",
       "set-in-use",
       "BAL-C",
       "--repeatability",
       "0.12mg",
       "--temperature-change",
       "5K",
       "--tk",
       "2ppm/K",
       "--air-density-u",
       "0.05kg/m3",
       "--sample-density",
       "1000kg/m3",
       "--sample-density-u",
       "50kg/m3",
       "--drift",
       "10ppm",
       "--required-accuracy",
       "0.1%",
       "--safety-factor",
       "2",
       "--reason",
       "terms of the assay room",
       "--as",
       "Q. Manager"},
      {"check", "record", "BAL-C", "--weight", "W100", "--readings", "wk.csv", "--on", "2026-12-01", "--as",
       "A. Technician"},
      {"check", "record", "BAL-C", "--procedure", "calibration", "--readings", "cal.csv", "--on", "2026-12-02", "--as",
       "A. Technician"},
      {"certificate", "issue", "LAST", "--as", "Q. Manager"}};
  for (auto step : declare) {
    step.insert(step.begin(), {"--db", db});
    INFO(step[2] << " " << step[3]);
    in_use_ok(run_plumb(step, dir.path()));
  }
  const auto r = in_use_renderings(db, "LAST", dir);
  const json doc = json::parse(r.json);
  INFO(r.text);
  // The calibration's u(E) approximation as the certificate states it (its own section, tested elsewhere).
  const json* appr = nullptr;
  for (const auto& st : doc["calibration"]["stages"]) appr = &st["range_approximation"];
  REQUIRE(appr != nullptr);
  const double alpha_e = (*appr)["alpha_g"].get<double>(), beta_e = (*appr)["beta"].get<double>();
  const double k = (*appr)["k"].get<double>();
  // By hand (EURAMET cg-18 v4.0, uncertainty of a weighing result; formulas as in checks/weighing_in_use.hpp):
  // absolute terms d_0 = d_L = d = 0.1 mg -> (0.1 / (2 sqrt 3))^2 = 8.333333e-4 mg^2 each, s = 0.12 mg ->
  // 0.0144 mg^2: sum 1.6066667e-8 g^2. Relative: temperature (2e-6 x 5 / (2 sqrt 3))^2 = 8.333333e-12, buoyancy
  // (4.382137e-5)^2 = 1.9203125e-9 (weighing_in_use_test), drift (1e-5 / sqrt 3)^2 = 3.333333e-11: sum 1.9619792e-9.
  const double alpha = std::sqrt(alpha_e * alpha_e + 1.6066667e-8);
  const double beta = std::sqrt(beta_e * beta_e + 1.9619792e-9);
  // Not corrected, linear form: a = k alpha + |a0|, b = k beta + |a1| (the error of a straight line added).
  const double a = k * alpha + 0.0121951e-3, b = k * beta + 3.9212008e-6;
  // W_min = SF a / (A - SF b), SF = 2, A = 0.1 %.
  const double w_min = 2 * a / (0.001 - 2 * b);
  INFO("by hand: a = " << a << " g, b = " << b << ", W_min = " << w_min << " g");
  CHECK(w_min > 0.5);  // so the minimum weight from calibration, not the USP <41> 0.18378732 g, binds
  for (const auto& [name, text] : std::vector<std::pair<std::string, std::string>>{
           {"text", r.text}, {"html", r.html}, {"pdf", r.pdf}, {"json", r.values}}) {
    INFO(name);
    if (name != "json") CHECK_THAT(text, Catch::Contains("Weighinginnormaluseandminimumweight"));  // a heading
    CHECK_THAT(text, Catch::Contains("linearform,resultsnotcorrectedfortheerror"));
    CHECK_THAT(number_after(text, "lineara=") * 1e-3, grams_near(a, ug(0.01)));
    CHECK(number_after(text, "mg,b=") == Approx(b).margin(5e-11).epsilon(0));
    CHECK_THAT(number_after(text, "Minimumweightfromcalibration"), grams_near(w_min, mg(0.01)));
    CHECK_THAT(number_after(text, "USP<41>minimumweight"), grams_near(0.18378732, mg(0.01)));
    CHECK_THAT(text, Catch::Contains("Bindingtheminimumweightfromcalibration") ||
                         Catch::Contains("Binding:theminimumweightfromcalibration"));
    CHECK_THAT(text, Catch::Contains("EURAMETcg-18version4.0(2015)") && Catch::Contains("USP<1251>"));
    CHECK_THAT(text, Catch::Contains("localregulations"));
  }

  // `balance show` gives the same two minimum weights, which binds, and U(W) in its form.
  const auto show = run_plumb({"--db", db, "balance", "show", "BAL-C"}, dir.path());
  in_use_ok(show);
  const std::string s = plumb::test::without_spaces(show.out);
  INFO(show.out);
  CHECK_THAT(s, Catch::Contains("(linearform,resultsnotcorrected:|E(W)|added(globaluncertainty));EURAMETcg-18v4.0"));
  CHECK_THAT(number_after(s, "fromcalibration"), grams_near(w_min, mg(0.01)));
  CHECK_THAT(number_after(s, "USP<41>"), grams_near(0.18378732, mg(0.01)));
  CHECK_THAT(s, Catch::Contains("binding:fromcalibration"));
  const auto shown = run_plumb({"--db", db, "balance", "show", "BAL-C", "--format", "json"}, dir.path());
  in_use_ok(shown);
  const json page = json::parse(shown.out);
  CHECK(page["in_use"]["binding"] == "calibration");
  CHECK_THAT(page["in_use"]["calibration_minimum_weight_g"].get<double>(), grams_near(w_min, mg(0.001)));
  CHECK_THAT(page["in_use"]["usp41_minimum_weight_g"].get<double>(), grams_near(0.18378732, mg(0.001)));

  // The DCC carries the same figures, valid against the DCC 3.1.2 schema.
  const auto schema = plumb::test::dcc_schema_path();
  if (!schema) {
    WARN("DCC part skipped: the DCC schema of shared/reference-data/dcc was not found (set PLUMB_REFERENCE_DATA)");
    return;
  }
  const auto x =
      run_plumb({"--db", db, "certificate", "show", "LAST", "--format", "dcc", "--country", "SE"}, dir.path());
  in_use_ok(x);
  auto xml = plumb::test::parse_xml(x.out);
  REQUIRE(xml);
  CHECK(plumb::test::validate_against(xml.get(), *schema) == 0);
  const auto quantity = [&](const std::string& ref) {
    return std::stod(plumb::test::xpath_text(xml.get(), "//dcc:quantity[@refType='" + ref + "']/si:real/si:value"));
  };
  CHECK_THAT(quantity("plumb_inUseA"), grams_near(a, ug(0.01)));
  CHECK(quantity("plumb_inUseB") == Approx(b).margin(5e-11).epsilon(0));
  CHECK_THAT(quantity("plumb_minimumWeightCalibration"), grams_near(w_min, mg(0.001)));
  CHECK_THAT(quantity("plumb_minimumWeightUsp41"), grams_near(0.18378732, mg(0.001)));
}
