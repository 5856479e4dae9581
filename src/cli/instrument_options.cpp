#include "cli/instrument_options.hpp"

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

}  // namespace plumb::cli
