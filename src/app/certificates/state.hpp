#pragma once
// The standing of a certificate today, read from its append-only events: a draft until approved; superseded
// when a correction of its run issued a replacement; withdrawn when its run was voided. A withdrawal outranks
// everything (the check it certifies was entered in error), and a supersession outranks an approval (an
// approved certificate can still be replaced). Its stored content never changes.
#include <optional>
#include <string_view>

namespace plumb::app {

enum class CertificateState { draft, approved, superseded, withdrawn };

/// "draft", "approved", "superseded", "withdrawn": the words lists, filters and JSON use.
std::string_view state_key(CertificateState s);
/// The state a person typed; InputError naming `field` and the four words otherwise.
CertificateState parse_certificate_state(std::string_view text, std::string_view field);
/// The standing that follows from which events a certificate has.
CertificateState certificate_state(bool approved, bool superseded, bool withdrawn);

}  // namespace plumb::app
