#include "store/file_digest.hpp"

#include <fmt/format.h>
#include <openssl/evp.h>

#include <fstream>
#include <memory>

#include "core/errors.hpp"

namespace plumb::store {

std::string sha256_of_file(const std::filesystem::path& file, std::string_view field) {
  std::ifstream in(file, std::ios::binary);
  if (!in) throw InputError(fmt::format("{} \"{}\" cannot be read.", field, file.string()));
  const std::unique_ptr<EVP_MD_CTX, decltype(&EVP_MD_CTX_free)> ctx(EVP_MD_CTX_new(), &EVP_MD_CTX_free);
  if (!ctx || EVP_DigestInit_ex(ctx.get(), EVP_sha256(), nullptr) != 1)
    throw StorageError("SHA-256 initialisation failed in OpenSSL.");
  std::string block(1 << 16, '\0');
  while (in) {
    in.read(block.data(), static_cast<std::streamsize>(block.size()));
    if (in.gcount() > 0 && EVP_DigestUpdate(ctx.get(), block.data(), static_cast<std::size_t>(in.gcount())) != 1)
      throw StorageError("SHA-256 computation failed in OpenSSL.");
  }
  if (in.bad()) throw InputError(fmt::format("{} \"{}\" could not be read to the end.", field, file.string()));
  unsigned char digest[EVP_MAX_MD_SIZE];
  unsigned int len = 0;
  if (EVP_DigestFinal_ex(ctx.get(), digest, &len) != 1) throw StorageError("SHA-256 computation failed in OpenSSL.");
  std::string hex;
  for (unsigned int i = 0; i < len; ++i) hex += fmt::format("{:02x}", digest[i]);
  return hex;
}

}  // namespace plumb::store
