#include "report/document/pdf.hpp"

#include <cairo-pdf.h>
#include <fmt/format.h>

#include <algorithm>
#include <filesystem>
#include <functional>
#include <memory>
#include <stdexcept>

#include "report/chart/cairo_backend.hpp"
#include "report/chart/cairo_player.hpp"
#include "report/chart/pango_text.hpp"

namespace plumb::report {
namespace {

// A4 in points; margins leave room for binding and punching.
constexpr double page_w = 595.28, page_h = 841.89;
constexpr double margin_x = 48, margin_top = 40, margin_bottom = 36;
constexpr double text_w = page_w - 2 * margin_x;
constexpr double footer_h = 30;

struct PageRgb {
  double r, g, b;
};
constexpr PageRgb page_ink{0.10, 0.10, 0.10};
constexpr PageRgb page_muted{0.38, 0.38, 0.38};
constexpr PageRgb page_rule_grey{0.70, 0.70, 0.70};
constexpr PageRgb page_header_fill{0.91, 0.93, 0.95};
constexpr PageRgb page_stripe_fill{0.97, 0.97, 0.97};
constexpr PageRgb page_pass_colour{0.000, 0.620, 0.451};  // the charts' bluish green
constexpr PageRgb page_fail_colour{0.835, 0.369, 0.000};  // the charts' vermillion

void colour(cairo_t* cr, PageRgb c) {
  cairo_set_source_rgb(cr, c.r, c.g, c.b);
}

void hrule(cairo_t* cr, double y, double width = 0.6, PageRgb c = page_rule_grey) {
  colour(cr, c);
  cairo_set_line_width(cr, width);
  cairo_move_to(cr, margin_x, y);
  cairo_line_to(cr, page_w - margin_x, y);
  cairo_stroke(cr);
}

struct SurfaceDeleter {
  void operator()(cairo_surface_t* s) const { cairo_surface_destroy(s); }
};
using Surface = std::unique_ptr<cairo_surface_t, SurfaceDeleter>;
using ChartLayout = std::function<Drawing(const ChartSpec&)>;

/// Writes the blocks page by page. Run twice: first to count the pages, then to draw with "of N".
class Flow {
 public:
  Flow(cairo_t* cr, const Document& doc, cairo_surface_t* logo, int total_pages, const ChartLayout& lay_out)
      : cr_(cr), doc_(doc), logo_(logo), total_(total_pages), lay_out_(lay_out) {}

  int run() {
    first_header();
    for (std::size_t i = 0; i < doc_.blocks.size(); ++i) {
      // A heading over a chart moves to the next page with it: a chart never splits, so 40 points are not enough.
      if (std::holds_alternative<Heading>(doc_.blocks[i]) && i + 1 < doc_.blocks.size())
        if (const auto* chart = std::get_if<ChartBlock>(&doc_.blocks[i + 1]))
          need(measure(std::get<Heading>(doc_.blocks[i]).text, 11, true, text_w) + 14 +
               chart->spec.height * text_w / chart->spec.width + 6);
      std::visit([this](const auto& x) { block(x); }, doc_.blocks[i]);
    }
    footer();
    return page_;
  }

 private:
  [[nodiscard]] double bottom() const { return page_h - margin_bottom - footer_h; }

  void new_page() {
    footer();
    cairo_show_page(cr_);
    ++page_;
    continuation_header();
  }
  /// Starts a new page unless `height` fits below the cursor (a block taller than a page starts at the top).
  void need(double height) {
    if (y_ + height > bottom() && y_ > top_of_body_ + 1) new_page();
  }

  double text(const std::string& s, double x, double y, double size, PageRgb c, bool bold = false, bool italic = false,
              double wrap = -1) {
    TextLayout t(cr_, s, size, bold, italic, wrap);
    colour(cr_, c);
    t.draw(x, y);
    return t.height();
  }
  double measure(const std::string& s, double size, bool bold = false, double wrap = -1) {
    return TextLayout(cr_, s, size, bold, false, wrap).height();
  }

