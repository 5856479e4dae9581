#include "app/certificates/state.hpp"

#include <fmt/format.h>

#include <array>

#include "core/errors.hpp"

namespace plumb::app {
namespace {

constexpr std::array<CertificateState, 4> every_state{CertificateState::draft, CertificateState::approved,
                                                      CertificateState::superseded, CertificateState::withdrawn};

}  // namespace

std::string_view state_key(CertificateState s) {
  switch (s) {
    case CertificateState::draft:
      return "draft";
    case CertificateState::approved:
      return "approved";
    case CertificateState::superseded:
      return "superseded";
    case CertificateState::withdrawn:
      return "withdrawn";
  }
  return "draft";  // not reached: the switch names every state
}

CertificateState parse_certificate_state(std::string_view text, std::string_view field) {
  for (const CertificateState s : every_state)
    if (text == state_key(s)) return s;
  throw InputError(
      fmt::format("{} \"{}\" is not a certificate state: draft, approved, superseded or withdrawn.", field, text));
}

CertificateState certificate_state(bool approved, bool superseded, bool withdrawn) {
  if (withdrawn) return CertificateState::withdrawn;
  if (superseded) return CertificateState::superseded;
  if (approved) return CertificateState::approved;
  return CertificateState::draft;
}

}  // namespace plumb::app
