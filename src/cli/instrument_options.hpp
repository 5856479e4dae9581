#pragma once
// What `balance` and `pipette` share: the identity options of `add` (and `instrument update`), and `show`.
#include "app/registry/instrument_attributes.hpp"
#include "cli/command.hpp"

namespace plumb::cli {

void add_identity_options(po::options_description& d);
app::IdentityInput identity_from(const po::variables_map& vm);
/// `plumb NOUN show ID`: the instrument page (app::instrument_page) as text or JSON.
Command instrument_show_command(const std::string& noun, const std::string& example_id);

}  // namespace plumb::cli
