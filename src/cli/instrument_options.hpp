#pragma once
// The identity options `balance add`, `pipette add` and `instrument update` share.
#include "app/registry/instrument_attributes.hpp"
#include "cli/command.hpp"

namespace plumb::cli {

void add_identity_options(po::options_description& d);
app::IdentityInput identity_from(const po::variables_map& vm);

}  // namespace plumb::cli
