#include "app/people/password_hash.hpp"

#include <sodium.h>

#include <cstdlib>

#include "core/errors.hpp"

namespace plumb::app {
namespace {

void ensure_sodium() {
  static const int ready = sodium_init();  // 0 the first time, 1 afterwards; -1 only if it cannot start
  if (ready < 0) throw StorageError("libsodium could not be initialised.");
}

struct Limits {
  unsigned long long ops;
  std::size_t mem;
};

Limits limits_of(const std::string& hashing) {
  if (hashing == "test-only-fast") return {crypto_pwhash_OPSLIMIT_MIN, crypto_pwhash_MEMLIMIT_MIN};
  return {crypto_pwhash_OPSLIMIT_MODERATE, crypto_pwhash_MEMLIMIT_MODERATE};
}

}  // namespace

std::string hash_password(std::string_view password, const std::string& hashing) {
  ensure_sodium();
  const Limits l = limits_of(hashing);
  char out[crypto_pwhash_STRBYTES];
  if (crypto_pwhash_str_alg(out, password.data(), password.size(), l.ops, l.mem, crypto_pwhash_ALG_ARGON2ID13) != 0)
    throw StorageError("the password could not be hashed (Argon2id ran out of memory).");
  return out;
}

bool password_matches(const std::string& hash, std::string_view password) {
  ensure_sodium();
  return crypto_pwhash_str_verify(hash.c_str(), password.data(), password.size()) == 0;
}

void spend_password_check_time(std::string_view password, const std::string& hashing) {
  static const std::string nobody = hash_password("no account has this password", hashing);
  (void)password_matches(nobody, password);
}

std::string new_session_token() {
  ensure_sodium();
  unsigned char bytes[32];
  randombytes_buf(bytes, sizeof bytes);
  char hex[2 * sizeof bytes + 1];
  sodium_bin2hex(hex, sizeof hex, bytes, sizeof bytes);
  sodium_memzero(bytes, sizeof bytes);
  return hex;
}

std::string hashing_for_new_database() {
  const char* v = std::getenv("PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING");
  return v && std::string(v) == "1" ? "test-only-fast" : "moderate";
}

}  // namespace plumb::app
