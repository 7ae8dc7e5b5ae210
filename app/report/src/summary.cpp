// The page layout of the lot acceptance summary. Pages are laid out twice with the same code:
// once without painting to count them (for "page N of M"), once to draw.
#include "photolot/report/summary.h"

#include <fmt/format.h>

#include <QApplication>
#include <QFontMetricsF>
#include <QPageSize>
#include <QPainter>
#include <QPdfWriter>
#include <QSaveFile>
#include <algorithm>
#include <memory>

#include "content.h"
#include "plots.h"

namespace photolot::report {

std::string_view to_string(PageSize size) { return size == PageSize::letter ? "Letter" : "A4"; }

std::string SummaryInput::validate() const {
  if (lot == nullptr) return "the summary needs a lot (lot is null)";
  if (fit == nullptr) return "the summary needs the lot's fit (fit is null)";
  if (fit->units.size() != lot->units.size())
    return fmt::format("the fit has {} units but the lot has {}: they must be the same lot",
                       fit->units.size(), lot->units.size());
  if (bench != nullptr)
    if (std::string why = bench->validate(); !why.empty())
      return "the bench profile is not valid: " + why;
  return {};
}

namespace {

constexpr int kDpi = 300;
const QColor kRule(150, 150, 150);
const QColor kLabel(90, 90, 90);

QString qs(const std::string& s) { return QString::fromStdString(s); }

QFont font(double pt, bool bold = false) {
  QFont f("DejaVu Sans");
  // No shaping for Latin text: no "fi"/"fl" ligatures, so the PDF's text searches and copies
  // as typed (unit ids, reasons).
  f.setStyleStrategy(QFont::PreferNoShaping);
  f.setPointSizeF(pt);
  f.setBold(bold);
  return f;
}

class Flow {
 public:
  Flow(QPdfWriter& writer, QPainter* painter, const Content& content, int total_pages)
      : writer_(writer), p_(painter), c_(content), total_(total_pages) {
    const QSizeF size_mm = writer.pageLayout().fullRect(QPageLayout::Millimeter).size();
    width_ = mm(size_mm.width());
    height_ = mm(size_mm.height());
    left_ = mm(18);
    right_ = width_ - mm(18);
    top_ = mm(15);
    bottom_ = height_ - mm(17);
    y_ = top_;
  }

  int page() const { return page_; }
  double mm(double v) const { return v * kDpi / 25.4; }
  double text_width() const { return right_ - left_; }

  // Height of `text` wrapped into `width`.
  double measure(const QString& text, const QFont& f, double width) const {
    QFontMetricsF fm(f, &writer_);
    return fm.boundingRect(QRectF(0, 0, width, 1e7), Qt::TextWordWrap, text).height();
  }

  void text(const QRectF& r, const QString& t, const QFont& f, int flags = Qt::TextWordWrap,
            const QColor& color = Qt::black) {
    if (!p_) return;
    p_->setFont(f);
    p_->setPen(color);
    p_->drawText(r, flags, t);
  }

  void line(double x1, double y1, double x2, double y2, double width_mm, const QColor& color,
            Qt::PenStyle style = Qt::SolidLine) {
    if (!p_) return;
    p_->setPen(QPen(color, mm(width_mm), style, Qt::FlatCap));
    p_->drawLine(QPointF(x1, y1), QPointF(x2, y2));
  }

  void ensure(double h) {
    if (y_ + h > bottom_) new_page();
  }

  void new_page() {
    footer();
    if (p_) writer_.newPage();
    ++page_;
    y_ = top_;
  }

  void finish() { footer(); }

  void space(double v_mm) { y_ += mm(v_mm); }

  void title() {
    const QFont t = font(15, true);
    const double h = measure("Lot", t, text_width());
    text(QRectF(left_, y_, text_width(), h), "Lot acceptance summary", t, Qt::AlignLeft);
    text(QRectF(left_, y_, text_width(), h), "CdS photoresistors \u00b7 incoming inspection",
         font(9), Qt::AlignRight | Qt::AlignBottom, kLabel);
    y_ += h + mm(1.5);
    line(left_, y_, right_, y_, 0.6, Qt::black);
    y_ += mm(3);
  }