  // ---- page furniture -----------------------------------------------------------------------------
  void first_header() {
    const auto& h = doc_.header;
    double x = margin_x, y = margin_top;
    double logo_bottom = y;
    if (logo_) {
      const double iw = cairo_image_surface_get_width(logo_), ih = cairo_image_surface_get_height(logo_);
      const double scale = std::min(52.0 / ih, 120.0 / iw);
      cairo_save(cr_);
      cairo_translate(cr_, x, y);
      cairo_scale(cr_, scale, scale);
      cairo_set_source_surface(cr_, logo_, 0, 0);
      cairo_paint(cr_);
      cairo_restore(cr_);
      x += iw * scale + 12;
      logo_bottom = y + ih * scale;
    }
    const double right_w = 150;
    const double lab_w = page_w - margin_x - right_w - x - 8;
    double ly = y;
    ly += text(h.lab_name, x, ly, 13, page_ink, true, false, lab_w) + 1;
    for (const auto& l : h.address_lines) ly += text(l, x, ly, 8.5, page_muted, false, false, lab_w);
    if (!h.accreditation.empty()) ly += 2 + text(h.accreditation, x, ly, 8, page_muted, false, true, lab_w);
    const double rx = page_w - margin_x - right_w;
    double ry = y;
    ry += text("Certificate No.", rx, ry, 8, page_muted, false, false, right_w);
    ry += text(h.number, rx, ry, 12, page_ink, true, false, right_w);
    if (!h.status.empty()) ry += text("Status: " + h.status, rx, ry, 9, page_ink, true, false, right_w);
    y = std::max({ly, ry, logo_bottom}) + 8;
    hrule(cr_, y, 1.0, page_ink);
    y += 10;
    y += text(h.title, margin_x, y, 16, page_ink, true, false, text_w) + 2;
    if (!h.issued.empty()) y += text(h.issued, margin_x, y, 8.5, page_muted, false, false, text_w);
    y_ = y + 8;
    top_of_body_ = y_;
  }

  void continuation_header() {
    const auto& h = doc_.header;
    double y = margin_top;
    // The number (with the status, which can be long) takes the width it needs; the lab and title wrap beside it.
    TextLayout num(cr_, "No. " + h.number + (h.status.empty() ? "" : " (" + h.status + ")"), 10, true);
    colour(cr_, page_ink);
    num.draw(page_w - margin_x - num.width(), y);
    const double left_h =
        text(h.lab_name + " \u2014 " + h.title, margin_x, y, 8.5, page_muted, false, false, text_w - num.width() - 16);
    y += std::max({num.height(), left_h, 12.0}) + 4;
    hrule(cr_, y, 0.8, page_ink);
    y_ = y + 10;
    top_of_body_ = y_;
  }

  // Across the page, light enough to read through, on every page of a certificate that is not valid.
  void watermark() {
    const std::string& mark = doc_.header.watermark;
    if (mark.empty()) return;
    TextLayout t(cr_, mark, 64, true);
    cairo_save(cr_);
    cairo_translate(cr_, page_w / 2, page_h / 2);
    cairo_rotate(cr_, -0.9);
    cairo_set_source_rgba(cr_, 0.75, 0.1, 0.1, 0.16);
    t.draw(-t.width() / 2, -t.height() / 2);
    cairo_restore(cr_);
  }

  void footer() {
    watermark();
    const double y = page_h - margin_bottom - footer_h + 8;
    hrule(cr_, y);
    const std::string pages = total_ > 0 ? fmt::format("page {} of {}", page_, total_) : fmt::format("page {}", page_);
    TextLayout right(cr_, fmt::format("Certificate No. {}   {}", doc_.header.number, pages), 8, true);
    colour(cr_, page_ink);
    right.draw(page_w - margin_x - right.width(), y + 4);
    if (!doc_.footer.empty())
      text(doc_.footer, margin_x, y + 4, 6.5, page_muted, false, false, text_w - right.width() - 16);
  }

  // ---- blocks -------------------------------------------------------------------------------------
  void block(const Heading& h) {
    const double height = measure(h.text, 11, true, text_w);
    need(height + 8 + 40);  // keep a heading with the start of what it heads
    y_ += 8;
    y_ += text(h.text, margin_x, y_, 11, page_ink, true, false, text_w) + 2;
    hrule(cr_, y_, 0.5);
    y_ += 4;
  }

