#pragma once
// Passwords are kept only as Argon2id hashes (libsodium crypto_pwhash_str: salt and limits inside the string).
#include <string>
#include <string_view>

namespace plumb::app {

/// The limits a database hashes with, fixed when it is created (security_settings.password_hashing):
/// "moderate" is libsodium's crypto_pwhash_OPSLIMIT_MODERATE / MEMLIMIT_MODERATE (3 passes over 256 MiB);
/// "test-only-fast" is its minimum (1 pass over 8 KiB), chosen only when the database is created with
/// PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING=1 and named wherever the accounts are listed or verified.
std::string hash_password(std::string_view password, const std::string& hashing);
/// Whether `password` is the one `hash` was made from (in time independent of where they differ).
bool password_matches(const std::string& hash, std::string_view password);
/// Spends the time of one check against a hash that matches nothing: an unknown login takes as long as a known
/// one, so the time of the answer does not tell which logins exist.
void spend_password_check_time(std::string_view password, const std::string& hashing);

/// A new session token: 32 random bytes (libsodium randombytes_buf) as hex.
std::string new_session_token();

/// The hashing a new database uses: "test-only-fast" when PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING is "1" in the
/// environment of the command that creates it, else "moderate". Never consulted for an existing database.
std::string hashing_for_new_database();

}  // namespace plumb::app