  // keep_mm: how much of what follows must fit below the heading on the same page.
  void heading(const std::string& s, double keep_mm = 14) {
    ensure(heading_height() + mm(keep_mm));
    heading_inline(s);
  }

  void paragraph(const std::string& s, const QFont& f, const QColor& color = Qt::black) {
    const double h = measure(qs(s), f, text_width());
    ensure(h);
    text(QRectF(left_, y_, text_width(), h), qs(s), f, Qt::TextWordWrap, color);
    y_ += h + mm(1.5);
  }

  // The hand-filled fields, two to a row: value on a line, its label below.
  void header_fields() {
    const SummaryHeader& h = c_.header;
    const std::vector<std::pair<std::string, std::string>> fields = {
        {"Part number", h.part},    {"Lot / date code", h.lot_id.empty() ? c_.lot_name : h.lot_id},
        {"Supplier", h.supplier},   {"Date of inspection", h.date},
        {"Inspector", h.inspector}, {"Units logged", fmt::format("{}", c_.units_logged)}};
    const double gap = mm(8);
    const double col = (text_width() - gap) / 2;
    const QFont value = font(10);
    const QFont label = font(7);
    const double vh = measure("Xg", value, col);
    const double lh = measure("Xg", label, col);
    for (std::size_t i = 0; i < fields.size(); i += 2) {
      for (std::size_t k = 0; k < 2 && i + k < fields.size(); ++k) {
        const double x = left_ + static_cast<double>(k) * (col + gap);
        text(QRectF(x + mm(1), y_, col - mm(1), vh), qs(fields[i + k].second), value,
             Qt::AlignLeft | Qt::AlignBottom);
        line(x, y_ + vh + mm(0.6), x + col, y_ + vh + mm(0.6), 0.25, Qt::black);
        text(QRectF(x, y_ + vh + mm(0.9), col, lh), qs(fields[i + k].first), label, Qt::AlignLeft,
             kLabel);
      }
      y_ += vh + lh + mm(3);
    }
  }

  void disposition() {
    const double pad = mm(3);
    const double word_w = mm(58);
    const QFont word = font(20, true);
    const QFont reason = font(10, true);
    const QFont rule = font(8.5);
    const double tw = text_width() - word_w - 3 * pad;
    double h = measure(qs(c_.disposition_reason), reason, tw) + mm(1);
    for (const std::string& s : c_.disposition_rule) h += measure(qs(s), rule, tw) + mm(0.8);
    h = std::max(h, measure("X", word, word_w) + mm(6)) + 2 * pad;
    ensure(h);
    if (p_) {
      p_->setPen(QPen(Qt::black, mm(0.7)));
      p_->setBrush(Qt::NoBrush);
      p_->drawRect(QRectF(left_, y_, text_width(), h));
    }
    text(QRectF(left_ + pad, y_ + pad, word_w, mm(4)), "Disposition", font(7), Qt::AlignLeft,
         kLabel);
    text(QRectF(left_ + pad, y_ + pad + mm(3), word_w, h - 2 * pad - mm(3)), qs(c_.disposition),
         word, Qt::AlignLeft | Qt::AlignVCenter);
    line(left_ + word_w + pad, y_ + pad, left_ + word_w + pad, y_ + h - pad, 0.25, kRule);
    double ty = y_ + pad;
    const double tx = left_ + word_w + 2 * pad;
    const double rh = measure(qs(c_.disposition_reason), reason, tw);
    text(QRectF(tx, ty, tw, rh), qs(c_.disposition_reason), reason);
    ty += rh + mm(1);
    for (const std::string& s : c_.disposition_rule) {
      const double sh = measure(qs(s), rule, tw);
      text(QRectF(tx, ty, tw, sh), qs(s), rule);
      ty += sh + mm(0.8);
    }
    y_ += h + mm(2);
  }

