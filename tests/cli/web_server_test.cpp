// plumb serve over HTTP, as a browser and an attacker would reach it: the built binary serves a scratch lab on a free
// port and httplib's client asks it. Status codes, security headers, cookies, log-in and lock-out, CSRF, role
// refusals, escaping, the body limit, the weekly check's preview and record (the same sentence and figures as the
// CLI), approval as an electronic signature, and the CLI writing the same database at the same time.
#include <httplib.h>
#include <sys/stat.h>
#include <catch2/catch.hpp>

#include <csignal>
#include <filesystem>
#include <fstream>
#include <map>
#include <nlohmann/json.hpp>
#include <regex>
#include <thread>

#include "support/margin.hpp"
#include "support/run_plumb.hpp"
#include "support/web_session.hpp"

using nlohmann::json;
using plumb::test::run_plumb;
using plumb::test::ScratchDir;
using plumb::test::web::add_user;
using plumb::test::web::Browser;
using plumb::test::web::Served;
using plumb::test::web::write_private;

namespace {

// The readings of tests/cli/weekly_check_test.cpp, worked by hand in tests/unit/repeatability_test.cpp: mean
// 100.00023 g, s = sqrt(0.9) x 0.1 mg = 0.0948683 mg, bias +0.2 mg against W100's conventional mass 100.00003 g.
const std::string passing_readings =
    "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";

std::string cookie_named(const Browser& b, const std::string& name) {
  for (const auto& c : b.set_cookies)
    if (c.starts_with(name + "=") && c.find("Max-Age=0") == std::string::npos) return c;
  return "";
}

void check_security_headers(const httplib::Response& r) {
  CHECK(r.get_header_value("Content-Security-Policy").find("default-src 'self'; script-src 'self'; style-src 'self'") ==
        0);
  CHECK(r.get_header_value("Content-Security-Policy").find("frame-ancestors 'none'") != std::string::npos);
  CHECK(r.get_header_value("X-Content-Type-Options") == "nosniff");
  CHECK(r.get_header_value("Referrer-Policy") == "no-referrer");
  CHECK(r.get_header_value("X-Frame-Options") == "DENY");
}

}  // namespace

TEST_CASE("plumb serve: pages need a log-in, and every response carries the security headers", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  Served served(db, dir);
  Browser b(served.port());
  auto r = b.get("/");
  REQUIRE(r);
  CHECK(r->status == 303);
  CHECK(r->get_header_value("Location") == "/login");
  check_security_headers(*r);
  r = b.get("/login");
  REQUIRE(r);
  CHECK(r->status == 200);
  check_security_headers(*r);
  CHECK_THAT(r->body, Catch::Contains("<label for=\"password\">Password</label>"));
  // No inline script or style anywhere: the page loads its one style sheet from plumb itself.
  CHECK_THAT(r->body, Catch::Contains("<link rel=\"stylesheet\" href=\"/static/plumb.css\">"));
  CHECK_THAT(r->body, !Catch::Contains("<style") && !Catch::Contains("style=\"") && !Catch::Contains("<script>"));
  r = b.get("/static/plumb.css");
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK(r->get_header_value("Content-Type") == "text/css; charset=utf-8");
  check_security_headers(*r);
  r = b.get("/static/../plumb.db");
  REQUIRE(r);
  CHECK(r->status == 404);
  r = b.get("/instruments/BAL-A");
  REQUIRE(r);
  CHECK(r->status == 303);  // a page of the lab is never shown without a session
}

