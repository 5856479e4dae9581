#pragma once
// The one document model of a certificate: a header repeated on every page and a list of blocks (heading,
// key-value list, table, paragraph, verdict, chart, signatures). Each certificate kind maps its stored JSON to
// blocks (report/certificates/document.hpp); the renderers lay the same blocks out as PDF (pdf.hpp), plain text
// (text.hpp), HTML (html.hpp) and a JSON list of labelled values (values.hpp). So a new kind adds its sections,
// never a renderer, and no rendering can say less than another.
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
  /// "DRAFT", "WITHDRAWN", "SUPERSEDED": marked across every page and at the top and end of every rendering, so
  /// no copy of a certificate that is not (or no longer) valid can pass for a valid one. Empty when valid.
  std::string watermark;
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

/// A person on the certificate. Signed electronically (in plumb, with its meaning and time) or a line to sign by
/// hand when `signed_at` is empty.
struct Signatory {
  std::string role;       ///< "Performed by", "Reviewed and approved by"
  std::string name;       ///< printed name; empty: to be filled in by hand
  std::string function;   ///< "operator", "reviewer", a job title
  std::string meaning;    ///< what the signature means, as the signer stated it
  std::string signed_at;  ///< UTC, ISO 8601
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