  void key_values(const std::vector<KeyValue>& rows, double key_mm = 52) {
    const QFont k = font(8.5);
    const QFont v = font(8.5);
    const double kw = mm(key_mm);
    const double vw = text_width() - kw - mm(2);
    for (const KeyValue& kv : rows) {
      const double h = std::max(measure(qs(kv.key), k, kw), measure(qs(kv.value), v, vw));
      ensure(h);
      text(QRectF(left_, y_, kw, h), qs(kv.key), k, Qt::TextWordWrap, kLabel);
      text(QRectF(left_ + kw + mm(2), y_, vw, h), qs(kv.value), v);
      y_ += h + mm(1.0);
    }
  }

  // A table, under its section heading when `title` is given (kept on the same page).
  void table(const Table& t, const std::string& title = {}) {
    if (t.headers.empty()) return;
    double total = 0;
    for (double w : t.widths) total += w;
    std::vector<double> x(t.widths.size() + 1, left_);
    for (std::size_t i = 0; i < t.widths.size(); ++i)
      x[i + 1] = x[i] + text_width() * t.width_fraction * t.widths[i] / total;
    const double table_right = x.back();
    const QFont hf = font(8, true);
    const QFont cf = font(8);
    const double pad = mm(1.2);
    const auto row_height = [&](const std::vector<std::string>& cells, const QFont& f) {
      double h = 0;
      for (std::size_t i = 0; i < cells.size() && i + 1 < x.size(); ++i)
        h = std::max(h, measure(qs(cells[i]), f, x[i + 1] - x[i] - 2 * pad));
      return h + 2 * pad;
    };
    const auto draw_row = [&](const std::vector<std::string>& cells, const QFont& f, double h) {
      for (std::size_t i = 0; i < cells.size() && i + 1 < x.size(); ++i) {
        const int align =
            (t.right_aligned.size() > i && t.right_aligned[i]) ? Qt::AlignRight : Qt::AlignLeft;
        text(QRectF(x[i] + pad, y_ + pad, x[i + 1] - x[i] - 2 * pad, h - 2 * pad), qs(cells[i]), f,
             align | Qt::TextWordWrap);
      }
    };
    const auto header = [&]() {
      const double h = row_height(t.headers, hf);
      draw_row(t.headers, hf, h);
      y_ += h;
      line(left_, y_, table_right, y_, 0.35, Qt::black);
    };
    // A table that fits on a page is kept together; a longer one starts with at least a row.
    const double title_h = title.empty() ? 0 : heading_height();
    double whole = row_height(t.headers, hf);
    for (const auto& r : t.rows) whole += row_height(r, cf);
    if (title_h + whole <= bottom_ - top_)
      ensure(title_h + whole);
    else
      ensure(title_h + row_height(t.headers, hf) +
             (t.rows.empty() ? 0 : row_height(t.rows.front(), cf)));
    if (!title.empty()) heading_inline(title);
    header();
    for (const auto& r : t.rows) {
      const double h = row_height(r, cf);
      if (y_ + h > bottom_) {
        new_page();
        text(QRectF(left_, y_, text_width(), mm(4)), "(continued)", font(7), Qt::AlignLeft, kLabel);
        y_ += mm(4);
        header();
      }
      draw_row(r, cf, h);
      y_ += h;
      line(left_, y_, table_right, y_, 0.15, kRule);
    }
    y_ += mm(2);
  }

  // Plots side by side in one row, each with its caption below.
  void plots(const std::vector<PlotKind>& kinds, double height_mm) {
    const double gap = mm(6);
    const double w = (text_width() - gap * static_cast<double>(kinds.size() - 1)) /
                     static_cast<double>(kinds.size());
    const QFont cap = font(7);
    double cap_h = 0;
    for (PlotKind k : kinds) cap_h = std::max(cap_h, measure(qs(plot_caption(k, c_)), cap, w));
    ensure(mm(height_mm) + cap_h + mm(2));
    for (std::size_t i = 0; i < kinds.size(); ++i) {
      const double x = left_ + static_cast<double>(i) * (w + gap);
      if (p_) draw_plot(*p_, QRectF(x, y_, w, mm(height_mm)), kDpi, kinds[i], c_);
      text(QRectF(x, y_ + mm(height_mm) + mm(0.5), w, cap_h), qs(plot_caption(kinds[i], c_)), cap,
           Qt::TextWordWrap, kLabel);
    }
    y_ += mm(height_mm) + cap_h + mm(3);
  }