TEST_CASE("plumb serve: log in with a plumb account, a strict session cookie, log out", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto password = add_user(db, dir, "tina", "Tina Bench", "technician");
  Served served(db, dir);
  Browser b(served.port());
  auto r = b.log_in("tina", "not-her-password");
  REQUIRE(r);
  CHECK(r->status == 401);
  CHECK_THAT(r->body, Catch::Contains("the user id or password is wrong (user tina)."));
  CHECK(b.cookies.count("plumb_session") == 0);

  r = b.log_in("tina", password);
  REQUIRE(r);
  CHECK(r->status == 303);
  const std::string cookie = cookie_named(b, "plumb_session");
  CHECK_THAT(cookie, Catch::Contains("; HttpOnly") && Catch::Contains("; SameSite=Strict"));
  CHECK_THAT(cookie, !Catch::Contains("Secure"));  // plain HTTP here; under TLS it is Secure (next test)
  r = b.get("/");
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK_THAT(r->body, Catch::Contains("Tina Bench"));
  CHECK_THAT(r->body, Catch::Contains("Overview"));

  const std::string csrf = b.csrf_of("/");
  r = b.post("/logout", {{"csrf", csrf}});
  REQUIRE(r);
  CHECK(r->status == 303);
  CHECK(b.cookies.count("plumb_session") == 0);
  // The session is ended on the server too: its token no longer opens a page.
  Browser replay(served.port());
  replay.cookies["plumb_session"] = cookie.substr(14, cookie.find(';') - 14);
  r = replay.get("/");
  REQUIRE(r);
  CHECK(r->status == 303);
  // The log-in and log-out are records of the trail, attributed to tina.
  const auto log = run_plumb({"--db", db, "audit", "log", "--format", "json"}, dir.path());
  REQUIRE(log.status == 0);
  CHECK_THAT(log.out, Catch::Contains("\"actor\": \"Tina Bench\""));
}

TEST_CASE("plumb serve: a session idle past the lab's limit is ended and says so on the log-in page", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto password = add_user(db, dir, "tina", "Tina Bench", "technician");
  Served served(db, dir);
  Browser b(served.port());
  REQUIRE(b.log_in("tina", password)->status == 303);
  REQUIRE(b.get("/")->status == 200);
  // session_activity is operational state (schema/011_users.sql), not a record: backdate the last use by 2 hours,
  // past the default idle limit of 15 minutes.
  const auto r0 = std::system(("sqlite3 " + db +
                               " \"UPDATE session_activity SET last_used_at = "
                               "strftime('%Y-%m-%dT%H:%M:%SZ', 'now', '-2 hours')\"")
                                  .c_str());
  REQUIRE(r0 == 0);
  auto r = b.get("/");
  REQUIRE(r);
  CHECK(r->status == 303);
  CHECK(r->get_header_value("Location") == "/login?idle=1");
  CHECK(b.cookies.count("plumb_session") == 0);
  r = b.get("/login?idle=1");
  REQUIRE(r);
  CHECK_THAT(r->body, Catch::Contains("Your session ended after the lab&#39;s idle time without use; log in again."));
  // The end is recorded in the trail, with why.
  const auto log = run_plumb({"--db", db, "audit", "log", "--format", "json"}, dir.path());
  CHECK_THAT(log.out, Catch::Contains("idle"));
}

TEST_CASE("plumb serve: lock-out after the lab's number of failed log-ins, and a limit per client address", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto password = add_user(db, dir, "tina", "Tina Bench", "technician");
  Served served(db, dir);
  Browser b(served.port());
  for (int i = 0; i < 5; ++i) REQUIRE(b.log_in("tina", "wrong-password-" + std::to_string(i))->status == 401);
  // The sixth try, with the right password, meets the lock (5 failures: the default limit, as for the CLI).
  auto r = b.log_in("tina", password);
  REQUIRE(r);
  CHECK(r->status == 401);
  CHECK_THAT(r->body, Catch::Contains("the account tina is locked after 5 failed log-ins"));
  // Ten attempts a minute from one address, whatever the accounts: the eleventh is refused before any check.
  for (int i = 0; i < 4; ++i) REQUIRE(b.log_in("nobody", "x")->status == 401);
  r = b.log_in("nobody", "x");
  REQUIRE(r);
  CHECK(r->status == 429);
  CHECK_THAT(r->body, Catch::Contains("Too many log-in attempts from this address"));
}

