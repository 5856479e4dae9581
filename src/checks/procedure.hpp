#pragma once
// The registry of check procedures: one row per procedure, and the only place that says what a procedure
// is called, which instrument it checks, how its certificates are numbered and titled, whether a run can
// be corrected, and which `check record` options it takes. Every dispatch on a procedure is a `switch`
// over `Procedure` without a `default`, so the compiler names each site a new procedure has to fill in
// (DEVELOPERS.md, "Adding a procedure"). The keys are the text stored in check_runs.procedure and typed
// after --procedure; they never change for a procedure that has recorded runs.
#include <array>
#include <optional>
#include <span>
#include <string_view>

namespace plumb::checks {

enum class Procedure { repeatability, calibration, gravimetric };

enum class InstrumentKind { balance, pipette };
std::string_view to_string(InstrumentKind k);  ///< "balance", "pipette"

struct ProcedureSpec {
  Procedure procedure;
  std::string_view key;          ///< "repeatability": stored, typed, printed
  InstrumentKind instrument;     ///< what it checks
  std::string_view summary;      ///< for --help: "weekly repeatability and accuracy check (USP <41> or lab limits)"
  std::string_view certificate_prefix;  ///< numbers PREFIX-YEAR-NNNN
  std::string_view certificate_kind;    ///< certificates.kind
  std::string_view certificate_title;   ///< "Balance check certificate"
  bool correctable = false;             ///< `check correct` can supersede its runs
  /// The `check record` options this procedure takes beyond those every procedure takes (instrument,
  /// procedure, readings, unit, on, by, format, gate). Any other procedure-specific option is refused.
  std::span<const std::string_view> options;
  /// Members the stored results of every run always hold (the JSON shape scripts may rely on, beside the
  /// run's own members: run_id, instrument, procedure, date, operator, verdict, next_due, readings ...).
  std::span<const std::string_view> result_keys;
};

/// A procedure goes into JSON as its key, written on purpose (std::string(to_string(p))): an implicit
/// conversion would store the enumerator's number, so it does not compile.
template <typename Json>
void to_json(Json&, Procedure) = delete;

/// Every procedure, in the order help texts list them.
inline constexpr std::array all_procedures{Procedure::repeatability, Procedure::calibration, Procedure::gravimetric};

const ProcedureSpec& spec(Procedure p);
inline std::string_view to_string(Procedure p) { return spec(p).key; }

/// The procedure stored or typed as `key`, if there is one.
std::optional<Procedure> find_procedure(std::string_view key);
/// The procedure named `key`; InputError naming `field` and listing the known keys otherwise.
Procedure parse_procedure(std::string_view key, std::string_view field = "--procedure");
/// The procedure whose certificates are of `kind` (certificates.kind), if any.
std::optional<Procedure> procedure_of_certificate_kind(std::string_view kind);
/// Every option some procedure takes, once each (for refusing those the chosen procedure does not take).
std::span<const std::string_view> procedure_options();

}  // namespace plumb::checks
