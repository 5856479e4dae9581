#pragma once
// The renderings of a stored certificate, all drawn from its one Document (report/certificates/document.hpp):
// text, HTML and JSON here, PDF through report/document/pdf.hpp, DCC through report/dcc/. `shown` is the stored
// content with "content_sha256" and "status" beside it (app::certificate_document).
#include <nlohmann/json.hpp>
#include <string>

namespace plumb::report {

std::string certificate_text(const nlohmann::json& shown);
std::string certificate_html(const nlohmann::json& shown);
/// The stored record as it is, with "rendering": every labelled value the other renderings show
/// (report/document/values.hpp), so a program reads the same certificate a person does.
nlohmann::json certificate_json(const nlohmann::json& shown);

}  // namespace plumb::report