TEST_CASE("plumb serve: every POST needs the CSRF token of its own session", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto tina = add_user(db, dir, "tina", "Tina Bench", "technician");
  const auto rita = add_user(db, dir, "rita", "Rita Review", "reviewer");
  Served served(db, dir);
  Browser t(served.port()), other(served.port());
  REQUIRE(t.log_in("tina", tina)->status == 303);
  REQUIRE(other.log_in("rita", rita)->status == 303);
  const std::string rita_token = other.csrf_of("/");
  const httplib::Params check = {{"balance", "BAL-A"}, {"weight", "W100"}, {"readings", passing_readings}};
  auto r = t.post("/checks", check);
  REQUIRE(r);
  CHECK(r->status == 403);
  CHECK_THAT(r->body, Catch::Contains("security token is missing or does not belong to this session"));
  auto with_other = check;
  with_other.emplace("csrf", rita_token);
  r = t.post("/checks", with_other);
  REQUIRE(r);
  CHECK(r->status == 403);
  // The log-in form's token is bound to its own cookie: without the cookie it is refused.
  Browser stranger(served.port());
  const std::string login_token = stranger.csrf_of("/login");
  stranger.cookies.clear();
  r = stranger.post("/login", {{"login", "tina"}, {"password", tina}, {"csrf", login_token}});
  REQUIRE(r);
  CHECK(r->status == 403);
  // Nothing was recorded by the refused forms.
  CHECK(run_plumb({"--db", db, "check", "show", "LAST"}, dir.path()).status == 2);
}

TEST_CASE("plumb serve: a balance location holding a script is shown as text", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  REQUIRE(
      run_plumb({"--db", db, "balance", "add", "BAL-X", "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
                 "--smallest-net", "200mg", "--location", "<script>alert('x')</script>", "--since", "2026-01-05"},
                dir.path())
          .status == 0);
  const auto password = add_user(db, dir, "tina", "Tina Bench", "technician");
  Served served(db, dir);
  Browser b(served.port());
  REQUIRE(b.log_in("tina", password)->status == 303);
  for (const std::string page : {"/instruments", "/instruments/BAL-X", "/checks/new", "/"}) {
    const auto r = b.get(page);
    REQUIRE(r);
    INFO(page);
    CHECK(r->status == 200);
    CHECK_THAT(r->body, !Catch::Contains("<script>alert"));
  }
  CHECK_THAT(b.get("/instruments")->body, Catch::Contains("&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt;"));
}

TEST_CASE("plumb serve: a request body over the limit is refused with 413", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  Served served(db, dir, {"--body-limit", "65536"});
  Browser b(served.port());
  const auto r = b.post_body("/login", "login=x&password=" + std::string(100000, 'a'));
  REQUIRE(r);
  CHECK(r->status == 413);
  CHECK_THAT(r->body, Catch::Contains("larger than the server's limit of 65536 bytes"));
  check_security_headers(*r);
}

