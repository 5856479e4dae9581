#pragma once
// Writing a stored certificate as a PDF document (a rendering of its stored JSON; nothing is recomputed).
#include <filesystem>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace plumb::app {

struct PdfOutcome {
  int pages = 0;
  std::vector<std::string> warnings;
};

/// Checks the --output path before any work: ends in .pdf and its folder exists (InputError otherwise).
void require_pdf_path(const std::filesystem::path& output);

/// Renders `shown` (the stored content with its hash and status: app::certificate_document) and writes it;
/// StorageError when the file cannot be written.
PdfOutcome write_certificate_pdf(const nlohmann::json& shown, const std::filesystem::path& output);

}  // namespace plumb::app