  void block(const KeyValues& kv) {
    const double key_w = 0.32 * text_w, val_w = text_w - key_w - 8;
    for (const auto& [k, v] : kv.rows) {
      const double h = std::max(measure(k, 8.5, false, key_w), measure(v, 8.5, false, val_w)) + 2;
      need(h);
      text(k, margin_x, y_, 8.5, page_muted, false, false, key_w);
      text(v, margin_x + key_w + 8, y_, 8.5, page_ink, false, false, val_w);
      y_ += h;
    }
    y_ += 4;
  }

  std::vector<double> column_widths(const Table& t) const {
    const std::size_t n = t.headers.size();
    std::vector<double> w = t.widths.size() == n ? t.widths : std::vector<double>(n, 1.0);
    double sum = 0;
    for (double x : w) sum += x;
    for (double& x : w) x = x / sum * text_w;
    return w;
  }

  double row(const Table& t, const std::vector<std::string>& cells, const std::vector<double>& w, bool head,
             bool stripe) {
    constexpr double pad = 3, size = 8;
    double h = 0;
    for (std::size_t i = 0; i < cells.size() && i < w.size(); ++i)
      h = std::max(h, measure(cells[i], size, head, w[i] - 2 * pad));
    h += 2 * pad - 1;
    if (head || stripe) {
      colour(cr_, head ? page_header_fill : page_stripe_fill);
      cairo_rectangle(cr_, margin_x, y_, text_w, h);
      cairo_fill(cr_);
    }
    double x = margin_x;
    for (std::size_t i = 0; i < cells.size() && i < w.size(); ++i) {
      TextLayout c(cr_, cells[i], size, head, false, w[i] - 2 * pad);
      colour(cr_, page_ink);
      const bool right = i < t.right.size() && t.right[i] && !head;
      c.draw(right ? x + w[i] - pad - c.width() : x + pad, y_ + pad - 0.5);
      x += w[i];
    }
    y_ += h;
    return h;
  }

  double row_height(const std::vector<std::string>& cells, const std::vector<double>& w, bool head) {
    double h = 0;
    for (std::size_t i = 0; i < cells.size() && i < w.size(); ++i)
      h = std::max(h, measure(cells[i], 8, head, w[i] - 6));
    return h + 5;
  }

  void block(const Table& t) {
    const auto w = column_widths(t);
    const double head_h = row_height(t.headers, w, true);
    need(head_h + (t.rows.empty() ? 0 : row_height(t.rows.front(), w, false)));
    row(t, t.headers, w, true, false);
    for (std::size_t i = 0; i < t.rows.size(); ++i) {
      if (y_ + row_height(t.rows[i], w, false) > bottom()) {
        new_page();
        row(t, t.headers, w, true, false);  // the header again, so every page reads on its own
      }
      row(t, t.rows[i], w, false, i % 2 == 1);
    }
    hrule(cr_, y_, 0.5);
    y_ += 6;
  }

  void block(const Paragraph& p) {
    const double size = p.small ? 7.5 : 9;
    need(measure(p.text, size, false, text_w));
    y_ += text(p.text, margin_x, y_, size, p.small ? page_muted : page_ink, false, p.italic, text_w) + 4;
  }

  void block(const VerdictBox& v) {
    const double inner = text_w - 20;
    const double h = measure(v.verdict, 15, true, inner) + measure(v.detail, 9.5, false, inner) + 16;
    need(h + 8);
    y_ += 4;
    const PageRgb c = v.pass ? page_pass_colour : page_fail_colour;
    colour(cr_, c);
    cairo_set_line_width(cr_, 1.6);
    cairo_rectangle(cr_, margin_x, y_, text_w, h);
    cairo_stroke(cr_);
    double y = y_ + 8;
    y += text(v.verdict, margin_x + 10, y, 15, c, true, false, inner);
    text(v.detail, margin_x + 10, y, 9.5, page_ink, false, false, inner);
    y_ += h + 8;
  }

  void block(const ChartBlock& c) {
    const double scale = text_w / c.spec.width;
    const double h = c.spec.height * scale;
    need(h + 6);
    cairo_save(cr_);
    cairo_translate(cr_, margin_x, y_);
    cairo_scale(cr_, scale, scale);
    play_drawing(cr_, lay_out_(c.spec));
    cairo_restore(cr_);
    y_ += h + 6;
  }

