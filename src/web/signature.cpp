#include "web/signature.hpp"

#include <optional>

namespace plumb::web {

app::Authenticated signer_of(const PageContext& c, const std::string& command) {
  const std::string password = c.request.param("password");
  return app::authenticate(
      c.db, command,
      {c.visitor->who.login, c.visitor->token, [password](const std::string&) -> std::optional<std::string> {
         if (password.empty()) return std::nullopt;
         return password;
       }});
}

}  // namespace plumb::web