TEST_CASE("plumb serve: a weekly check is previewed and recorded by the same code as the CLI", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto password = add_user(db, dir, "tina", "Tina Bench", "technician");
  Served served(db, dir);
  Browser b(served.port());
  REQUIRE(b.log_in("tina", password)->status == 303);
  const std::string csrf = b.csrf_of("/checks/new");
  const auto form = b.get("/checks/new");
  CHECK_THAT(form->body, Catch::Contains("<option value=\"BAL-A\">BAL-A · Room 2 · overdue</option>"));
  CHECK_THAT(form->body, Catch::Contains("<option value=\"W100\">W100 · 100g · in date</option>"));

  // A reading with more decimals than d = 0.1 mg: the CLI's sentence, word for word, beside the readings.
  const std::string bad = "reading\n100.0003\n100.00031\n";
  auto r = b.post("/checks/preview",
                  {{"balance", "BAL-A"}, {"weight", "W100"}, {"readings", bad}, {"on", "2026-11-30"}, {"csrf", csrf}});
  REQUIRE(r);
  const json refused = json::parse(r->body);
  dir.write("readings", bad);
  const auto cli = run_plumb(
      {"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "readings", "--on", "2026-11-30"},
      dir.path());
  REQUIRE(cli.status == 2);
  CHECK(refused["field"] == "readings");
  CHECK("plumb: " + refused["message"].get<std::string>() + "\n" == cli.err);
  CHECK_THAT(refused["message"].get<std::string>(), Catch::StartsWith("readings line 3:"));

  r = b.post(
      "/checks/preview",
      {{"balance", "BAL-A"}, {"weight", "W100"}, {"readings", passing_readings}, {"on", "2026-11-30"}, {"csrf", csrf}});
  REQUIRE(r);
  const json preview = json::parse(r->body);
  CHECK(preview["message"] == "");
  // The figures worked by hand (above), shown to d/10 and in mg for s and bias.
  CHECK_THAT(preview["html"].get<std::string>(), Catch::Contains("<dt>n</dt><dd>10</dd>"));
  CHECK_THAT(preview["html"].get<std::string>(), Catch::Contains("<dd>100.00023 g</dd>"));
  CHECK_THAT(preview["html"].get<std::string>(), Catch::Contains("<dd>0.0949 mg</dd>"));
  CHECK_THAT(preview["html"].get<std::string>(), Catch::Contains("<dd>0.2000 mg</dd>"));
  CHECK_THAT(preview["html"].get<std::string>(), Catch::Contains(">pass</p>"));
  CHECK(run_plumb({"--db", db, "check", "show", "LAST"}, dir.path()).status == 2);  // a preview records nothing

  // Without JavaScript: the form posts, a refusal comes back beside its field, and a good check is recorded.
  r = b.post("/checks",
             {{"balance", "BAL-A"}, {"weight", "W100"}, {"readings", bad}, {"on", "2026-11-30"}, {"csrf", csrf}});
  REQUIRE(r);
  CHECK(r->status == 400);
  CHECK_THAT(r->body, Catch::Contains("<p class=\"refusal\" id=\"readings-error\">readings line 3:"));
  r = b.post(
      "/checks",
      {{"balance", "BAL-A"}, {"weight", "W100"}, {"readings", passing_readings}, {"on", "2026-11-30"}, {"csrf", csrf}});
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK_THAT(r->body, Catch::Contains("Check run 1 recorded"));
  CHECK_THAT(r->body, Catch::Contains("BAL-A: pass"));
  const auto shown = run_plumb({"--db", db, "check", "show", "1", "--format", "json"}, dir.path());
  REQUIRE(shown.status == 0);
  const json run = json::parse(shown.out);
  CHECK(run["operator"] == "Tina Bench");  // the logged-in user, never a form field
  CHECK_THAT(run["mean_g"].get<double>(), plumb::test::within_fraction_of_d(100.00023, plumb::test::mg(0.1), 100));
  CHECK(run["verdict"] == "pass");
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);

  // The instrument's page draws the recorded run inline: an SVG whose labels are text, with no style attribute the
  // page's CSP would block, and one dot per result (one run: one circle in the bias chart).
  const auto page = b.get("/instruments/BAL-A");
  REQUIRE(page);
  CHECK(page->status == 200);
  const std::string& body = page->body;
  const auto svg = body.find("<figure class=\"chart\"><svg ");
  REQUIRE(svg != std::string::npos);
  const std::string chart = body.substr(svg, body.find("</figure>", svg) - svg);
  CHECK_THAT(chart, Catch::Contains("<text") && Catch::Contains("BAL-A"));
  CHECK_THAT(chart, !Catch::Contains("style=") && !Catch::Contains("<symbol"));
  CHECK_THAT(body, !Catch::Contains("<img src=\"/instruments/BAL-A/chart/"));
}

