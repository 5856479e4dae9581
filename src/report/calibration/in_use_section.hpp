#pragma once
// The section of a balance calibration certificate on normal use (content "in_use", app::certificate_in_use): the
// terms the lab declared for the balance, the global uncertainty of a weighing result U(W) in its form with its
// coefficients, the minimum weight from calibration beside the USP <41> one, which binds, the sources and the
// caution. Where no terms are declared, the one line that says so. Every rendering draws it from the Document.
#include <nlohmann/json.hpp>

#include "report/document/document.hpp"

namespace plumb::report {

void in_use_certificate_section(const nlohmann::json& in_use, Document& doc);

}  // namespace plumb::report
