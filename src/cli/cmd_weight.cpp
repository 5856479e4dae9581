#include <fmt/ostream.h>

#include <cstdlib>

#include "app/registry/weight_dcc.hpp"
#include "app/registry/weight_details.hpp"
#include "app/registry/weight_properties.hpp"
#include "app/registry/weights.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "report/registry/lists.hpp"
#include "report/registry/weight_details.hpp"
#include "store/repository.hpp"

namespace plumb::cli {
namespace {

void add_override_reason_option(po::options_description& d) {
  d.add_options()("override-reason", po::value<std::string>(),
                  "accept a certificate outside the class limits of OIML R 111-1:2004 (|correction| <= MPE, "
                  "U for k = 2 <= MPE / 3); the reason is recorded and shown by `weight show`");
}

void add_properties_options(po::options_description& d, const char* density_help) {
  d.add_options()("density", po::value<std::string>(), density_help)(
      "density-u", po::value<std::string>(), "standard uncertainty of --density with its unit, e.g. 5kg/m3")(
      "density-class", po::value<std::string>(),
      "instead of --density: the OIML R 111 class whose density limits (OIML R 111-1:2004 Table 5) stand for it")(
      "drift", po::value<std::string>(),
      "drift allowance D with its unit, e.g. 0.02mg: the largest change expected between calibrations, used "
      "(rectangular, EURAMET cg-18) where the certificate history gives no estimate");
}

app::WeightPropertiesInput properties_input(const po::variables_map& vm) {
  return {optional_string(vm, "density"), optional_string(vm, "density-u"), optional_string(vm, "density-class"),
          optional_string(vm, "drift")};
}

Command set_properties_command() {
  return {"weight",
          "set-properties",
          "state a reference weight's density (with its uncertainty) or density class, and its drift allowance, for "
          "the buoyancy and drift terms of a calibration budget (earlier statements are kept)",
          "plumb weight set-properties W100 --density 7950kg/m3 --density-u 5kg/m3 --drift 0.02mg\n  plumb weight "
          "set-properties W1 --density-class E2",
          [](po::options_description& d, po::positional_options_description& p) {
            d.add_options()("id", po::value<std::string>()->required(), "weight id (positional)");
            add_properties_options(d, "density with its unit, e.g. 7950kg/m3 (needs --density-u)");
            p.add("id", 1);
          },
          [](const po::variables_map& vm, Env& env) {
            const auto in = properties_input(vm);
            auto db = env.open();
            const auto p = app::set_weight_properties(db, env.actor(db), vm["id"].as<std::string>(), in);
            fmt::print(env.out, "Weight {}: {}; drift allowance {}.\n", p.weight_id,
                       p.density_kg_m3 ? fmt::format("density {} kg/m3, u {} kg/m3", p.density_kg_m3->to_string(),
                                                     p.u_density_kg_m3->to_string())
                                       : fmt::format("density from the limits of class {} (OIML R 111-1:2004 "
                                                     "Table 5)",
                                                     *p.density_class),
                       p.drift ? p.drift->to_string() : "none stated");
            return 0;
          }};
}

/// The typed certificate options of `weight recalibrate`: required unless --from-dcc reads them from a file.
constexpr const char* typed_certificate_options[] = {"certificate", "calibrated", "uncertainty"};

app::WeightCertificateInput typed_certificate(const po::variables_map& vm) {
  for (const char* name : typed_certificate_options)
    if (!vm.count(name))
      throw InputError(
          fmt::format("the option '--{}' is required but missing (or read the certificate from its DCC "
                      "with --from-dcc FILE).",
                      name));
  if (!vm.count("due")) throw InputError("the option '--due' is required but missing.");
  app::WeightCertificateInput in;
  in.certificate = vm["certificate"].as<std::string>();
  in.calibrated = vm["calibrated"].as<std::string>();
  in.due = vm["due"].as<std::string>();
  in.correction = vm["correction"].as<std::string>();
  in.uncertainty = vm["uncertainty"].as<std::string>();
  in.k = vm["k"].as<std::string>();
  in.override_reason = optional_string(vm, "override-reason");
  return in;
}

app::WeightDccInput dcc_input(const po::variables_map& vm) {
  for (const char* name : {"certificate", "calibrated", "uncertainty"})
    if (vm.count(name))
      throw InputError(fmt::format("--{} is read from the DCC given with --from-dcc; do not type it as well.", name));
  for (const char* name : {"correction", "k"})
    if (!vm[name].defaulted())
      throw InputError(fmt::format("--{} is read from the DCC given with --from-dcc; do not type it as well.", name));
  app::WeightDccInput in;
  in.file = vm["from-dcc"].as<std::string>();
  const char* env_schema = std::getenv("PLUMB_DCC_SCHEMA");
  if (vm.count("dcc-schema"))
    in.schema = vm["dcc-schema"].as<std::string>();
  else if (env_schema && *env_schema)
    in.schema = env_schema;
  else
    throw InputError(
        "--from-dcc needs the DCC 3.1.2 schema to validate the file: give --dcc-schema FILE.xsd or set "
        "PLUMB_DCC_SCHEMA.");
  in.due = optional_string(vm, "due");
  in.override_reason = optional_string(vm, "override-reason");
  return in;
}

Command recalibrate_command() {
  return {"weight",
          "recalibrate",
          "record a new calibration certificate for a registered weight (earlier certificates stay in force for "
          "their dates), typed or read from the provider's DCC XML file (--from-dcc; see doc/dcc.md)",
          "plumb weight recalibrate W100 --certificate RC-2417 --calibrated 2027-02-20 --due 2028-02-20 "
          "--correction 0.04mg --uncertainty 0.05mg --k 2\n"
          "  plumb weight recalibrate W100 --from-dcc RC-2417.xml --dcc-schema dcc-3.1.2-local.xsd",
          [](po::options_description& d, po::positional_options_description& p) {
            d.add_options()("id", po::value<std::string>()->required(), "weight id (positional)")(
                "certificate", po::value<std::string>(), "number of the new calibration certificate")(
                "calibrated", po::value<std::string>(), "calibration date, YYYY-MM-DD")(
                "due", po::value<std::string>(),
                "recalibration due date, YYYY-MM-DD (with --from-dcc: needed when the DCC states none)")(
                "correction", po::value<std::string>()->default_value("0g"),
                "certificate correction: conventional mass = nominal + correction")(
                "uncertainty", po::value<std::string>(), "expanded uncertainty U from the certificate")(
                "k", po::value<std::string>()->default_value("2"), "coverage factor of U")(
                "from-dcc", po::value<std::string>(),
                "read the certificate from the provider's Digital Calibration Certificate (DCC 3.1.2 XML): number, "
                "calibration date, conventional mass or correction, U, k and due date")(
                "dcc-schema", po::value<std::string>(),
                "the DCC 3.1.2 XSD to validate --from-dcc against, its D-SI import local (default: $PLUMB_DCC_SCHEMA)");
            add_override_reason_option(d);
            p.add("id", 1);
          },
          [](const po::variables_map& vm, Env& env) {
            const bool from_dcc = vm.count("from-dcc") > 0;
            const auto typed = from_dcc ? app::WeightCertificateInput{} : typed_certificate(vm);
            const auto dcc = from_dcc ? dcc_input(vm) : app::WeightDccInput{};
            auto db = env.open();
            const auto out = from_dcc
                                 ? app::recalibrate_weight_from_dcc(db, env.actor(db), vm["id"].as<std::string>(), dcc)
                                 : app::recalibrate_weight(db, env.actor(db), vm["id"].as<std::string>(), typed);
            const auto& w = out.weight;
            fmt::print(env.out, "Weight {} recalibrated: certificate {} ({} to {}), conventional mass {} g{}.\n", w.id,
                       w.current.certificate_no, to_string(w.current.calibrated_on), to_string(w.current.due_on),
                       w.conventional_mass().in_grams().to_string(),
                       out.in_force_today ? ", in force today" : ", not in force today (see `plumb weight show`)");
            if (from_dcc)
              fmt::print(env.out, "Read from {}: correction {} g, U = {} g (k = {}).\n", dcc.file,
                         w.current.correction.in_grams().to_string(), w.current.uncertainty.in_grams().to_string(),
                         w.current.k.to_string());
            if (out.overridden)
              fmt::print(env.out, "Recorded as accepted outside class {} ({}), with the reason given.\n",
                         w.weight_class, *out.overridden);
            return 0;
          }};
}

Command show_command() {
  return {"weight",
          "show",
          "a reference weight with every certificate, the one in force, and class overrides",
          "plumb weight show W100 --format json",
          [](po::options_description& d, po::positional_options_description& p) {
            d.add_options()("id", po::value<std::string>()->required(), "weight id (positional)");
            add_format_option(d);
            p.add("id", 1);
          },
          [](const po::variables_map& vm, Env& env) {
            const auto format = format_of(vm, {"text", "json"});
            auto db = env.open();
            const auto details = app::weight_details(db, vm["id"].as<std::string>(), today_local());
            if (format == "json")
              env.out << report::weight_details_json(details).dump(2) << "\n";
            else
              env.out << report::weight_details_text(details);
            return 0;
          }};
}

}  // namespace

std::vector<Command> weight_commands() {
  Command add{"weight",
              "add",
              "register a reference weight with its calibration certificate",
              "plumb weight add W100 --nominal 100g --class E2 --correction 0.03mg --uncertainty 0.05mg --k 2 "
              "--certificate RC-2291 --calibrated 2026-03-02 --due 2027-03-02",
              [](po::options_description& d, po::positional_options_description& p) {
                d.add_options()("id", po::value<std::string>()->required(), "weight id (positional)")(
                    "nominal", po::value<std::string>()->required(), "nominal value with unit, e.g. 100g")(
                    "class", po::value<std::string>()->required(), "OIML R 111 class: E1, E2, F1, F2, M1, ...")(
                    "correction", po::value<std::string>()->default_value("0g"),
                    "certificate correction: conventional mass = nominal + correction")(
                    "uncertainty", po::value<std::string>()->required(), "expanded uncertainty U from the certificate")(
                    "k", po::value<std::string>()->default_value("2"), "coverage factor of U")(
                    "certificate", po::value<std::string>()->required(), "calibration certificate number")(
                    "calibrated", po::value<std::string>()->required(), "calibration date, YYYY-MM-DD")(
                    "due", po::value<std::string>()->required(), "recalibration due date, YYYY-MM-DD");
                add_properties_options(d,
                                       "density with its unit, e.g. 7950kg/m3, with --density-u (default: the "
                                       "limits of its class, OIML R 111-1:2004 Table 5)");
                add_override_reason_option(d);
                p.add("id", 1);
              },
              [](const po::variables_map& vm, Env& env) {
                app::WeightInput in;
                in.id = vm["id"].as<std::string>();
                in.nominal = vm["nominal"].as<std::string>();
                in.weight_class = vm["class"].as<std::string>();
                in.correction = vm["correction"].as<std::string>();
                in.uncertainty = vm["uncertainty"].as<std::string>();
                in.k = vm["k"].as<std::string>();
                in.certificate = vm["certificate"].as<std::string>();
                in.calibrated = vm["calibrated"].as<std::string>();
                in.due = vm["due"].as<std::string>();
                const auto stated = properties_input(vm);
                in.density = stated.density;
                in.density_u = stated.density_u;
                in.density_class = stated.density_class;
                in.drift = stated.drift;
                in.override_reason = optional_string(vm, "override-reason");
                auto db = env.open();
                const auto w = app::add_weight(db, env.actor(db), in);
                fmt::print(env.out, "Weight {} registered: conventional mass {} g (certificate {}, due {}).\n", w.id,
                           w.conventional_mass().in_grams().to_string(), w.current.certificate_no,
                           to_string(w.current.due_on));
                return 0;
              }};
  Command list{
      "weight",
      "list",
      "list reference weights with their current certificates",
      "plumb weight list --format json",
      [](po::options_description& d, po::positional_options_description&) { add_format_option(d, "text|json|csv"); },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json", "csv"});
        auto db = env.open();
        const auto weights = store::list_weights(db.sql());
        const auto status = app::weight_statuses(db, today_local());
        if (format == "json")
          env.out << report::weights_json(weights, status).dump(2) << "\n";
        else if (format == "csv")
          env.out << report::weights_csv(weights, status);
        else
          env.out << report::weights_text(weights, status);
        return 0;
      }};
  return {add, recalibrate_command(), set_properties_command(), list, show_command()};
}

}  // namespace plumb::cli
