#pragma once
// A stored certificate as a Digital Calibration Certificate (DCC 3.1.2): the same stored document the text,
// JSON and PDF render, with its standing today (draft, approved, superseded, withdrawn).
#include <string>

#include "report/dcc/certificate_dcc.hpp"
#include "store/database.hpp"

namespace plumb::app {

/// The DCC XML of the certificate `selector` (a certificate number, a run number or LAST).
std::string certificate_dcc(store::Database& db, const std::string& selector, const report::dcc::DccOptions& options);

}  // namespace plumb::app
