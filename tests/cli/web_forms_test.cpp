// The web application's forms beyond the weekly check, over HTTP: the pipette check (preview and record), the upload
// of a calibration run file, the void and correction of a run from its page, and the administrators' users page. For
// each: its status and content, the role that may not use it (403), a form without its session's CSRF token (403), a
// bad value's sentence (the CLI's, word for word) beside its field, and the database unchanged by every refusal.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"
#include "support/web_session.hpp"

using nlohmann::json;
using plumb::test::dump_database;
using plumb::test::grams_near;
using plumb::test::mg;
using plumb::test::microlitres_near;
using plumb::test::run_plumb;
using plumb::test::ScratchDir;
using plumb::test::ul;
using plumb::test::web::add_user;
using plumb::test::web::Browser;
using plumb::test::web::Served;

namespace {

/// The CLI's sentence as a page shows it: HTML-escaped as the templates escape every text.
std::string escaped(const std::string& text) {
  std::string out;
  for (const char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&#39;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

/// The database as `sqlite3 .dump` shows it, without the sessions' last-use times (every page a session asks for
/// moves its own): what a refused form must leave byte for byte unchanged.
std::string records_of(const std::string& db) {
  std::string out;
  const std::string all = dump_database(db);
  std::size_t at = 0;
  while (at < all.size()) {
    auto end = all.find('\n', at);
    if (end == std::string::npos) end = all.size();
    const std::string line = all.substr(at, end - at + 1);
    if (!line.starts_with("INSERT INTO session_activity")) out += line;
    at = end + 1;
  }
  return out;
}

/// The sentence of a CLI refusal ("plumb: SENTENCE\n" on standard error).
std::string sentence_of(const plumb::test::RunResult& r) {
  REQUIRE(r.status == 2);
  REQUIRE(r.err.starts_with("plumb: "));
  return r.err.substr(7, r.err.size() - 8);
}

// The balance and weighings of tests/cli/pipette_check_test.cpp, worked by hand there and in
// tests/unit/pipette_check_test.cpp (Tanaka water density, OIML R 111-1 Annex E air density, ISO 8655-6 Z):
// at 20 degC, 1013 hPa, 50 %RH, Z = 1.0028509 uL/mg; mean 99.731 mg -> mean volume 100.01532 uL, e_s = +0.01532 uL
// (+0.01532 %), s_r = 0.1048020 uL, CV 0.10479 %; ISO 8655-2:2002 limits for 100 uL 0.8 uL and 0.3 uL: pass.
const std::string sm02_readings =
    "reading\n100.00003\n100.00004\n100.00002\n100.00003\n100.00005\n100.00003\n100.00002\n100.00004\n100.00003\n"
    "100.00003\n";
const std::vector<std::string> ten = {"0.09971", "0.09965", "0.09980", "0.09958", "0.09992",
                                      "0.09975", "0.09969", "0.09983", "0.09961", "0.09977"};

std::string ten_weighings() {
  std::string csv = "volume,channel,reading\n";
  for (const auto& r : ten) csv += "100uL,1," + r + "\n";
  return csv;
}

std::string pipette_lab(const ScratchDir& dir) {
  const auto db = plumb::test::example_lab(dir).string();
  dir.write("sm02.csv", sm02_readings);
  for (const std::vector<std::string>& step :
       {std::vector<std::string>{"--db", db, "balance", "add", "SM-02", "--capacity", "120g", "--readability", "0.01mg",
                                 "--every", "7d", "--smallest-net", "50mg", "--location", "Weighing room", "--since",
                                 "2026-01-05"},
        std::vector<std::string>{"--db", db, "check", "record", "SM-02", "--weight", "W100", "--readings", "sm02.csv",
                                 "--on", "2026-11-30", "--as", "A. Technician"},
        std::vector<std::string>{"--db", db, "pipette", "add", "P-07", "--nominal", "100uL", "--range", "fixed",
                                 "--every", "3mo", "--location", "Lab 2", "--since", "2026-06-01", "--as",
                                 "Q. Manager"},
        // A retired pipette is not offered on the form.
        std::vector<std::string>{"--db", db, "pipette", "add", "P-08", "--nominal", "100uL", "--range", "fixed",
                                 "--every", "3mo", "--location", "Lab 2", "--since", "2026-06-01", "--as",
                                 "Q. Manager"},
        std::vector<std::string>{"--db", db, "instrument", "retire", "P-08", "--reason", "tip cone cracked", "--as",
                                 "Q. Manager"}}) {
    const auto r = run_plumb(step, dir.path());
    INFO(r.err);
    REQUIRE(r.status == 0);
  }
  plumb::test::prepare_login({"--db", db}, dir.path());  // the CLI's member of the refusals below, made now
  return db;
}

httplib::Params pipette_form(const std::string& csrf, const std::string& water_temp = "20C") {
  return {{"pipette", "P-07"}, {"balance", "SM-02"},          {"water_temp", water_temp}, {"pressure", "1013hPa"},
          {"humidity", "50%"}, {"readings", ten_weighings()}, {"on", "2026-12-01"},       {"csrf", csrf}};
}

}  // namespace

TEST_CASE("plumb serve: a pipette check is previewed and recorded by the same code as the CLI", "[web][pipette]") {
  ScratchDir dir;
  const auto db = pipette_lab(dir);
  const auto tina = add_user(db, dir, "tina", "Tina Bench", "technician");
  const auto ada = add_user(db, dir, "ada", "Ada Accounts", "administrator");
  Served served(db, dir);
  Browser b(served.port());
  REQUIRE(b.log_in("tina", tina)->status == 303);
  auto r = b.get("/pipette-checks/new");
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK_THAT(r->body, Catch::Contains("<option value=\"P-07\">P-07 · 100 uL · 1 channel(s) · ISO 8655:2002"));
  CHECK_THAT(r->body, Catch::Contains("<option value=\"SM-02\">SM-02 · d = 0.01 mg"));
  CHECK_THAT(r->body, !Catch::Contains("value=\"P-08\""));
  const std::string csrf = b.csrf_of("/pipette-checks/new");
  Browser admin(served.port());
  REQUIRE(admin.log_in("ada", ada)->status == 303);
  const std::string before = records_of(db);

  // The live preview: the figures worked by hand (above), printed to 4 decimals of a microlitre.
  r = b.post("/pipette-checks/preview", pipette_form(csrf));
  REQUIRE(r);
  const json preview = json::parse(r->body);
  CHECK(preview["message"] == "");
  const std::string html = preview["html"].get<std::string>();
  CHECK_THAT(html, Catch::Contains("<td>100.0153 µL</td>"));
  CHECK_THAT(html, Catch::Contains("<td>+0.0153 µL (+0.015 %)</td>"));
  CHECK_THAT(html, Catch::Contains("<td>0.1048 µL (CV 0.105 %)</td>"));
  CHECK_THAT(html, Catch::Contains("<td>± 0.8 µL</td><td>0.1048"));
  CHECK_THAT(html, Catch::Contains("<td>0.3 µL</td>"));
  CHECK_THAT(html, Catch::Contains("P-07: pass"));

  // A water temperature outside the method's range: the CLI's sentence, beside the field, in both answers.
  dir.write("w.csv", ten_weighings());
  const auto cli = run_plumb(
      {"--db", db, "check", "record", "P-07", "--procedure", "gravimetric", "--balance", "SM-02", "--water-temp", "35C",
       "--pressure", "1013hPa", "--humidity", "50%", "--readings", "w.csv", "--on", "2026-12-01"},
      dir.path());
  const std::string sentence = sentence_of(cli);
  CHECK_THAT(sentence, Catch::StartsWith("--water-temp 35 degC is outside"));
  r = b.post("/pipette-checks/preview", pipette_form(csrf, "35C"));
  REQUIRE(r);
  const json refused = json::parse(r->body);
  CHECK(refused["field"] == "water_temp");
  CHECK(refused["message"] == sentence);
  r = b.post("/pipette-checks", pipette_form(csrf, "35C"));
  REQUIRE(r);
  CHECK(r->status == 400);
  CHECK_THAT(r->body, Catch::Contains("<p class=\"refusal\" id=\"water_temp-error\">" + escaped(sentence) + "</p>"));
  // Too few replicates: the CLI's sentence beside the weighings.
  auto short_form = pipette_form(csrf);
  short_form.erase("readings");
  short_form.emplace("readings", "volume,channel,reading\n100uL,1,0.09971\n100uL,1,0.09965\n");
  r = b.post("/pipette-checks", short_form);
  REQUIRE(r);
  CHECK(r->status == 400);
  CHECK_THAT(r->body, Catch::Contains("<p class=\"refusal\" id=\"readings-error\">readings: test volume 100"));

  // Without JavaScript the "Preview" button posts the form: the same figures, nothing recorded.
  auto no_js = pipette_form(csrf);
  no_js.emplace("intent", "preview");
  r = b.post("/pipette-checks", no_js);
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK_THAT(r->body, Catch::Contains("Preview (nothing recorded yet)") && Catch::Contains("<td>100.0153 µL</td>"));

  // Refused: an administrator does not record checks; a form without the session's token.
  r = admin.post("/pipette-checks", pipette_form(admin.csrf_of("/")));
  REQUIRE(r);
  CHECK(r->status == 403);
  CHECK_THAT(r->body, Catch::Contains("may not run `plumb check record`"));
  CHECK(admin.get("/pipette-checks/new")->status == 403);
  r = b.post("/pipette-checks", pipette_form(""));
  REQUIRE(r);
  CHECK(r->status == 403);
  CHECK(records_of(db) == before);  // no preview, refusal or refused form wrote anything

  r = b.post("/pipette-checks", pipette_form(csrf));
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK_THAT(r->body, Catch::Contains("Check run 2 recorded") && Catch::Contains("P-07: pass"));
  const auto shown = run_plumb({"--db", db, "check", "show", "2", "--format", "json"}, dir.path());
  REQUIRE(shown.status == 0);
  const json j = json::parse(shown.out);
  CHECK(j["operator"] == "Tina Bench");  // the logged-in user
  CHECK(j["procedure"] == "gravimetric");
  CHECK(j["balance"]["id"] == "SM-02");
  CHECK_THAT(j["volumes"][0]["channels"][0]["mean_ul"].get<double>(), microlitres_near(100.01532, ul(0.000005)));
  CHECK_THAT(j["volumes"][0]["channels"][0]["random_error_ul"].get<double>(),
             microlitres_near(0.1048020, ul(0.0000005)));
  CHECK(j["next_due"] == "2027-03-01");
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("plumb serve: a calibration run file is uploaded to the CLI's own calibration code", "[web][calibration]") {
  ScratchDir dir;
  const auto db = plumb::test::calibration_lab(dir).string();
  plumb::test::prepare_login({"--db", db}, dir.path());
  const auto tina = add_user(db, dir, "tina", "Tina Bench", "technician");
  const auto ada = add_user(db, dir, "ada", "Ada Accounts", "administrator");
  Served served(db, dir, {"--body-limit", "8192"});
  Browser b(served.port());
  REQUIRE(b.log_in("tina", tina)->status == 303);
  auto r = b.get("/calibrations/new");
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK_THAT(r->body, Catch::Contains("enctype=\"multipart/form-data\"") && Catch::Contains("type=\"file\""));
  const std::string csrf = b.csrf_of("/calibrations/new");
  const auto form = [&](const std::string& file, const std::string& token) {
    return httplib::MultipartFormDataItems{{"csrf", token, "", ""},
                                           {"balance", "BAL-C", "", ""},
                                           {"on", "2026-11-30", "", ""},
                                           {"run_file", file, "cal.csv", "text/csv"}};
  };
  Browser admin(served.port());
  REQUIRE(admin.log_in("ada", ada)->status == 303);
  const std::string before = records_of(db);

  // A load of a weight the lab does not have: the CLI's sentence (naming the file, line and value) beside the file.
  std::string bad = plumb::test::calibration_run_file();
  bad.replace(bad.find("W100+W50"), 8, "W100+W55");
  dir.write("cal.csv", bad);
  const auto cli = run_plumb({"--db", db, "check", "record", "BAL-C", "--procedure", "calibration", "--readings",
                              "cal.csv", "--on", "2026-11-30"},
                             dir.path());
  const std::string sentence = sentence_of(cli);
  CHECK_THAT(sentence, Catch::StartsWith("cal.csv line") && Catch::Contains("W55"));
  r = b.post_multipart("/calibrations", form(bad, csrf));
  REQUIRE(r);
  CHECK(r->status == 400);
  CHECK_THAT(r->body, Catch::Contains("<p class=\"refusal\" id=\"run_file-error\">" + escaped(sentence) + "</p>"));
  // No file chosen: said beside the file input.
  r = b.post_multipart("/calibrations", {{"csrf", csrf, "", ""}, {"balance", "BAL-C", "", ""}});
  REQUIRE(r);
  CHECK(r->status == 400);
  CHECK_THAT(r->body, Catch::Contains("id=\"run_file-error\">run file: choose the calibration run file"));
  // Over the body limit (8 KiB here): 413 before any of it is read as a run.
  r = b.post_multipart("/calibrations", form(plumb::test::calibration_run_file() + std::string(9000, '\n'), csrf));
  REQUIRE(r);
  CHECK(r->status == 413);
  // Refused: a form without the session's token; an administrator.
  r = b.post_multipart("/calibrations", form(plumb::test::calibration_run_file(), ""));
  REQUIRE(r);
  CHECK(r->status == 403);
  r = admin.post_multipart("/calibrations", form(plumb::test::calibration_run_file(), admin.csrf_of("/")));
  REQUIRE(r);
  CHECK(r->status == 403);
  CHECK(records_of(db) == before);

  r = b.post_multipart("/calibrations", form(plumb::test::calibration_run_file(), csrf));
  REQUIRE(r);
  INFO(r->body);
  CHECK(r->status == 200);
  CHECK_THAT(r->body, Catch::Contains("Check run 1 recorded") && Catch::Contains("BAL-C: pass"));
  const auto shown = run_plumb({"--db", db, "check", "show", "1", "--format", "json"}, dir.path());
  REQUIRE(shown.status == 0);
  const json j = json::parse(shown.out);
  CHECK(j["operator"] == "Tina Bench");
  CHECK(j["procedure"] == "calibration");
  // The run file's indications up (weights with zero correction): E = reading - nominal, by hand 20.0001 - 20 =
  // +0.1 mg and 200.0008 - 200 = +0.8 mg.
  const json& loads = j["as_found"]["loads"];
  REQUIRE(loads.size() == 5);
  CHECK_THAT(loads[0]["error_g"].get<double>(), grams_near(0.0001, mg(0.001)));
  CHECK_THAT(loads[4]["error_g"].get<double>(), grams_near(0.0008, mg(0.001)));
}

TEST_CASE("plumb serve: a run is voided or corrected from its page, with a reason and a signature", "[web][runs]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto tina = add_user(db, dir, "tina", "Tina Bench", "technician");
  const auto rita = add_user(db, dir, "rita", "Rita Review", "reviewer");
  const std::string readings =
      "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";
  dir.write("readings.csv", readings);
  for (int i = 0; i < 2; ++i)
    REQUIRE(run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "readings.csv", "--on",
                       "2026-11-30", "--as", "A. Technician"},
                      dir.path())
                .status == 0);
  plumb::test::prepare_login({"--db", db}, dir.path());
  Served served(db, dir);
  Browser t(served.port()), r(served.port());
  REQUIRE(t.log_in("tina", tina)->status == 303);
  REQUIRE(r.log_in("rita", rita)->status == 303);

  auto page = t.get("/runs/1");
  REQUIRE(page);
  CHECK(page->status == 200);
  CHECK_THAT(page->body, Catch::Contains("Check run 1") && Catch::Contains("counts"));
  CHECK_THAT(page->body, !Catch::Contains("Void this run") && !Catch::Contains("Correct this run"));
  CHECK(t.get("/runs/99")->status == 404);
  page = r.get("/runs/1");
  REQUIRE(page);
  CHECK_THAT(page->body, Catch::Contains("Void this run") && Catch::Contains("Correct this run"));
  const std::string csrf = r.csrf_of("/runs/1");
  const std::string before = records_of(db);

  // A technician may not void (the table of permissions): 403, whatever the form holds.
  auto res = t.post("/runs/1/void", {{"void-reason", "duplicate"}, {"password", tina}, {"csrf", t.csrf_of("/")}});
  REQUIRE(res);
  CHECK(res->status == 403);
  // No token of the session: refused.
  res = r.post("/runs/1/void", {{"void-reason", "duplicate"}, {"password", rita}});
  REQUIRE(res);
  CHECK(res->status == 403);
  // A reason of spaces only: the CLI's sentence beside the reason.
  const std::string no_reason = sentence_of(run_plumb({"--db", db, "check", "void", "1", "--reason", " "}, dir.path()));
  res = r.post("/runs/1/void", {{"void-reason", " "}, {"password", rita}, {"csrf", csrf}});
  REQUIRE(res);
  CHECK(res->status == 400);
  CHECK_THAT(res->body, Catch::Contains("<p class=\"refusal\" id=\"void-reason-error\">" + escaped(no_reason)));
  // A correction naming a weight the lab does not have: the CLI's sentence beside that field.
  const std::string no_weight = sentence_of(run_plumb(
      {"--db", db, "check", "correct", "2", "--weight", "W999", "--reason", "wrong weight noted"}, dir.path()));
  res = r.post(
      "/runs/2/correct",
      {{"correct-reason", "wrong weight noted"}, {"correct-weight", "W999"}, {"password", rita}, {"csrf", csrf}});
  REQUIRE(res);
  CHECK(res->status == 400);
  CHECK_THAT(res->body, Catch::Contains(escaped(no_weight)));
  CHECK(records_of(db) == before);
  // A signature without the right password: refused beside the password; only the failed attempt is recorded (as
  // for a log-in), the run stays as it was.
  res = r.post("/runs/1/void", {{"void-reason", "duplicate"}, {"password", "not-her-password"}, {"csrf", csrf}});
  REQUIRE(res);
  CHECK(res->status == 403);
  CHECK_THAT(res->body, Catch::Contains("<p class=\"refusal\" id=\"void-password-error\">"));
  CHECK(json::parse(run_plumb({"--db", db, "check", "show", "1", "--format", "json"}, dir.path()).out)
            .value("void", json())
            .is_null());

  res = r.post("/runs/1/void", {{"void-reason", "entered twice by mistake"}, {"password", rita}, {"csrf", csrf}});
  REQUIRE(res);
  CHECK(res->status == 303);
  CHECK(res->get_header_value("Location") == "/runs/1");
  page = r.get("/runs/1");
  CHECK_THAT(page->body, Catch::Contains("<p class=\"state\" id=\"standing\" role=\"status\">void</p>"));
  CHECK_THAT(page->body, Catch::Contains("entered twice by mistake"));
  auto shown = run_plumb({"--db", db, "check", "show", "1", "--format", "json"}, dir.path());
  REQUIRE(shown.status == 0);
  CHECK_THAT(shown.out, Catch::Contains("entered twice by mistake"));

  // The correction: reading 4 was mistyped (100.0004 for 100.0000); the new run supersedes run 2. By hand: the sum of
  // the ten readings falls by 0.0004 g, so the mean falls from 100.00023 g to 100.00019 g.
  std::string fixed = readings;
  fixed.replace(fixed.find("100.0004"), 8, "100.0000");
  res = r.post(
      "/runs/2/correct",
      {{"correct-reason", "reading 4 mistyped"}, {"correct-readings", fixed}, {"password", rita}, {"csrf", csrf}});
  REQUIRE(res);
  CHECK(res->status == 303);
  CHECK(res->get_header_value("Location") == "/runs/3");
  shown = run_plumb({"--db", db, "check", "show", "3", "--format", "json"}, dir.path());
  REQUIRE(shown.status == 0);
  const json corrected = json::parse(shown.out);
  CHECK(corrected["supersedes"] == 2);
  CHECK_THAT(corrected["mean_g"].get<double>(), grams_near(100.00019, mg(0.001)));
  CHECK_THAT(r.get("/runs/2")->body, Catch::Contains("corrected by run 3"));
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("plumb serve: the users page is an administrator's, and does what `plumb user` does", "[web][users]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto tina = add_user(db, dir, "tina", "Tina Bench", "technician");
  const auto ada = add_user(db, dir, "ada", "Ada Accounts", "administrator");
  Served served(db, dir);
  Browser a(served.port()), t(served.port());
  REQUIRE(a.log_in("ada", ada)->status == 303);
  REQUIRE(t.log_in("tina", tina)->status == 303);
  auto page = a.get("/users");
  REQUIRE(page);
  CHECK(page->status == 200);
  CHECK_THAT(page->body, Catch::Contains("<th scope=\"row\">tina</th><td>Tina Bench</td>"));
  CHECK_THAT(page->body, Catch::Contains("<a href=\"/users\">Users</a>"));
  const std::string csrf = a.csrf_of("/users");
  const std::string before = records_of(db);

  // Every other role: 403 on the page and on each form, whatever the form holds.
  page = t.get("/users");
  REQUIRE(page);
  CHECK(page->status == 403);
  CHECK_THAT(page->body, Catch::Contains("may not run `plumb user add`"));
  const std::string tina_csrf = t.csrf_of("/");
  const httplib::Params new_user = {{"login", "nora"},
                                    {"name", "Nora Newcomer"},
                                    {"role", "reviewer"},
                                    {"password", "nora-first-password"},
                                    {"password_again", "nora-first-password"}};
  auto with = [](httplib::Params p, const std::string& token) {
    p.emplace("csrf", token);
    return p;
  };
  CHECK(t.post("/users", with(new_user, tina_csrf))->status == 403);
  CHECK(t.post("/users/tina/grant", {{"role", "reviewer"}, {"csrf", tina_csrf}})->status == 403);
  CHECK(t.post("/users/ada/reset",
               {{"password", "x-long-password"}, {"password_again", "x-long-password"}, {"csrf", tina_csrf}})
            ->status == 403);
  // The administrator without the session's token.
  CHECK(a.post("/users", new_user)->status == 403);
  // Bad values: the CLI's sentences beside their fields.
  const std::string bad_login =
      sentence_of(run_plumb({"--db", db, "--as", "Test Administrator", "user", "add", "Nora Z", "--name",
                             "Nora Newcomer", "--role", "reviewer", "--new-password-file", "tina.pw"},
                            dir.path()));
  auto bad = new_user;
  bad.erase("login");
  bad.emplace("login", "Nora Z");
  auto res = a.post("/users", with(bad, csrf));
  REQUIRE(res);
  CHECK(res->status == 400);
  CHECK_THAT(res->body, Catch::Contains("<p class=\"refusal\" id=\"login-error\">" + escaped(bad_login) + "</p>"));
  bad = new_user;
  bad.erase("password_again");
  bad.emplace("password_again", "nora-other-password");
  res = a.post("/users", with(bad, csrf));
  REQUIRE(res);
  CHECK(res->status == 400);
  CHECK_THAT(res->body,
             Catch::Contains("id=\"password-error\">the two passwords typed differ; nothing was changed.</p>"));
  bad = new_user;
  bad.erase("role");
  res = a.post("/users", with(bad, csrf));
  REQUIRE(res);
  CHECK(res->status == 400);
  CHECK_THAT(res->body, Catch::Contains("id=\"role-error\">--role must name at least one role of the new user."));
  res = a.post("/users/tina/deactivate", {{"reason", ""}, {"csrf", csrf}});
  REQUIRE(res);
  CHECK(res->status == 400);
  CHECK_THAT(res->body, Catch::Contains("id=\"deactivate-tina-error\">"));
  CHECK(records_of(db) == before);

  res = a.post("/users", with(new_user, csrf));
  REQUIRE(res);
  CHECK(res->status == 303);
  CHECK(res->get_header_value("Location") == "/users?done=nora");
  res = a.post("/users/tina/deactivate", {{"reason", "left the lab"}, {"csrf", csrf}});
  REQUIRE(res);
  CHECK(res->status == 303);
  const auto listed = run_plumb({"--db", db, "user", "list", "--format", "json"}, dir.path());
  REQUIRE(listed.status == 0);
  INFO(listed.out);
  bool nora = false, tina_off = false;
  const json accounts = json::parse(listed.out);
  for (const auto& u : accounts["users"]) {
    if (u["id"] == "nora") {
      nora =
          u["name"] == "Nora Newcomer" && u["roles"] == json::array({"reviewer"}) && u["must_change_password"] == true;
    }
    if (u["id"] == "tina") tina_off = u["active"] == false;
  }
  CHECK(nora);
  CHECK(tina_off);
  // A printed name holding markup is text on the page, never markup.
  res = a.post("/users", {{"login", "eve"},
                          {"name", "Eve <script>alert(1)</script>"},
                          {"role", "technician"},
                          {"password", "eve-first-password"},
                          {"password_again", "eve-first-password"},
                          {"csrf", csrf}});
  REQUIRE(res);
  page = a.get("/users");
  REQUIRE(page);
  CHECK_THAT(page->body, !Catch::Contains("<script>alert(1)"));
  if (res->status == 303) CHECK_THAT(page->body, Catch::Contains("Eve &lt;script&gt;alert(1)&lt;/script&gt;"));
  // The new account's first password gets the change form, not a session; the deactivated one logs in no more.
  Browser n(served.port());
  res = n.log_in("nora", "nora-first-password");
  REQUIRE(res);
  CHECK_THAT(res->body, Catch::Contains("name=\"new_password\"") || Catch::Contains("new password"));
  CHECK(n.cookies.count("plumb_session") == 0);
  CHECK(t.get("/")->status == 303);
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("plumb serve: without JavaScript the weekly check's Preview button shows the server's preview", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto tina = add_user(db, dir, "tina", "Tina Bench", "technician");
  plumb::test::prepare_login({"--db", db}, dir.path());
  Served served(db, dir);
  Browser b(served.port());
  REQUIRE(b.log_in("tina", tina)->status == 303);
  const std::string csrf = b.csrf_of("/checks/new");
  CHECK_THAT(b.get("/checks/new")->body, Catch::Contains("name=\"intent\" value=\"preview\""));
  const std::string before = records_of(db);
  // The readings of web_server_test.cpp, worked by hand in tests/unit/repeatability_test.cpp: mean 100.00023 g,
  // s = 0.0948683 mg, bias +0.2 mg.
  const std::string readings =
      "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";
  const httplib::Params form = {{"balance", "BAL-A"}, {"weight", "W100"},    {"readings", readings},
                                {"on", "2026-11-30"}, {"intent", "preview"}, {"csrf", csrf}};
  auto r = b.post("/checks", form);
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK_THAT(r->body, Catch::Contains("Preview (nothing recorded yet)") && Catch::Contains("<dd>100.00023 g</dd>") &&
                          Catch::Contains("<dd>0.0949 mg</dd>") && Catch::Contains(">pass</p>"));
  // The form comes back as typed, ready for "Record".
  CHECK_THAT(r->body, Catch::Contains("100.0004\n100.0002"));
  CHECK(records_of(db) == before);
  // A refusal from the Preview button: beside its field, and nothing written.
  auto bad = form;
  bad.erase("readings");
  bad.emplace("readings", "reading\n100.0003\n100.00031\n");
  r = b.post("/checks", bad);
  REQUIRE(r);
  CHECK(r->status == 400);
  CHECK_THAT(r->body, Catch::Contains("<p class=\"refusal\" id=\"readings-error\">readings line 3:"));
  CHECK(records_of(db) == before);
}