  void cautions() {
    const QFont f = font(7.5);
    const double pad = mm(2.5);
    const double tw = text_width() - 2 * pad;
    double h = measure("Cautions", font(8.5, true), tw) + mm(1);
    for (const std::string& s : c_.cautions) h += measure(qs(s), f, tw) + mm(1);
    h += 2 * pad;
    ensure(h);
    if (p_) {
      p_->setPen(QPen(Qt::black, mm(0.3)));
      p_->setBrush(Qt::NoBrush);
      p_->drawRect(QRectF(left_, y_, text_width(), h));
    }
    double ty = y_ + pad;
    const double th = measure("Cautions", font(8.5, true), tw);
    text(QRectF(left_ + pad, ty, tw, th), "Cautions", font(8.5, true));
    ty += th + mm(1);
    for (const std::string& s : c_.cautions) {
      const double sh = measure(qs(s), f, tw);
      text(QRectF(left_ + pad, ty, tw, sh), qs(s), f);
      ty += sh + mm(1);
    }
    y_ += h + mm(3);
  }

  // Lines to sign on, kept together on one page.
  void signatures() {
    const QFont label = font(7);
    const QFont f = font(9);
    const double row = mm(14);
    const double h = mm(8) + 4 * row;
    ensure(h);
    heading_inline("Inspector's decision");
    const double col = (text_width() - mm(10)) / 3;
    const std::vector<std::string> first = {"Inspected by (name)", "Signature", "Date"};
    for (std::size_t i = 0; i < first.size(); ++i) {
      const double x = left_ + static_cast<double>(i) * (col + mm(5));
      line(x, y_ + row - mm(4), x + col, y_ + row - mm(4), 0.25, Qt::black);
      text(QRectF(x, y_ + row - mm(3.6), col, mm(4)), qs(first[i]), label, Qt::AlignLeft, kLabel);
    }
    y_ += row + mm(3);
    // Decision boxes
    double x = left_;
    const double box = mm(3.8);
    text(QRectF(x, y_, mm(20), box), "Decision:", f, Qt::AlignLeft | Qt::AlignVCenter);
    x += mm(22);
    for (const char* choice : {"accept", "reject", "other:"}) {
      if (p_) {
        p_->setPen(QPen(Qt::black, mm(0.3)));
        p_->setBrush(Qt::NoBrush);
        p_->drawRect(QRectF(x, y_, box, box));
      }
      text(QRectF(x + box + mm(1.5), y_, mm(25), box), choice, f, Qt::AlignLeft | Qt::AlignVCenter);
      x += mm(30);
    }
    line(x - mm(12), y_ + box, right_, y_ + box, 0.25, Qt::black);
    y_ += box + mm(2);
    for (int k = 0; k < 2; ++k) {
      y_ += row * 0.75;
      line(left_, y_, right_, y_, 0.25, Qt::black);
    }
    text(QRectF(left_, y_ + mm(0.4), text_width(), mm(4)),
         "Remarks (deviation, concession, "
         "disposal of rejected parts)",
         label, Qt::AlignLeft, kLabel);
    y_ += mm(5);
  }

 private:
  double heading_height() const { return measure("Xg", font(11, true), text_width()) + mm(4.6); }

  void heading_inline(const std::string& s) {
    const QFont f = font(11, true);
    const double h = measure(qs(s), f, text_width());
    y_ += mm(2);
    text(QRectF(left_, y_, text_width(), h), qs(s), f, Qt::AlignLeft);
    y_ += h + mm(0.8);
    line(left_, y_, right_, y_, 0.25, kRule);
    y_ += mm(1.8);
  }

  void footer() {
    const QFont f = font(7);
    const double fy = height_ - mm(13);
    line(left_, fy, right_, fy, 0.2, kRule);
    text(QRectF(left_, fy + mm(1), text_width() * 0.75, mm(5)), qs(c_.footer), f, Qt::AlignLeft,
         kLabel);
    text(QRectF(left_, fy + mm(1), text_width(), mm(5)),
         qs(fmt::format("page {} of {}", page_, total_ > 0 ? total_ : page_)), f, Qt::AlignRight);
  }

