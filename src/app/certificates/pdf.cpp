#include "app/certificates/pdf.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/errors.hpp"
#include "report/certificates/document.hpp"
#include "report/document/pdf.hpp"
#include "store/file_output.hpp"

namespace plumb::app {

void require_pdf_path(const std::filesystem::path& output) {
  std::string ext = output.extension().string();
  std::transform(ext.begin(), ext.end(), ext.begin(),
                 [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  if (ext != ".pdf") throw InputError(fmt::format("--output \"{}\" must end in .pdf.", output.string()));
  const auto folder = output.parent_path();
  if (!folder.empty() && !std::filesystem::is_directory(folder))
    throw InputError(
        fmt::format("--output \"{}\": the folder \"{}\" does not exist.", output.string(), folder.string()));
}

PdfOutcome write_certificate_pdf(const nlohmann::json& shown, const std::filesystem::path& output) {
  require_pdf_path(output);
  const auto pdf = report::render_pdf(report::certificate_document(shown));
  store::write_whole_file(output, pdf.bytes, "PDF file");
  return {pdf.pages, pdf.warnings};
}

}  // namespace plumb::app
