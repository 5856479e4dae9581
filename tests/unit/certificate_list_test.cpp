// The standing of certificates in the app layer: which state wins when a certificate has several events, the
// words a filter accepts, and a withdrawn certificate (its run voided; the store's withdrawal written here as
// voiding a run writes it) listed as withdrawn, out of the approval queue, refused for approval and shown as
// withdrawn.
#include <SQLiteCpp/Transaction.h>

#include <catch2/catch.hpp>

#include "app/certificates/issue.hpp"
#include "app/certificates/list.hpp"
#include "app/certificates/review.hpp"
#include "app/certificates/state.hpp"
#include "app/registry/balances.hpp"
#include "app/registry/lab.hpp"
#include "app/registry/weights.hpp"
#include "app/weekly_check/record.hpp"
#include "core/errors.hpp"
#include "report/certificates/status_text.hpp"
#include "store/status_events.hpp"
#include "support/registry_inputs.hpp"
#include "support/run_plumb.hpp"

using namespace plumb;
using app::CertificateState;

namespace {

const store::Actor quality{"Q. Manager", "tester"};
const store::Actor operator_actor{"A. Technician", "tester"};

std::vector<std::string> numbers(const std::vector<report::CertificateListItem>& items) {
  std::vector<std::string> out;
  for (const auto& c : items) out.push_back(c.number);
  return out;
}

using Numbers = std::vector<std::string>;

}  // namespace

TEST_CASE("certificate states: a withdrawal outranks a supersession, which outranks an approval",
          "[certificate-list]") {
  CHECK(app::certificate_state(false, false, false) == CertificateState::draft);
  CHECK(app::certificate_state(true, false, false) == CertificateState::approved);
  CHECK(app::certificate_state(true, true, false) == CertificateState::superseded);
  CHECK(app::certificate_state(false, true, false) == CertificateState::superseded);
  CHECK(app::certificate_state(true, true, true) == CertificateState::withdrawn);
  CHECK(app::certificate_state(false, false, true) == CertificateState::withdrawn);
  for (const char* word : {"draft", "approved", "superseded", "withdrawn"})
    CHECK(app::state_key(app::parse_certificate_state(word, "--state")) == word);
  CHECK_THROWS_WITH(
      app::parse_certificate_state("Approved", "--state"),
      Catch::Contains("--state \"Approved\"") && Catch::Contains("draft, approved, superseded or withdrawn"));
}

TEST_CASE("a withdrawn certificate is listed as withdrawn, leaves the queue and cannot be approved",
          "[certificate-list]") {
  test::ScratchDir dir;
  store::Database db(dir.file("lab.db"), store::Database::Open::create);
  app::init_lab(db, quality, "Withdrawal Lab");
  app::add_weight(db, quality, test::e2_weight("W100", "100g", "RC-2291", "2026-03-02", "2027-03-02"));
  app::add_balance(db, quality, test::usp41_balance("BAL-A", "7d", "2026-01-05"));
  app::CheckInput check;
  check.instrument_id = "BAL-A";
  check.weight_ids = {"W100"};
  check.readings_csv =
      "reading\n100.0003\n100.0001\n100.0002\n100.0004\n100.0002\n100.0003\n100.0001\n100.0002\n100.0003\n100.0002\n";
  check.readings_source = "r.csv";
  check.operator_name = "A. Technician";
  for (const char* on : {"2026-11-23", "2026-11-30"}) {
    check.on = on;
    app::record_check(db, operator_actor, check);
  }
  const auto first = app::issue_certificate(db, quality, "1", std::nullopt).certificate;
  const auto second = app::issue_certificate(db, quality, "2", std::nullopt).certificate;
  REQUIRE(first.number == "BC-2026-0001");
  REQUIRE(second.number == "BC-2026-0002");
  {
    SQLite::Transaction tx(db.sql());
    store::Recorder rec(db.sql(), quality);
    store::add_certificate_withdrawal(rec, first.id, "run 1 entered against the wrong balance");
    rec.commit(tx);  // signed like every command
  }

  const auto withdrawn = app::list_certificates(db, {std::string("withdrawn"), {}, {}, {}});
  REQUIRE(numbers(withdrawn.items) == Numbers{"BC-2026-0001"});
  CHECK(withdrawn.items[0].state == "withdrawn");
  CHECK(withdrawn.items[0].withdrawn_reason == "run 1 entered against the wrong balance");
  CHECK(withdrawn.scope == "state withdrawn");
  CHECK(numbers(app::list_certificates(db, {std::string("draft"), {}, {}, {}}).items) == Numbers{"BC-2026-0002"});
  CHECK(numbers(app::approval_queue(db, std::nullopt, std::nullopt).items) == Numbers{"BC-2026-0002"});

  CHECK_THROWS_WITH(
      app::approve_certificate(db, quality, "BC-2026-0001", "reviewed and approved"),
      Catch::Contains("BC-2026-0001 was withdrawn") && Catch::Contains("run 1 entered against the wrong balance"));

  const auto status = app::certificate_status(db, first);
  CHECK(status["state"] == "withdrawn");
  CHECK(status["withdrawn"]["reason"] == "run 1 entered against the wrong balance");
  CHECK_THAT(report::certificate_status_line(status), Catch::StartsWith("WITHDRAWN on "));
  CHECK_THAT(report::certificate_status_summary(status), Catch::StartsWith("WITHDRAWN on "));

  // Filters in words and refusals naming the option.
  CHECK(app::list_certificates(db, {{}, std::string("BAL-A"), std::string("2026-01-01"), {}}).scope ==
        "instrument BAL-A, issued from 2026-01-01");
  CHECK_THROWS_WITH(app::list_certificates(db, {{}, std::string("BAL-Z"), {}, {}}),
                    Catch::Contains("--instrument \"BAL-Z\" is not a registered instrument"));
  CHECK_THROWS_WITH(app::list_certificates(db, {{}, {}, std::string("2026-12-05"), std::string("2026-12-01")}),
                    Catch::Contains("--from 2026-12-05 is after --to 2026-12-01"));
}