TEST_CASE("plumb serve: a technician cannot approve, a reviewer signs with the password and a meaning", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto tina = add_user(db, dir, "tina", "Tina Bench", "technician");
  const auto rita = add_user(db, dir, "rita", "Rita Review", "reviewer");
  Served served(db, dir);
  Browser t(served.port());
  REQUIRE(t.log_in("tina", tina)->status == 303);
  const std::string csrf = t.csrf_of("/checks/new");
  REQUIRE(t.post("/checks", {{"balance", "BAL-A"},
                             {"weight", "W100"},
                             {"readings", passing_readings},
                             {"on", "2026-11-30"},
                             {"csrf", csrf}})
              ->status == 200);
  auto r = t.post("/certificates/issue", {{"run", "1"}, {"csrf", csrf}});
  REQUIRE(r);
  REQUIRE(r->status == 303);
  const std::string page = r->get_header_value("Location");
  const std::string number = page.substr(page.rfind('/') + 1);
  r = t.get(page);
  CHECK_THAT(r->body, Catch::Contains("draft"));
  CHECK_THAT(r->body, !Catch::Contains("Approve and sign"));  // not offered to a technician ...
  r = t.post(page + "/approve", {{"password", tina}, {"meaning", "reviewed and approved"}, {"csrf", csrf}});
  REQUIRE(r);
  CHECK(r->status == 403);  // ... and refused when sent anyway
  CHECK_THAT(r->body, Catch::Contains("user tina may not run `plumb certificate approve`"));

  Browser v(served.port());
  REQUIRE(v.log_in("rita", rita)->status == 303);
  const std::string rita_csrf = v.csrf_of(page);
  CHECK_THAT(v.get("/certificates")->body, Catch::Contains(number));  // in the queue
  r = v.post(page + "/approve",
             {{"password", "wrong-password"}, {"meaning", "reviewed and approved"}, {"csrf", rita_csrf}});
  REQUIRE(r);
  CHECK(r->status == 403);
  CHECK_THAT(r->body, Catch::Contains("id=\"password-error\">the user id or password is wrong (user rita)."));
  r = v.post(page + "/approve", {{"password", rita}, {"meaning", "reviewed and approved"}, {"csrf", rita_csrf}});
  REQUIRE(r);
  CHECK(r->status == 303);
  r = v.get(page);
  CHECK_THAT(r->body, Catch::Contains(">approved</p>"));
  CHECK_THAT(r->body, Catch::Contains("Rita Review"));
  const auto cli = run_plumb({"--db", db, "certificate", "show", number, "--format", "json"}, dir.path());
  REQUIRE(cli.status == 0);
  const json shown = json::parse(cli.out);
  CHECK(shown["status"]["state"] == "approved");
  CHECK(shown["status"]["approval"]["by"] == "Rita Review");
  CHECK(shown["status"]["approval"]["meaning"] == "reviewed and approved");

  r = v.get(page + "/download/pdf");
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK(r->get_header_value("Content-Type") == "application/pdf");
  CHECK(r->body.starts_with("%PDF-"));
  r = v.get(page + "/document");
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK(r->get_header_value("Content-Security-Policy").find("default-src 'none'") == 0);
  CHECK_THAT(r->body, Catch::Contains(number));

  // Voiding the run is a signature too: without a reason the app's sentence comes back beside the reason.
  r = v.post(page + "/void", {{"password", rita}, {"reason", ""}, {"csrf", rita_csrf}});
  REQUIRE(r);
  CHECK(r->status == 400);
  CHECK_THAT(r->body, Catch::Contains("id=\"reason-error\">"));
  r = v.post(page + "/void", {{"password", rita}, {"reason", "entered on the wrong balance"}, {"csrf", rita_csrf}});
  REQUIRE(r);
  CHECK(r->status == 303);
  CHECK_THAT(v.get(page)->body, Catch::Contains(">withdrawn</p>") && Catch::Contains("entered on the wrong balance"));
  const auto voided = run_plumb({"--db", db, "check", "show", "1", "--format", "json"}, dir.path());
  CHECK(json::parse(voided.out)["void"]["by"] == "Rita Review");
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("plumb serve and the CLI record into the same database at once without a lock error or a lost run", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto password = add_user(db, dir, "tina", "Tina Bench", "technician");
  dir.write("readings.csv", passing_readings);
  // The CLI's member is created before the race, so that both sides only record checks.
  plumb::test::prepare_login({"--db", db}, dir.path());
  Served served(db, dir);
  constexpr int each = 6;
  std::vector<int> web_status, cli_status;
  std::thread web([&] {
    Browser b(served.port());
    if (b.log_in("tina", password)->status != 303) return;
    const std::string csrf = b.csrf_of("/checks/new");
    for (int i = 0; i < each; ++i) {
      const auto r = b.post("/checks", {{"balance", "BAL-A"},
                                        {"weight", "W100"},
                                        {"readings", passing_readings},
                                        {"on", "2026-11-30"},
                                        {"csrf", csrf}});
      web_status.push_back(r ? r->status : -1);
    }
  });
  std::string cli_errors;
  for (int i = 0; i < each; ++i) {
    const auto r = run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "readings.csv",
                              "--on", "2026-11-29"},
                             dir.path());
    cli_status.push_back(r.status);
    cli_errors += r.err;
  }
  INFO(cli_errors);
  web.join();
  CHECK(web_status == std::vector<int>(each, 200));
  CHECK(cli_status == std::vector<int>(each, 0));
  // Every run is there, numbered 1 to 12 without a gap, and the trail verifies.
  for (int id = 1; id <= 2 * each; ++id)
    CHECK(run_plumb({"--db", db, "check", "show", std::to_string(id)}, dir.path()).status == 0);
  CHECK(run_plumb({"--db", db, "check", "show", std::to_string(2 * each + 1)}, dir.path()).status == 2);
  CHECK(run_plumb({"--db", db, "audit", "verify"}, dir.path()).status == 0);
}

