#pragma once
// A small document model for PDF certificates and reports: a header repeated on every page and a list
// of blocks (heading, key-value list, table, paragraph, verdict, chart, signatures). Each certificate
// kind maps its stored JSON to blocks (certificate_document.hpp); document_pdf.hpp lays them out on
// A4 pages with cairo and pango. So a new kind adds its sections, never a renderer.
#include <string>
#include <utility>
#include <variant>
#include <vector>

#include "report/chart/chart.hpp"

namespace plumb::report {

struct DocumentHeader {
  std::string lab_name;
  std::vector<std::string> address_lines;
  std::string accreditation;
  std::string logo_png;  ///< path; drawn when readable
  std::string title;     ///< "Balance check certificate"
  std::string number;    ///< printed on every page with "page x of y"
  std::string status;    ///< e.g. "approved", "draft"; printed beside the number when present
  std::string issued;    ///< "Issued 2026-12-01T10:00:00Z by Q. Manager"
};

struct Heading {
  std::string text;
};

struct KeyValues {
  std::vector<std::pair<std::string, std::string>> rows;
};

struct Table {
  std::vector<std::string> headers;
  std::vector<double> widths;  ///< relative column widths; equal when empty
  std::vector<bool> right;     ///< right-align the column (numbers); left when absent
  std::vector<std::vector<std::string>> rows;
};

struct Paragraph {
  std::string text;
  bool small = false;
  bool italic = false;
};

/// The verdict, boxed: what an auditor looks for first.
struct VerdictBox {
  std::string verdict;  ///< "PASS", "FAIL"
  std::string detail;   ///< "Next check due: 2026-12-07"
  bool pass = true;
};

struct ChartBlock {
  ChartSpec spec;  ///< drawn at the text width; its own height
};

struct Signatory {
  std::string role, name;
};
struct Signatures {
  std::vector<Signatory> people;
};

using Block = std::variant<Heading, KeyValues, Table, Paragraph, VerdictBox, ChartBlock, Signatures>;

struct Document {
  DocumentHeader header;
  std::vector<Block> blocks;
  std::string footer;  ///< small print on every page (e.g. the content hash)
};

}  // namespace plumb::report
