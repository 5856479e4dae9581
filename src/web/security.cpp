#include "web/security.hpp"

#include <fmt/format.h>
#include <openssl/crypto.h>
#include <openssl/evp.h>
#include <openssl/hmac.h>
#include <openssl/rand.h>

#include <array>
#include <stdexcept>

namespace plumb::web {
namespace {

std::string hex_of(const unsigned char* bytes, std::size_t n) {
  std::string out;
  out.reserve(n * 2);
  for (std::size_t i = 0; i < n; ++i) out += fmt::format("{:02x}", bytes[i]);
  return out;
}

}  // namespace

std::string random_hex_token() {
  std::array<unsigned char, 32> bytes{};
  if (RAND_bytes(bytes.data(), static_cast<int>(bytes.size())) != 1)
    throw std::runtime_error("the system's random number generator failed");
  return hex_of(bytes.data(), bytes.size());
}

std::string keyed_token(const std::string& secret, const std::string& purpose, const std::string& value) {
  const std::string message = purpose + '\n' + value;
  std::array<unsigned char, EVP_MAX_MD_SIZE> mac{};
  unsigned int length = 0;
  if (!HMAC(EVP_sha256(), secret.data(), static_cast<int>(secret.size()),
            reinterpret_cast<const unsigned char*>(message.data()), message.size(), mac.data(), &length))
    throw std::runtime_error("HMAC-SHA256 failed");
  return hex_of(mac.data(), length);
}

bool same_token(const std::string& a, const std::string& b) {
  return !a.empty() && a.size() == b.size() && CRYPTO_memcmp(a.data(), b.data(), a.size()) == 0;
}

std::vector<std::pair<std::string, std::string>> security_headers(const std::string& csp, bool tls) {
  std::vector<std::pair<std::string, std::string>> h = {
      {"Content-Security-Policy", csp},
      {"X-Content-Type-Options", "nosniff"},
      {"Referrer-Policy", "no-referrer"},
      {"X-Frame-Options", csp.find("frame-ancestors 'self'") != std::string::npos ? "SAMEORIGIN" : "DENY"},
      {"Cache-Control", "no-store"},
      {"Cross-Origin-Opener-Policy", "same-origin"},
  };
  if (tls) h.emplace_back("Strict-Transport-Security", "max-age=31536000");
  return h;
}

std::string cookie_header(const std::string& name, const std::string& value, bool tls) {
  return fmt::format("{}={}; Path=/; HttpOnly; SameSite=Strict{}", name, value, tls ? "; Secure" : "");
}

std::string expired_cookie_header(const std::string& name, bool tls) {
  return fmt::format("{}=; Path=/; HttpOnly; SameSite=Strict; Max-Age=0{}", name, tls ? "; Secure" : "");
}

bool LoginLimiter::allow(const std::string& address, std::chrono::steady_clock::time_point now) {
  const std::lock_guard lock(mutex_);
  auto& times = attempts_[address];
  while (!times.empty() && now - times.front() >= std::chrono::seconds(60)) times.pop_front();
  if (static_cast<int>(times.size()) >= per_minute_) return false;
  times.push_back(now);
  return true;
}

}  // namespace plumb::web