  QPdfWriter& writer_;
  QPainter* p_;
  const Content& c_;
  int total_ = 0;
  int page_ = 1;
  double width_ = 0, height_ = 0, left_ = 0, right_ = 0, top_ = 0, bottom_ = 0, y_ = 0;
};

// Lays out the whole summary; returns the number of pages.
int lay_out(QPdfWriter& writer, QPainter* painter, const Content& c, int total_pages) {
  Flow f(writer, painter, c, total_pages);
  f.title();
  f.header_fields();
  f.disposition();
  f.heading("Purchase spec");
  if (c.spec.empty())
    f.paragraph("No purchase spec was given: the lot is described, not judged.", font(8.5));
  else
    f.key_values(c.spec);
  f.heading("Test conditions and measurement");
  f.key_values(c.conditions);
  f.heading("Curve model, temperature and meters");
  f.key_values(c.models);
  if (c.statistics.rows.empty())
    f.heading("Lot statistics");
  else
    f.table(c.statistics, "Lot statistics");
  f.paragraph(c.statistics_note, font(7.5), kLabel);

  f.heading("Curves and spread", 95);
  f.plots({PlotKind::curves}, 82);
  f.plots({PlotKind::r10_histogram, PlotKind::gamma_histogram}, 56);
  f.plots({PlotKind::r10_gamma}, 80);

  f.heading("Nonconforming units");
  f.paragraph(c.nonconforming_note, font(8.5));
  if (!c.nonconforming.rows.empty()) f.table(c.nonconforming);

  if (c.pairs) {
    f.heading("Matched pairs");
    f.key_values(c.pairs_summary, 40);
    if (!c.pairs->rows.empty()) {
      f.plots({PlotKind::pair_errors}, 50);
      f.table(c.pairs_table);
    }
  }

  f.heading("Fitting method");
  f.key_values(c.method);
  f.cautions();
  f.signatures();
  f.finish();
  return f.page();
}

// QCustomPlot is a widget: make an offscreen QApplication for the call when there is none.
class AppGuard {
 public:
  std::string ensure() {
    if (QCoreApplication::instance() == nullptr) {
      static int argc = 3;
      static char arg0[] = "photolot-report";
      static char arg1[] = "-platform";
      static char arg2[] = "offscreen";
      static char* argv[] = {arg0, arg1, arg2, nullptr};
      own_ = std::make_unique<QApplication>(argc, argv);
      return {};
    }
    if (qobject_cast<QApplication*>(QCoreApplication::instance()) == nullptr)
      return "the PDF summary needs a QApplication (the plots are widgets); this process has a "
             "QCoreApplication or QGuiApplication";
    return {};
  }

 private:
  std::unique_ptr<QApplication> own_;
};

}  // namespace

std::string write_lot_summary_pdf(const SummaryInput& input, const std::string& path) {
  if (std::string e = input.validate(); !e.empty()) return e;
  AppGuard app;
  if (std::string e = app.ensure(); !e.empty()) return e;
  Content content = build_content(input);

  QSaveFile file(qs(path));
  if (!file.open(QIODevice::WriteOnly))
    return fmt::format("cannot write the summary to {}: {}", path,
                       file.errorString().toStdString());
  int pages = 0;
  {
    QPdfWriter writer(&file);
    writer.setPageSize(
        QPageSize(input.page_size == PageSize::letter ? QPageSize::Letter : QPageSize::A4));
    writer.setPageMargins(QMarginsF(0, 0, 0, 0), QPageLayout::Millimeter);
    writer.setResolution(kDpi);
    writer.setTitle(qs(content.footer));
    writer.setCreator(
        qs(fmt::format("photolot {}", input.software_version.empty() ? PHOTOLOT_VERSION
                                                                     : input.software_version)));
    pages = lay_out(writer, nullptr, content, 0);
    QPainter painter;
    if (!painter.begin(&writer)) {
      file.cancelWriting();
      return fmt::format("cannot write the summary to {}: the PDF could not be started", path);
    }
    lay_out(writer, &painter, content, pages);
    painter.end();
  }
  if (!file.commit())
    return fmt::format("cannot write the summary to {}: {}", path,
                       file.errorString().toStdString());
  return {};
}

}  // namespace photolot::report
