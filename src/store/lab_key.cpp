#include "store/lab_key.hpp"

#include <fmt/format.h>
#include <openssl/bio.h>
#include <openssl/evp.h>
#include <openssl/pem.h>

#include <cstdlib>
#include <fstream>
#include <sstream>
#include <vector>

#include "core/errors.hpp"
#include "store/private_file.hpp"
#include "store/recorder.hpp"

namespace plumb::store {
namespace {

using Bio = std::unique_ptr<BIO, decltype(&BIO_free)>;
using Context = std::unique_ptr<EVP_MD_CTX, decltype(&EVP_MD_CTX_free)>;

std::string key_bytes_hex(const unsigned char* data, std::size_t size) {
  static constexpr char digits[] = "0123456789abcdef";
  std::string out(2 * size, '0');
  for (std::size_t i = 0; i < size; ++i) {
    out[2 * i] = digits[data[i] >> 4];
    out[2 * i + 1] = digits[data[i] & 0x0f];
  }
  return out;
}

/// Lowercase or uppercase hex to bytes; empty when the text is not hex of an even length.
std::vector<unsigned char> hex_key_bytes(const std::string& hex) {
  const auto nibble = [](char c) -> int {
    if (c >= '0' && c <= '9') return c - '0';
    if (c >= 'a' && c <= 'f') return c - 'a' + 10;
    if (c >= 'A' && c <= 'F') return c - 'A' + 10;
    return -1;
  };
  std::vector<unsigned char> out;
  if (hex.size() % 2 != 0) return out;
  for (std::size_t i = 0; i < hex.size(); i += 2) {
    const int hi = nibble(hex[i]), lo = nibble(hex[i + 1]);
    if (hi < 0 || lo < 0) return {};
    out.push_back(static_cast<unsigned char>(hi * 16 + lo));
  }
  return out;
}

std::string pem_of_bio(BIO* bio) {
  char* data = nullptr;
  const long size = BIO_get_mem_data(bio, &data);
  return size > 0 ? std::string(data, static_cast<std::size_t>(size)) : std::string();
}

std::string key_file_text(const std::filesystem::path& file) {
  std::ifstream in(file, std::ios::binary);
  std::ostringstream text;
  text << in.rdbuf();
  return text.str();
}

void write_key_file(const std::filesystem::path& file, const std::string& text) {
  if (!create_private_file(file))
    throw InputError(fmt::format("key file \"{}\" already exists; plumb never replaces a key.", file.string()));
  std::ofstream out(file, std::ios::binary | std::ios::trunc);
  out << text;
  out.close();
  if (!out) throw StorageError(fmt::format("cannot write \"{}\".", file.string()));
}

}  // namespace

std::filesystem::path key_path_for(const std::filesystem::path& db) {
  if (const char* env = std::getenv("PLUMB_KEY"); env && *env) return env;
  return db.string() + ".key";
}

std::filesystem::path public_key_path_for(const std::filesystem::path& key) {
  std::filesystem::path p = key;
  if (p.extension() == ".key") return p.replace_extension(".pub");
  return p.string() + ".pub";
}

LabKey::LabKey(evp_pkey_st* key) : key_(key, EVP_PKEY_free) {}

LabKey LabKey::generate() {
  EVP_PKEY* key = EVP_PKEY_Q_keygen(nullptr, nullptr, "ED25519");
  if (!key) throw StorageError("OpenSSL could not generate an Ed25519 key.");
  return LabKey(key);
}

LabKey LabKey::load(const std::filesystem::path& file) {
  if (!std::filesystem::exists(file))
    throw InputError(
        fmt::format("the lab's signing key \"{}\" does not exist; plumb signs every command's records "
                    "with it (create it with `plumb key create`, or set PLUMB_KEY to the lab's key file).",
                    file.string()));
  const std::string pem = key_file_text(file);
  Bio bio(BIO_new_mem_buf(pem.data(), static_cast<int>(pem.size())), &BIO_free);
  EVP_PKEY* key = bio ? PEM_read_bio_PrivateKey(bio.get(), nullptr, nullptr, nullptr) : nullptr;
  if (!key || EVP_PKEY_get_base_id(key) != EVP_PKEY_ED25519) {
    if (key) EVP_PKEY_free(key);
    throw InputError(fmt::format("the lab's signing key \"{}\" is not an Ed25519 private key in PEM.", file.string()));
  }
  return LabKey(key);
}

void LabKey::save(const std::filesystem::path& key_file, const std::filesystem::path& public_file) const {
  if (std::filesystem::exists(public_file))
    throw InputError(
        fmt::format("public key file \"{}\" already exists; plumb never replaces a key.", public_file.string()));
  Bio bio(BIO_new(BIO_s_mem()), &BIO_free);
  if (!bio || PEM_write_bio_PrivateKey(bio.get(), key_.get(), nullptr, nullptr, 0, nullptr, nullptr) != 1)
    throw StorageError("OpenSSL could not write the private key.");
  write_key_file(key_file, pem_of_bio(bio.get()));
  try {
    write_key_file(public_file, public_pem());
  } catch (...) {
    std::filesystem::remove(key_file);
    throw;
  }
}

std::string LabKey::sign(std::string_view message) const {
  Context ctx(EVP_MD_CTX_new(), &EVP_MD_CTX_free);
  unsigned char signature[64];
  std::size_t size = sizeof signature;
  // Ed25519 is used without a separate digest (pure EdDSA, RFC 8032): the digest argument is null.
  if (!ctx || EVP_DigestSignInit(ctx.get(), nullptr, nullptr, nullptr, key_.get()) != 1 ||
      EVP_DigestSign(ctx.get(), signature, &size, reinterpret_cast<const unsigned char*>(message.data()),
                     message.size()) != 1)
    throw StorageError("OpenSSL could not sign the checkpoint.");
  return key_bytes_hex(signature, size);
}

std::string LabKey::public_hex() const {
  unsigned char raw[32];
  std::size_t size = sizeof raw;
  if (EVP_PKEY_get_raw_public_key(key_.get(), raw, &size) != 1)
    throw StorageError("OpenSSL could not read the public key.");
  return key_bytes_hex(raw, size);
}

std::string LabKey::public_pem() const {
  Bio bio(BIO_new(BIO_s_mem()), &BIO_free);
  if (!bio || PEM_write_bio_PUBKEY(bio.get(), key_.get()) != 1)
    throw StorageError("OpenSSL could not write the public key.");
  return pem_of_bio(bio.get());
}

std::string read_public_key_file(const std::filesystem::path& file, const std::string& option) {
  if (!std::filesystem::exists(file)) throw InputError(fmt::format("{} \"{}\" does not exist.", option, file.string()));
  const std::string pem = key_file_text(file);
  Bio bio(BIO_new_mem_buf(pem.data(), static_cast<int>(pem.size())), &BIO_free);
  EVP_PKEY* key = bio ? PEM_read_bio_PUBKEY(bio.get(), nullptr, nullptr, nullptr) : nullptr;
  if (!key || EVP_PKEY_get_base_id(key) != EVP_PKEY_ED25519) {
    if (key) EVP_PKEY_free(key);
    throw InputError(fmt::format("{} \"{}\" is not an Ed25519 public key in PEM.", option, file.string()));
  }
  const std::unique_ptr<EVP_PKEY, decltype(&EVP_PKEY_free)> owned(key, &EVP_PKEY_free);
  unsigned char raw[32];
  std::size_t size = sizeof raw;
  if (EVP_PKEY_get_raw_public_key(key, raw, &size) != 1)
    throw InputError(fmt::format("{} \"{}\" is not an Ed25519 public key in PEM.", option, file.string()));
  return key_bytes_hex(raw, size);
}

bool signature_valid(const std::string& public_hex, std::string_view message, const std::string& signature_hex) {
  const auto raw = hex_key_bytes(public_hex);
  const auto signature = hex_key_bytes(signature_hex);
  if (raw.size() != 32 || signature.size() != 64) return false;
  const std::unique_ptr<EVP_PKEY, decltype(&EVP_PKEY_free)> key(
      EVP_PKEY_new_raw_public_key(EVP_PKEY_ED25519, nullptr, raw.data(), raw.size()), &EVP_PKEY_free);
  Context ctx(EVP_MD_CTX_new(), &EVP_MD_CTX_free);
  return key && ctx && EVP_DigestVerifyInit(ctx.get(), nullptr, nullptr, nullptr, key.get()) == 1 &&
         EVP_DigestVerify(ctx.get(), signature.data(), signature.size(),
                          reinterpret_cast<const unsigned char*>(message.data()), message.size()) == 1;
}

std::string key_fingerprint(const std::string& public_hex) {
  const auto raw = hex_key_bytes(public_hex);
  return sha256_hex(std::string_view(reinterpret_cast<const char*>(raw.data()), raw.size())).substr(0, 16);
}

}  // namespace plumb::store
