#pragma once
// OIML R 111-1:2004 "Weights of classes E1, E2, F1, F2, M1, M1-2, M2, M2-3 and M3", Table 1:
// maximum permissible errors (+/-) of weights by class and nominal value, 1 mg to 50 kg.
// Classes E1..M1: transcribed from memory, cross-checked row by row (by a test) against
// shared/reference-data/metrology/oiml-r111-weight-mpe.csv.
// Classes M2, M3 (and M1-2, M2-3, which R 111 defines only from 50 kg up): from memory only, NOT
// cross-checked (the reference CSV has no such columns); they follow R 111's pattern M2 = 10 x F2,
// M3 = 10 x M1, M1-2 = 2 x M1, M2-3 = 2 x M2. A lab can override any limit with its own.
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <vector>

#include "core/units.hpp"

namespace plumb::weights {

enum class WeightClass { E1, E2, F1, F2, M1, M1_2, M2, M2_3, M3 };

std::string_view to_string(WeightClass c);  ///< "E1", ..., "M1-2", ...
/// Parses "E1", "e2", "M1-2", ... Throws InputError naming `field`.
WeightClass parse_weight_class(std::string_view text, std::string_view field = "weight class");
std::span<const WeightClass> all_classes();
/// True for the classes whose values were cross-checked against the reference CSV (E1..M1).
bool cross_checked(WeightClass c);

/// The nominal values of Table 1 from 50 kg down to 1 mg (1-2-5 series), largest first.
std::vector<ExactMass> table_nominals();

/// MPE for the class and nominal value, exact; nullopt when R 111 gives none (a non-standard nominal
/// value, or a class not defined at that nominal).
std::optional<ExactMass> mpe(WeightClass c, ExactMass nominal);
/// As mpe(), but throws InputError naming the weight `id` when there is no MPE.
ExactMass mpe_or_throw(WeightClass c, ExactMass nominal, std::string_view id);

}  // namespace plumb::weights
