#pragma once
// An electronic signature in a form: the session's own user, authenticated again with the password typed into this
// very form for `command` (app/people refuses a signature without it; doc/people.md). Shared by every form whose
// command the table of permissions marks as a signature (approve, correct, void).
#include <string>

#include "app/people/authenticate.hpp"
#include "web/pages.hpp"

namespace plumb::web {

/// The signer of `command` ("certificate approve", "check void"), or AccessError (a wrong or missing password).
app::Authenticated signer_of(const PageContext& c, const std::string& command);

}  // namespace plumb::web