TEST_CASE("plumb serve: an account reset by an administrator must change its password before a session", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  write_private(dir, "first.pw", "first-password-given\n");
  REQUIRE(run_plumb({"--db", db, "--as", "Test Administrator", "user", "add", "tina", "--name", "Tina Bench", "--role",
                     "technician", "--new-password-file", "first.pw"},
                    dir.path())
              .status == 0);
  Served served(db, dir);
  Browser b(served.port());
  auto r = b.log_in("tina", "first-password-given");
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK_THAT(r->body, Catch::Contains("An administrator set your password: choose a new one"));
  CHECK(b.cookies.count("plumb_session") == 0);  // no session until it is changed
  std::smatch m;
  REQUIRE(std::regex_search(r->body, m, std::regex(R"re(name="csrf" value="([0-9a-f]{64})")re")));
  const std::string csrf = m[1].str();
  r = b.post("/password", {{"login", "tina"},
                           {"current", "first-password-given"},
                           {"new_password", "tinas-own-password"},
                           {"repeat", "tinas-own-passwrod"},
                           {"csrf", csrf}});
  REQUIRE(r);
  CHECK(r->status == 400);
  CHECK_THAT(r->body, Catch::Contains("id=\"repeat-error\">The new password and its repetition differ."));
  REQUIRE(std::regex_search(r->body, m, std::regex(R"re(name="csrf" value="([0-9a-f]{64})")re")));
  r = b.post("/password", {{"login", "tina"},
                           {"current", "first-password-given"},
                           {"new_password", "tinas-own-password"},
                           {"repeat", "tinas-own-password"},
                           {"csrf", m[1].str()}});
  REQUIRE(r);
  CHECK(r->status == 303);
  CHECK(r->get_header_value("Location") == "/login?changed=1");
  CHECK(b.log_in("tina", "first-password-given")->status == 401);
  CHECK(b.log_in("tina", "tinas-own-password")->status == 303);
  CHECK(b.get("/")->status == 200);
}

TEST_CASE("plumb serve: under TLS the session cookie is Secure and HSTS is sent", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto password = add_user(db, dir, "tina", "Tina Bench", "technician");
  const std::string key = dir.file("tls.key").string(), cert = dir.file("tls.crt").string();
  REQUIRE(std::system(("openssl req -x509 -newkey ec -pkeyopt ec_paramgen_curve:P-256 -nodes -days 2 -subj "
                       "/CN=127.0.0.1 -keyout " +
                       key + " -out " + cert + " 2>/dev/null")
                          .c_str()) == 0);
  Served served(db, dir, {"--tls-cert", cert, "--tls-key", key});
  Browser b(served.port(), "https");
  auto r = b.log_in("tina", password);
  REQUIRE(r);
  CHECK(r->status == 303);
  CHECK_THAT(cookie_named(b, "plumb_session"), Catch::Contains("; HttpOnly; SameSite=Strict; Secure"));
  r = b.get("/");
  REQUIRE(r);
  CHECK(r->status == 200);
  CHECK(r->get_header_value("Strict-Transport-Security") == "max-age=31536000");
  // A certificate without its key is refused before anything listens.
  const auto refused = run_plumb({"--db", db, "serve", "--port", "0", "--tls-cert", cert}, dir.path());
  CHECK(refused.status == 2);
  CHECK(refused.err == "plumb: --tls-cert and --tls-key go together: give both (PEM files) or neither.\n");
}

