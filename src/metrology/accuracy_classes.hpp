#pragma once
// OIML R 76-1:2006 "Non-automatic weighing instruments", Table 6 (also EN 45501): maximum permissible
// errors on initial verification, in multiples of the verification scale interval e, by accuracy class
// and load m; MPE in service is twice these (R 76-1 3.5.2). Transcribed from memory, cross-checked by a
// test against shared/reference-data/metrology/oiml-r76-mpe-bands.csv.
// A band "from a to b" holds loads a < m <= b (m = 0 falls in the first band), as in Table 6.
#include <optional>
#include <span>
#include <string>
#include <string_view>

#include "core/units.hpp"

namespace plumb::r76 {

enum class AccuracyClass { I, II, III, IIII };
std::string_view to_string(AccuracyClass c);
/// Parses "I", "II", "III", "IIII" (also "1".."4"). Throws InputError naming `field`.
AccuracyClass parse_accuracy_class(std::string_view text, std::string_view field = "accuracy class");

struct MpeBand {
  AccuracyClass cls;
  long long load_from_e;                ///< exclusive lower bound (0: from zero inclusive)
  std::optional<long long> load_to_e;   ///< inclusive upper bound; nullopt: no upper bound
  int mpe_half_e;                       ///< MPE on initial verification in units of e/2 (1 -> 0.5 e)
};
/// The 12 rows of Table 6 in the CSV's order.
std::span<const MpeBand> bands();

enum class Verification { initial, in_service };
std::string_view to_string(Verification v);

/// OIML R 76-1:2006 Table 3 (classification of instruments): for each class, a range of the verification scale
/// interval e and the number of intervals n = Max / e it allows (the minimum capacity Min of the table is not
/// checked: plumb has no Min). Transcribed from memory; class II and III each have two rows.
struct ClassificationRow {
  AccuracyClass cls;
  const char* e_from;  ///< smallest e of the row, inclusive ("0.001g")
  const char* e_to;    ///< largest e, inclusive; nullptr: no upper bound
  long long n_min;     ///< smallest n = Max / e
  long long n_max;     ///< largest n; 0: no upper bound
};
std::span<const ClassificationRow> classification_rows();

/// Why a balance of class `cls` with verification scale interval `e` and capacity `max` does not fit OIML R 76-1,
/// as a sentence naming the rule (e of the form 1, 2 or 5 x 10^k, R 76-1 3.4.1; e and n = Max / e within the
/// class's row of Table 3), or nullopt when it fits.
std::optional<std::string> classification_fault(AccuracyClass cls, ExactMass e, ExactMass max);

/// MPE (+/-) at load `load` for class `cls` with verification scale interval `e`, exact. Throws InputError
/// for e <= 0, a negative load, or a load above the largest band of the class (e.g. > 100000 e in class II).
ExactMass mpe(AccuracyClass cls, ExactMass e, ExactMass load, Verification v = Verification::in_service);

}  // namespace plumb::r76
