#include "checks/pipette_edition.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/errors.hpp"

namespace plumb::checks {

namespace {
constexpr std::size_t replicates_2022 = 10;
}  // namespace

std::string_view key(Iso8655Edition e) {
  switch (e) {
    case Iso8655Edition::e2002:
      return "2002";
    case Iso8655Edition::e2022:
      return "2022";
  }
  return "2002";
}

Iso8655Edition parse_iso8655_edition(std::string_view text, std::string_view field) {
  if (text == "2002") return Iso8655Edition::e2002;
  if (text == "2022") return Iso8655Edition::e2022;
  throw InputError(fmt::format("{} \"{}\" is not an edition of ISO 8655 plumb checks to (2002 or 2022).", field, text));
}

std::size_t required_replicates(Iso8655Edition e) {
  return e == Iso8655Edition::e2022 ? replicates_2022 : min_replicates;
}

std::string edition_statement(Iso8655Edition e, const PipetteDefinition& pipette) {
  const bool iso_table = pipette.limits.kind == pipette_limits::LimitsPolicy::Kind::iso8655_2;
  if (e == Iso8655Edition::e2002)
    return fmt::format("Checked to ISO 8655-6:2002 (gravimetric method) against {}.",
                       iso_table ? "ISO 8655-2:2002 Table 1" : "the laboratory's own limits");
  return "Checked to ISO 8655-6:2022 (gravimetric method, 10 replicates at each test volume) against limits entered "
         "by the laboratory for ISO 8655-2:2022; the uncertainty of the measured volume is reported with each result.";
}

std::vector<std::string> edition_shortfalls(Iso8655Edition e, const PipetteDefinition& pipette,
                                            const std::vector<EditionVolume>& volumes) {
  std::vector<std::string> out;
  if (e == Iso8655Edition::e2002) return out;
  if (pipette.limits.kind == pipette_limits::LimitsPolicy::Kind::iso8655_2)
    out.push_back(fmt::format(
        "pipette {} is judged by ISO 8655-2:2002 Table 1, which cannot stand for the 2022 edition's limits; a pipette "
        "checked to ISO 8655-2:2022 needs the laboratory's limits (pipette add --max-systematic --max-random)",
        pipette.id));
  for (const auto& tv : volumes)
    for (const auto& [channel, count] : tv.replicates)
      if (count < replicates_2022)
        out.push_back(fmt::format("test volume {} uL, channel {} has {} replicate(s); ISO 8655-6:2022 needs {}",
                                  tv.volume.ul_text(), channel, count, replicates_2022));
  for (const auto& v : default_test_volumes(pipette))
    if (std::none_of(volumes.begin(), volumes.end(),
                     [&](const EditionVolume& tv) { return tv.volume.trimmed() == v.trimmed(); }))
      out.push_back(fmt::format("test volume {} uL is missing; ISO 8655-6:2022 tests {}", v.ul_text(),
                                pipette.kind == PipetteKind::fixed
                                    ? std::string("the nominal volume")
                                    : std::string("the nominal volume, 50 % of it and 10 % of it or the lower limit")));
  return out;
}

}  // namespace plumb::checks
