#include "report/status/summary.hpp"

#include <fmt/ostream.h>

#include <nlohmann/json.hpp>

#include <utility>

#include "report/format/csv.hpp"
#include "report/format/text.hpp"

namespace plumb::report {
namespace {

std::string opt_date(const std::optional<Date>& d) { return d ? to_string(*d) : ""; }
std::string opt_number(const std::optional<double>& v) { return v ? fmt::format("{:.6g}", *v) : ""; }
std::string opt_int(const std::optional<int>& v) { return v ? std::to_string(*v) : ""; }

nlohmann::json row_json(const SummaryRow& r) {
  const auto& i = r.instrument;
  const auto opt = [](const auto& v) { return v ? nlohmann::json(*v) : nlohmann::json(); };
  nlohmann::json latest;
  if (i.latest)
    latest = {{"run_id", i.latest->run_id},
              {"procedure", std::string(checks::to_string(i.latest->procedure))},
              {"date", to_string(i.latest->performed_on)},
              {"operator", i.latest->operator_name},
              {"verdict", std::string(to_string(i.latest->verdict))},
              {"bias_g", opt(i.latest->bias_g)},
              {"sd_g", opt(i.latest->sd_g)},
              {"systematic_error_pct", opt(i.latest->systematic_error_pct)},
              {"cv_pct", opt(i.latest->cv_pct)}};
  return {{"id", i.id},
          {"kind", i.kind},
          {"location", i.location},
          {"check_every", i.check_every},
          {"status", r.status},
          {"next_due", r.next_due ? nlohmann::json(to_string(*r.next_due)) : nlohmann::json()},
          {"days_left", opt(r.days_left)},
          {"latest", latest}};
}

constexpr const char* text_row = "{:<16}{:<9}{:<16}{:<12}{:>6}  {:<11}{:<8}{:<17}{}\n";

/// The latest result as a person reads it: a balance's bias and s in mg to the decimals its d calls for, a
/// pipette's systematic error and CV in %. Empty where the latest run has no such result (a calibration).
std::pair<std::string, std::string> result_texts(const store::InstrumentStatus& i) {
  const auto& l = *i.latest;
  const std::string d = i.readability_g.value_or("");
  std::string accuracy, precision;
  if (l.bias_g) accuracy = "bias " + milligrams_for_d(*l.bias_g, d, 1, true);
  if (l.sd_g) precision = "s " + milligrams_for_d(*l.sd_g, d, 2, false);
  if (l.systematic_error_pct) accuracy = fmt::format("e_s {:+.2f} %", *l.systematic_error_pct);
  if (l.cv_pct) precision = fmt::format("CV {:.2f} %", *l.cv_pct);
  return {accuracy, precision};
}

}  // namespace

SummaryWriter::SummaryWriter(std::ostream& out, SummaryFormat format, Date on) : out_(out), format_(format) {
  switch (format_) {
    case SummaryFormat::as_json: fmt::print(out_, "{{\n  \"on\": \"{}\",\n  \"instruments\": [", to_string(on)); break;
    case SummaryFormat::as_csv:
      CsvWriter(out_).header({"id", "kind", "location", "status", "next_due", "days_left", "last_run", "last_date",
                              "procedure", "verdict", "bias_g", "sd_g", "systematic_error_pct", "cv_pct"});
      break;
    case SummaryFormat::as_text:
      fmt::print(out_, "Lab summary on {}:\n", to_string(on));
      fmt::print(out_, text_row, "instrument", "kind", "status", "next due", "days", "last check", "verdict",
                 "accuracy", "precision");
      break;
  }
}

void SummaryWriter::row(const SummaryRow& r) {
  const auto& i = r.instrument;
  const auto& l = i.latest;
  switch (format_) {
    case SummaryFormat::as_json: out_ << (count_ ? ",\n    " : "\n    ") << row_json(r).dump(); break;
    case SummaryFormat::as_csv: {
      CsvWriter csv(out_);
      csv.value(i.id).value(i.kind).text(i.location).value(r.status).value(opt_date(r.next_due));
      csv.value(opt_int(r.days_left));
      if (l) {
        csv.integer(l->run_id).value(to_string(l->performed_on)).value(checks::to_string(l->procedure));
        csv.value(to_string(l->verdict)).value(opt_number(l->bias_g)).value(opt_number(l->sd_g));
        csv.value(opt_number(l->systematic_error_pct)).value(opt_number(l->cv_pct));
      } else {
        csv.empty().empty().empty().empty().empty().empty().empty().empty();
      }
      csv.end_row();
      break;
    }
    case SummaryFormat::as_text: {
      const auto [accuracy, precision] = l ? result_texts(i) : std::pair<std::string, std::string>();
      fmt::print(out_, text_row, i.id, i.kind, r.status, r.next_due ? to_string(*r.next_due) : "-",
                 opt_int(r.days_left), l ? to_string(l->performed_on) : "never",
                 l ? std::string(to_string(l->verdict)) : "-", accuracy, precision);
      break;
    }
  }
  ++count_;
}

void SummaryWriter::finish() {
  switch (format_) {
    case SummaryFormat::as_json: out_ << (count_ ? "\n  ]\n}\n" : "]\n}\n"); break;
    case SummaryFormat::as_csv: break;
    case SummaryFormat::as_text:
      fmt::print(out_, "{} instrument(s).\n", count_);
      for (const auto& l : wrap("Balances: bias and repeatability s of the latest check, in mg to the readability. "
                                "Pipettes: the systematic error e_s farthest from zero and the largest CV over the "
                                "test volumes and channels of the latest check (ISO 8655-6).",
                                100))
        fmt::print(out_, "{}\n", l);
      break;
  }
}

}  // namespace plumb::report
