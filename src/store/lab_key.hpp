#pragma once
// The lab's Ed25519 signing key, kept in a file outside the database, which signs the trail's checkpoints (OpenSSL 3
// EVP). Whoever holds the database but not this file cannot sign a rewritten trail.
#include <filesystem>
#include <memory>
#include <string>
#include <string_view>

struct evp_pkey_st;

namespace plumb::store {

/// Where the key of the database at `db` lives: $PLUMB_KEY when set, else beside the database as DB.key.
std::filesystem::path key_path_for(const std::filesystem::path& db);
/// Where its public key is exported: KEY with .key replaced by .pub (lab.db.key -> lab.db.pub), else KEY.pub.
std::filesystem::path public_key_path_for(const std::filesystem::path& key);

class LabKey {
 public:
  /// A new random key.
  static LabKey generate();
  /// Reads a PEM private key; InputError (one sentence naming the file) when missing or not an Ed25519 key.
  static LabKey load(const std::filesystem::path& file);

  /// Writes the private key (PKCS#8 PEM, created exclusively with mode 0600) and the public key (PEM, 0600).
  /// InputError when either file exists already.
  void save(const std::filesystem::path& key_file, const std::filesystem::path& public_file) const;

  /// Ed25519 signature of `message`, 128 hex digits.
  [[nodiscard]] std::string sign(std::string_view message) const;
  /// The raw public key, 64 hex digits (as checkpoints record it).
  [[nodiscard]] std::string public_hex() const;
  [[nodiscard]] std::string public_pem() const;

 private:
  explicit LabKey(evp_pkey_st* key);
  std::shared_ptr<evp_pkey_st> key_;
};

/// Reads an Ed25519 public key in PEM and returns it as 64 hex digits; InputError naming the file otherwise.
std::string read_public_key_file(const std::filesystem::path& file, const std::string& option);
/// Whether `signature_hex` is a valid Ed25519 signature of `message` by `public_hex`.
bool signature_valid(const std::string& public_hex, std::string_view message, const std::string& signature_hex);
/// The first 16 hex digits of SHA-256 of the raw public key: how plumb names a key to a person.
std::string key_fingerprint(const std::string& public_hex);

}  // namespace plumb::store
