#pragma once
// Error kinds map one-to-one onto plumb's exit statuses (see DEVELOPERS.md):
// InputError -> 2 (bad input, nothing written), StorageError -> 3, AccessError -> 4.
#include <stdexcept>
#include <string>

namespace plumb {

/// The user's input is wrong. The message is one sentence naming the field, line and value.
class InputError : public std::runtime_error {
public:
  using std::runtime_error::runtime_error;
};

/// The database or the file system failed underneath a correct request.
class StorageError : public std::runtime_error {
public:
  using std::runtime_error::runtime_error;
};

/// Not authenticated, or not permitted: a wrong password, a locked or deactivated account, an expired session,
/// a role that does not allow the command, or a signature that separation of duties forbids.
class AccessError : public std::runtime_error {
public:
  using std::runtime_error::runtime_error;
};

}  // namespace plumb