namespace {

/// The sequence numbers of the audit table on an instrument's page, in the order shown.
std::vector<std::int64_t> audit_rows_shown(const std::string& page) {
  std::vector<std::int64_t> seqs;
  const auto at = page.find("Audit records concerning");
  REQUIRE(at != std::string::npos);
  const std::string table = page.substr(at, page.find("</table>", at) - at);
  const std::regex row(R"(<tr><th scope="row">(\d+)</th>)");
  for (auto it = std::sregex_iterator(table.begin(), table.end(), row); it != std::sregex_iterator(); ++it)
    seqs.push_back(std::stoll((*it)[1].str()));
  return seqs;
}

/// The number on the overview's tile `label`.
int tile_count(const std::string& page, const std::string& label) {
  std::smatch m;
  REQUIRE(std::regex_search(
      page, m, std::regex(R"(<span class="count">(\d+)</span> <span class="label">)" + label + "</span>")));
  return std::stoi(m[1].str());
}

}  // namespace

TEST_CASE("plumb serve: an instrument's audit trail is its own records only, newest first, a page at a time", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto password = add_user(db, dir, "tina", "Tina Bench", "technician");
  REQUIRE(run_plumb({"--db", db, "balance", "add", "BAL-B", "--capacity", "220g", "--readability", "0.1mg", "--every",
                     "7d", "--smallest-net", "200mg", "--location", "Room 3", "--since", "2026-01-05"},
                    dir.path())
              .status == 0);
  // 110 weekly checks of BAL-A (one record each) and 5 of BAL-B, imported as a history (from W100's calibration on).
  std::string history = "instrument,procedure,date,operator,weight,reading,unit\n";
  const auto add_run = [&](const std::string& id, int week) {
    for (const char* reading : {"100.0003", "100.0001", "100.0002", "100.0004", "100.0002", "100.0003", "100.0001",
                                "100.0002", "100.0003", "100.0002"})
      history += fmt::format("{},repeatability,{},Ann Operator,W100,{},g\n", id,
                             fmt::format("2026-{:02d}-{:02d}", 3 + week / 28, 2 + week % 28), reading);
  };
  for (int week = 0; week < 110; ++week) add_run("BAL-A", week);
  for (int week = 0; week < 5; ++week) add_run("BAL-B", week);
  dir.write("history.csv", history);
  const auto imported = run_plumb({"--db", db, "check", "import", "history.csv"}, dir.path());
  INFO(imported.err);
  REQUIRE(imported.status == 0);
  // What the CLI says are BAL-A's and BAL-B's records (the whole of each, oldest first).
  const auto seqs_of = [&](const std::string& id) {
    const auto r = run_plumb({"--db", db, "audit", "log", "--instrument", id, "--format", "json"}, dir.path());
    REQUIRE(r.status == 0);
    const json log = json::parse(r.out);
    std::vector<std::int64_t> seqs;
    for (const auto& record : log["records"]) seqs.push_back(record["seq"].get<std::int64_t>());
    return seqs;
  };
  const auto a = seqs_of("BAL-A"), b = seqs_of("BAL-B");
  REQUIRE(a.size() > 110);  // registered, and its 110 runs
  REQUIRE(b.size() > 5);

  Served served(db, dir);
  Browser browser(served.port());
  REQUIRE(browser.log_in("tina", password)->status == 303);
  auto r = browser.get("/instruments/BAL-A");
  REQUIRE(r);
  REQUIRE(r->status == 200);
  // The newest 100 of BAL-A's records, newest first, none of BAL-B's, and a link to the older ones.
  const auto first = audit_rows_shown(r->body);
  const std::vector<std::int64_t> newest(a.rbegin(), a.rbegin() + 100);
  CHECK(first == newest);
  for (const auto seq : b) CHECK(std::find(first.begin(), first.end(), seq) == first.end());
  CHECK_THAT(r->body, Catch::Contains(fmt::format("{} records, newest first", a.size())));
  const std::string older = fmt::format("/instruments/BAL-A?audit_before={}#audit", newest.back());
  CHECK_THAT(r->body, Catch::Contains("href=\"" + older + "\">Older records</a>"));
  // The next page: the rest, still newest first, with no further page.
  r = browser.get(fmt::format("/instruments/BAL-A?audit_before={}", newest.back()));
  REQUIRE(r);
  REQUIRE(r->status == 200);
  const auto second = audit_rows_shown(r->body);
  CHECK(second == std::vector<std::int64_t>(a.rbegin() + 100, a.rend()));
  CHECK_THAT(r->body, !Catch::Contains("Older records"));
  CHECK_THAT(r->body, Catch::Contains("href=\"/instruments/BAL-A#audit\">Newest records</a>"));
  // BAL-B's page: exactly its records.
  r = browser.get("/instruments/BAL-B");
  REQUIRE(r);
  CHECK(audit_rows_shown(r->body) == std::vector<std::int64_t>(b.rbegin(), b.rend()));
  // A page number that is not one is refused with the sentence, not ignored.
  r = browser.get("/instruments/BAL-A?audit_before=12x");
  REQUIRE(r);
  CHECK(r->status == 400);
  CHECK_THAT(r->body, Catch::Contains("the audit record &quot;12x&quot; to page back from is not a record number"));
}