  void block(const Signatures& s) {
    constexpr int per_row = 2;
    const double col_w = text_w / per_row;
    for (std::size_t i = 0; i < s.people.size(); i += per_row) {
      need(70);
      double tallest = 0;
      for (std::size_t j = i; j < std::min(i + per_row, s.people.size()); ++j) {
        const double x = margin_x + static_cast<double>(j - i) * col_w;
        double y = y_;
        const Signatory& who = s.people[j];
        y += text(who.role, x, y, 9, page_ink, true, false, col_w - 12);
        y += text(who.name.empty() ? " " : who.name, x, y, 9, page_ink, false, false, col_w - 12);
        if (!who.function.empty()) y += text(who.function, x, y, 8, page_muted, false, false, col_w - 12);
        if (!who.signed_at.empty()) {
          // Signed in plumb: the signature's meaning and time take the place of the lines to sign by hand.
          y += text(fmt::format("Signed electronically on {}: \u201c{}\u201d", who.signed_at, who.meaning), x, y, 8,
                    page_ink, false, true, col_w - 12);
          tallest = std::max(tallest, y + 4 - y_);
          continue;
        }
        y += 26;
        colour(cr_, page_ink);
        cairo_set_line_width(cr_, 0.6);
        cairo_move_to(cr_, x, y);
        cairo_line_to(cr_, x + col_w * 0.55, y);
        cairo_move_to(cr_, x + col_w * 0.62, y);
        cairo_line_to(cr_, x + col_w - 12, y);
        cairo_stroke(cr_);
        text("signature", x, y + 2, 7, page_muted);
        text("date", x + col_w * 0.62, y + 2, 7, page_muted);
        tallest = std::max(tallest, y + 12 - y_);
      }
      y_ += tallest + 6;
    }
  }

  cairo_t* cr_;
  const Document& doc_;
  cairo_surface_t* logo_;
  int total_;
  const ChartLayout& lay_out_;
  int page_ = 1;
  double y_ = 0, top_of_body_ = 0;
};

int draw_document(const Document& doc, cairo_surface_t* logo, int total, const ChartLayout& lay_out, std::string& out) {
  Surface surface(cairo_pdf_surface_create_for_stream(append_to_string_closure, &out, page_w, page_h));
  cairo_pdf_surface_set_metadata(surface.get(), CAIRO_PDF_METADATA_TITLE,
                                 (doc.header.title + " " + doc.header.number).c_str());
  cairo_pdf_surface_set_metadata(surface.get(), CAIRO_PDF_METADATA_CREATOR, "plumb");
  cairo_t* cr = cairo_create(surface.get());
  const int pages = Flow(cr, doc, logo, total, lay_out).run();
  const cairo_status_t st = cairo_status(cr);
  cairo_destroy(cr);
  cairo_surface_finish(surface.get());
  if (st != CAIRO_STATUS_SUCCESS)
    throw std::runtime_error(fmt::format("PDF drawing failed: {}", cairo_status_to_string(st)));
  return pages;
}

}  // namespace

RenderedPdf render_pdf_with_cairo(const Document& doc, const ChartLayout& lay_out) {
  RenderedPdf result;
  Surface logo;
  if (!doc.header.logo_png.empty()) {
    if (std::filesystem::is_regular_file(doc.header.logo_png))
      logo.reset(cairo_image_surface_create_from_png(doc.header.logo_png.c_str()));
    if (!logo || cairo_surface_status(logo.get()) != CAIRO_STATUS_SUCCESS) {
      logo.reset();
      result.warnings.push_back(fmt::format(
          "logo \"{}\" could not be read as a PNG image; the PDF is drawn without it.", doc.header.logo_png));
    }
  }
  // First pass counts the pages (drawn to a scratch PDF, so text is measured exactly as in the real one).
  std::string scratch;
  const int pages = draw_document(doc, logo.get(), 0, lay_out, scratch);
  result.pages = draw_document(doc, logo.get(), pages, lay_out, result.bytes);
  return result;
}

}  // namespace plumb::report
