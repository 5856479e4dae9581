#pragma once
// Writing a stored certificate as a PDF document (a rendering of its stored JSON; nothing is recomputed).
#include <filesystem>
#include <string>
#include <vector>

#include "store/records.hpp"

namespace plumb::app {

struct PdfOutcome {
  int pages = 0;
  std::vector<std::string> warnings;
};

/// Checks the --output path before any work: ends in .pdf and its folder exists (InputError otherwise).
void require_pdf_path(const std::filesystem::path& output);

/// Renders and writes; StorageError when the file cannot be written.
PdfOutcome write_certificate_pdf(const store::CertificateRecord& certificate, const std::filesystem::path& output);

}  // namespace plumb::app
