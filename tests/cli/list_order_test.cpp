// Every list of ids in one order (core/natural_order.hpp): weights by nominal mass then id, instruments by natural
// order of their ids, in weight list, balance list, summary, due and the CSV outputs.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include <string>
#include <vector>

#include "support/run_plumb.hpp"

using nlohmann::json;
using plumb::test::run_plumb;

namespace {

std::string lab_with_awkward_ids(const plumb::test::ScratchDir& dir) {
  const std::string db = dir.file("lab.db").string();
  std::vector<std::vector<std::string>> steps = {{"--db", db, "init", "--lab", "Example Analytical Lab"}};
  // Registered in byte order, which is the wrong order to read them in. R 111 class F1 (from memory): MPE 0.020 mg
  // at 1 mg, 0.20 mg at 10 g, 0.5 mg at 100 g; U below a third of each.
  for (const auto& [id, nominal, u] :
       std::vector<std::tuple<std::string, std::string, std::string>>{{"W100G", "100g", "0.1mg"},
                                                                      {"W10G", "10g", "0.05mg"},
                                                                      {"W1MG", "1mg", "0.005mg"},
                                                                      {"A-REF", "10g", "0.05mg"}})
    steps.push_back({"--db",
                     db,
                     "weight",
                     "add",
                     id,
                     "--nominal",
                     nominal,
                     "--class",
                     "F1",
                     "--correction",
                     "0mg",
                     "--uncertainty",
                     u,
                     "--k",
                     "2",
                     "--certificate",
                     "RC-" + id,
                     "--calibrated",
                     "2026-01-10",
                     "--due",
                     "2027-01-10"});
  for (const char* id : {"BAL-10", "BAL-100", "BAL-9", "bal-2"})
    steps.push_back({"--db", db, "balance", "add", id, "--capacity", "220g", "--readability", "0.1mg", "--every", "7d",
                     "--smallest-net", "200mg", "--since", "2026-11-01"});
  for (const auto& s : steps) {
    const auto r = run_plumb(s, dir.path());
    INFO(r.err);
    REQUIRE(r.status == 0);
  }
  return db;
}

std::vector<std::string> ids_of(const json& list, const char* key = "id") {
  std::vector<std::string> ids;
  for (const auto& item : list) ids.push_back(item[key].get<std::string>());
  return ids;
}

}  // namespace

TEST_CASE("weights are listed by nominal mass, then id", "[cli][list-order]") {
  plumb::test::ScratchDir dir;
  const auto db = lab_with_awkward_ids(dir);
  const auto r = run_plumb({"--db", db, "weight", "list", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  // 1 mg, then the two 10 g weights by id (A-REF before W10G), then 100 g.
  CHECK(ids_of(json::parse(r.out)) == std::vector<std::string>{"W1MG", "A-REF", "W10G", "W100G"});
  const auto text = run_plumb({"--db", db, "weight", "list"}, dir.path());
  REQUIRE(text.status == 0);
  CHECK(text.out.find("W1MG") < text.out.find("W10G"));
  CHECK(text.out.find("W10G") < text.out.find("W100G"));
}

TEST_CASE("instruments are listed in natural order of their ids everywhere", "[cli][list-order]") {
  plumb::test::ScratchDir dir;
  const auto db = lab_with_awkward_ids(dir);
  const std::vector<std::string> expected = {"bal-2", "BAL-9", "BAL-10", "BAL-100"};

  auto r = run_plumb({"--db", db, "balance", "list", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK(ids_of(json::parse(r.out)) == expected);

  r = run_plumb({"--db", db, "summary", "--on", "2026-12-01", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK(ids_of(json::parse(r.out)["instruments"]) == expected);

  // All four are overdue by the same 30 days (never checked, due from 2026-11-01): the tie keeps natural order.
  r = run_plumb({"--db", db, "due", "--on", "2026-12-01", "--format", "json"}, dir.path());
  REQUIRE(r.status == 0);
  std::vector<std::string> balances;
  const json due = json::parse(r.out);
  for (const auto& i : due["items"])
    if (i["kind"] == "balance") balances.push_back(i["id"].get<std::string>());
  CHECK(balances == expected);

  r = run_plumb({"--db", db, "summary", "--on", "2026-12-01", "--format", "csv"}, dir.path());
  REQUIRE(r.status == 0);
  CHECK(r.out.find("\nbal-2,") < r.out.find("\nBAL-9,"));
  CHECK(r.out.find("\nBAL-9,") < r.out.find("\nBAL-10,"));
  CHECK(r.out.find("\nBAL-10,") < r.out.find("\nBAL-100,"));
}
