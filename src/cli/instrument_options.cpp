#include "cli/instrument_options.hpp"

#include "app/registry/instrument_page.hpp"
#include "report/registry/instrument_page.hpp"

namespace plumb::cli {

void add_identity_options(po::options_description& d) {
  d.add_options()("maker", po::value<std::string>(), "maker of the instrument")(
      "model", po::value<std::string>(), "model designation")("serial", po::value<std::string>(), "serial number")(
      "asset-tag", po::value<std::string>(), "the lab's own inventory number");
}

app::IdentityInput identity_from(const po::variables_map& vm) {
  return {optional_string(vm, "maker"), optional_string(vm, "model"), optional_string(vm, "serial"),
          optional_string(vm, "asset-tag")};
}

Command instrument_show_command(const std::string& noun, const std::string& example_id) {
  return {noun,
          "show",
          "show one " + noun + ": attributes and their history, status, check runs and certificates",
          "plumb " + noun + " show " + example_id,
          [noun](po::options_description& d, po::positional_options_description& p) {
            d.add_options()("id", po::value<std::string>()->required(), (noun + " id (positional)").c_str())(
                "on", po::value<std::string>(), "status as of this date, YYYY-MM-DD (default today)");
            add_format_option(d);
            p.add("id", 1);
          },
          [noun](const po::variables_map& vm, Env& env) {
            const auto format = format_of(vm, {"text", "json"});
            const Date on = vm.count("on") ? parse_date(vm["on"].as<std::string>(), "--on") : today_local();
            auto db = env.open();
            const auto page = app::instrument_page(db, noun, vm["id"].as<std::string>(), on);
            if (format == "json")
              env.out << page.dump(2) << "\n";
            else
              env.out << report::instrument_page_text(page);
            return 0;
          }};
}

}  // namespace plumb::cli