TEST_CASE("plumb serve: the overview shows on its next load what the CLI recorded while it runs", "[web]") {
  ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const auto password = add_user(db, dir, "tina", "Tina Bench", "technician");
  dir.write("readings.csv", passing_readings);
  Served served(db, dir);
  Browser browser(served.port());
  REQUIRE(browser.log_in("tina", password)->status == 303);
  // BAL-A (every 7 days since 2026-01-05, never checked) is overdue.
  auto r = browser.get("/");
  REQUIRE(r);
  CHECK(tile_count(r->body, "overdue") == 1);
  CHECK(tile_count(r->body, "due within 14 days") == 0);
  r = browser.get("/");  // the same page again, from what was kept
  CHECK(tile_count(r->body, "overdue") == 1);
  // A weekly check recorded by the CLI today: BAL-A is due again in 7 days, within the overview's 14.
  REQUIRE(
      run_plumb({"--db", db, "check", "record", "BAL-A", "--weight", "W100", "--readings", "readings.csv"}, dir.path())
          .status == 0);
  r = browser.get("/");
  REQUIRE(r);
  CHECK(tile_count(r->body, "overdue") == 0);
  CHECK(tile_count(r->body, "due within 14 days") == 1);
  CHECK_THAT(r->body, Catch::Contains("last passed"));
  // Another kind of change (a balance registered): read again whole; the new one, never checked, is overdue.
  REQUIRE(run_plumb({"--db", db, "balance", "add", "BAL-B", "--capacity", "220g", "--readability", "0.1mg", "--every",
                     "7d", "--smallest-net", "200mg", "--location", "Room 3", "--since", "2026-01-05"},
                    dir.path())
              .status == 0);
  r = browser.get("/");
  REQUIRE(r);
  CHECK(tile_count(r->body, "overdue") == 1);
  CHECK(tile_count(r->body, "due within 14 days") == 1);
  CHECK_THAT(r->body, Catch::Contains("href=\"/instruments/BAL-B\""));
  // And a retirement: BAL-B is counted as retired, not overdue.
  REQUIRE(run_plumb({"--db", db, "instrument", "retire", "BAL-B", "--reason", "replaced"}, dir.path()).status == 0);
  r = browser.get("/");
  REQUIRE(r);
  CHECK(tile_count(r->body, "overdue") == 0);
  CHECK(tile_count(r->body, "retired") == 1);
}
