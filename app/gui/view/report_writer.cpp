#include "view/report_writer.h"

#include <QDateTime>
#include <QFileInfo>
#include <QPageLayout>
#include <QPageSize>
#include <QPainter>
#include <QPdfWriter>
#include <QTextOption>
#include <functional>

#include "core/allowance_table.h"
#include "core/molar_tables.h"
#include "core/scenario_table.h"
#include "core/units.h"
#include "core/verdict.h"
#include "view/allowance_view.h"
#include "view/case_panel.h"
#include "view/findings_panel.h"
#include "view/molar_root_maps.h"
#include "view/root_map_view.h"
#include "view/trend_plot.h"

namespace sharpey::app {

namespace {

// Paints a widget drawing (`draw` into a rectangle) across the body's width from height `top`,
// `height` high: drawn at a screen-like logical width of 1100 and scaled down, so its fonts keep
// their proportion to the drawing.
void paint_scaled(QPainter& painter, const QFont& font, const QRect& body, int top, int height,
                  const std::function<void(QPainter&, const QRect&)>& draw) {
  const QSize logical(1100, 1100 * height / std::max(1, body.width()));
  const double scale = static_cast<double>(body.width()) / logical.width();
  painter.save();
  painter.translate(body.left(), top);
  painter.scale(scale, scale);
  QFont small = font;
  small.setPointSizeF(font.pointSizeF() * 0.9 / scale);
  painter.setFont(small);
  draw(painter, QRect(QPoint(0, 0), logical));
  painter.restore();
  painter.setFont(font);
}

// Page geometry in device units of the writer (300 dpi).
struct Page {
  QPainter* p;
  QRect body;
  int y;
  int line;  // height of a body text line

  void heading(const QString& text, double scale = 1.5) {
    QFont f = p->font();
    const QFont saved = f;
    f.setBold(true);
    f.setPointSizeF(saved.pointSizeF() * scale);
    p->setFont(f);
    const QRect r(body.left(), y, body.width(), static_cast<int>(line * scale * 1.4));
    p->drawText(r, Qt::AlignLeft | Qt::AlignVCenter, text);
    y = r.bottom() + line / 3;
    p->setFont(saved);
  }
  // Wrapped paragraph; returns its height.
  int paragraph(const QString& text, const QColor& colour = Qt::black, bool bold = false) {
    const QFont saved = p->font();
    QFont f = saved;
    f.setBold(bold);
    p->setFont(f);
    p->setPen(colour);
    const QRect bound = p->boundingRect(QRect(body.left(), y, body.width(), 100000),
                                        Qt::TextWordWrap | Qt::AlignLeft, text);
    p->drawText(QRect(body.left(), y, body.width(), bound.height()),
                Qt::TextWordWrap | Qt::AlignLeft, text);
    y += bound.height() + line / 3;
    p->setPen(Qt::black);
    p->setFont(saved);
    return bound.height();
  }
  void rows(const std::vector<std::pair<QString, QString>>& items, int label_width) {
    for (const auto& [name, value] : items) {
      p->setPen(QColor(70, 70, 70));
      p->drawText(QRect(body.left(), y, label_width, line), Qt::AlignLeft | Qt::AlignVCenter, name);
      p->setPen(Qt::black);
      const QRect bound =
          p->boundingRect(QRect(body.left() + label_width, y, body.width() - label_width, 100000),
                          Qt::TextWordWrap, value);
      p->drawText(QRect(body.left() + label_width, y, body.width() - label_width,
                        std::max(line, bound.height())),
                  Qt::TextWordWrap | Qt::AlignLeft | Qt::AlignVCenter, value);
      y += std::max(line, bound.height()) + line / 5;
    }
    y += line / 3;
  }
  void image(const QImage& img, int max_height) {
    if (img.isNull()) return;
    const QSize fitted = img.size().scaled(body.width(), max_height, Qt::KeepAspectRatio);
    const QRect target(body.left() + (body.width() - fitted.width()) / 2, y, fitted.width(),
                       fitted.height());
    p->drawImage(target, img);
    y = target.bottom() + line / 2;
  }
};

// The footer's font and height: the caution (wrapped to the page width) above the page number line.
QFont footer_font(const QFont& body) {
  QFont f = body;
  f.setPointSizeF(body.pointSizeF() * 0.8);
  return f;
}

int footer_height(QPainter& p, const QRect& page) {
  const QFont saved = p.font();
  p.setFont(footer_font(saved));
  const int h = p.fontMetrics().height();
  const QRect caution =
      p.boundingRect(QRect(page.left(), 0, page.width(), 100000), Qt::TextWordWrap | Qt::AlignLeft,
                     QString::fromStdString(analysis::caution_text()));
  p.setFont(saved);
  return caution.height() + 2 * h;  // a third of a line above, the caution, the page number line
}

void footer(QPainter& p, const QRect& page, int number, int total_pages, const QString& case_file) {
  const QFont saved = p.font();
  const int total = footer_height(p, page);
  p.setFont(footer_font(saved));
  const int h = p.fontMetrics().height();
  const QRect box(page.left(), page.bottom() - total, page.width(), total);
  p.setPen(QColor(90, 90, 90));
  p.drawLine(box.topLeft(), box.topRight());
  // The caution whole, then the page number on its own line under it.
  p.drawText(QRect(page.left(), box.top() + h / 3, page.width(), total - h - h / 3),
             Qt::TextWordWrap | Qt::AlignLeft, QString::fromStdString(analysis::caution_text()));
  p.drawText(QRect(page.left(), page.bottom() - h, page.width(), h), Qt::AlignRight,
             QStringLiteral("Sharpey report, %1, page %2 of %3")
                 .arg(case_file)
                 .arg(number)
                 .arg(total_pages));
  p.setFont(saved);
  p.setPen(Qt::black);
}

QString describe_case(const analysis::CaseSpec& s) {
  const auto& m = s.model;
  // A scanned tooth is named by its file and checksum only (no surface data in the report).
  const QString scan = m.tooth.scan ? QStringLiteral("Scanned surface %1 (SHA-256 %2); ")
                                          .arg(QString::fromStdString(s.surface.file),
                                               QString::fromStdString(m.tooth.scan->source_sha256))
                                    : QString();
  return scan + QStringLiteral(
                    "%1; crown %2, root %3 (taper fullness %11); PDL width %4 / %5 / %6 mm "
                    "(crest / mid-root / apex), E %7 MPa, \u03bd %8; healthy crest %9 below the "
                    "CEJ; mesh preset %10.")
                    .arg(tooth_name(static_cast<int>(m.tooth.type)))
                    .arg(with_unit(m.tooth.dimensions.crown_length_mm, QStringLiteral("mm"), 1))
                    .arg(with_unit(m.tooth.dimensions.root_length_mm, QStringLiteral("mm"), 1))
                    .arg(m.pdl.crest_width_mm, 0, 'f', 2)
                    .arg(m.pdl.mid_width_mm, 0, 'f', 2)
                    .arg(m.pdl.apex_width_mm, 0, 'f', 2)
                    .arg(s.pdl_material.young_modulus_mpa, 0, 'f', 2)
                    .arg(s.pdl_material.poisson_ratio, 0, 'f', 2)
                    .arg(with_unit(m.bone.crest_below_cej_mm, QStringLiteral("mm"), 1))
                    .arg(QString::fromStdString(mesh::to_string(m.sizing.preset)))
                    .arg(m.tooth.dimensions.root_taper_fullness, 0, 'f', 2);
}

bool has_allowances(const ReportInputs& in) {
  return in.allowances && in.results && !in.results->empty() &&
         in.allowances->size() == in.results->size();
}

// What every page of the report shares: the writer, the painter, the body font and area, and
// the page count so far.
struct Sheet {
  QPdfWriter* writer;
  QPainter* painter;
  QFont font;
  QRect page;  // the whole printable area
  QRect body;  // above the footer
  int line;    // height of a body text line
  int pages = 0;
  int total_pages;
  QString case_file;

  // Starts page `pages + 1` (a new sheet of paper from the second on).
  Page begin() {
    if (pages > 0) writer->newPage();
    return Page{painter, body, body.top(), line};
  }
  void finish() { footer(*painter, page, ++pages, total_pages, case_file); }
};

// The caution in a tinted box across the body, at the page's current height.
void paint_caution_box(Page& pg) {
  QPainter& painter = *pg.p;
  const QRect& body = pg.body;
  const int line = pg.line;
  const QString caution = QString::fromStdString(analysis::caution_text());
  const QRect bound = painter.boundingRect(
      QRect(body.left() + line, pg.y + line / 2, body.width() - 2 * line, 100000), Qt::TextWordWrap,
      caution);
  const QRect box(body.left(), pg.y, body.width(), bound.height() + line);
  painter.fillRect(box, QColor(246, 231, 193));
  painter.setPen(QPen(QColor(156, 110, 20), 4));
  painter.drawLine(box.topLeft(), box.bottomLeft());
  painter.setPen(QColor(70, 50, 0));
  painter.drawText(
      QRect(body.left() + line, pg.y + line / 2, body.width() - 2 * line, bound.height()),
      Qt::TextWordWrap, caution);
  painter.setPen(Qt::black);
  pg.y = box.bottom() + line;
}

// The two thresholds with their values and sources.
void paint_thresholds(Page& pg, const analysis::Thresholds& t, int label_width) {
  pg.rows({{QStringLiteral("capillary pressure"),
            with_unit(t.capillary.value_kpa, QStringLiteral("kPa"), 1) +
                QStringLiteral(". Source: ") + QString::fromStdString(t.capillary.source)},
           {QStringLiteral("physiological limit"),
            with_unit(t.limit.value_kpa, QStringLiteral("kPa"), 1) + QStringLiteral(". Source: ") +
                QString::fromStdString(t.limit.source)}},
          label_width);
}

// The first page's top: the title, the case label, the file and date, the caution box.
void paint_title(Page& pg, const QString& title, const std::string& label,
                 const QString& case_file) {
  pg.heading(title, 2.0);
  pg.paragraph(QString::fromStdString(label), Qt::black, true);
  pg.paragraph(QStringLiteral("Case file: %1. Written %2.")
                   .arg(case_file,
                        QDateTime::currentDateTime().toString(QStringLiteral("yyyy-MM-dd HH:mm"))));
  paint_caution_box(pg);
}

// The verdict's headline on its coloured band, then its words.
void paint_verdict(Page& pg, const QFont& font, const Verdict& v) {
  QPainter& painter = *pg.p;
  const QRect badge(pg.body.left(), pg.y, pg.body.width(), static_cast<int>(pg.line * 1.6));
  painter.fillRect(badge, verdict_background(v.level));
  painter.setPen(Qt::white);
  QFont bold = font;
  bold.setBold(true);
  painter.setFont(bold);
  painter.drawText(badge.adjusted(pg.line / 2, 0, 0, 0), Qt::AlignLeft | Qt::AlignVCenter,
                   v.headline);
  painter.setFont(font);
  painter.setPen(Qt::black);
  pg.y = badge.bottom() + pg.line / 2;
  pg.paragraph(v.detail);
}

// A table: a bold header line, then rows on alternate tints; column c spans xs[c] to xs[c + 1],
// the first column left-aligned, the others right-aligned.
void paint_table(Page& pg, const QFont& font, const std::vector<int>& xs, const QStringList& header,
                 const std::vector<QStringList>& rows, int header_lines = 1) {
  QPainter& painter = *pg.p;
  const int line = pg.line;
  const auto alignment = [](int c) {
    return (c == 0 ? Qt::AlignLeft : Qt::AlignRight) | Qt::AlignVCenter;
  };
  QFont bold = font;
  bold.setBold(true);
  painter.setFont(bold);
  // A header of several lines wraps its titles, each ending on the bottom line.
  for (int c = 0; c < header.size(); ++c) {
    if (header_lines == 1) {
      painter.drawText(QRect(xs[c], pg.y, xs[c + 1] - xs[c], line), alignment(c), header[c]);
    } else {
      const int inset = c == 0 ? 0 : line / 4;
      painter.drawText(
          QRect(xs[c] + inset, pg.y, xs[c + 1] - xs[c] - inset, header_lines * line),
          (c == 0 ? Qt::AlignLeft : Qt::AlignRight) | Qt::AlignBottom | Qt::TextWordWrap,
          header[c]);
    }
  }
  painter.setFont(font);
  pg.y += header_lines * line + line / 4;
  for (size_t row = 0; row < rows.size(); ++row) {
    if (row % 2 == 0)
      painter.fillRect(QRect(pg.body.left(), pg.y, pg.body.width(), line), QColor(240, 238, 232));
    for (int c = 0; c < rows[row].size(); ++c)
      painter.drawText(QRect(xs[c], pg.y, xs[c + 1] - xs[c], line), alignment(c), rows[row][c]);
    pg.y += line;
  }
}

// Page 1: case, force system, thresholds, the verdict and key numbers of the level on display.
void paint_summary_page(Sheet& sheet, const ReportInputs& in, const analysis::ScenarioResult& r) {
  const analysis::CaseSpec& spec = *in.spec;
  Page pg = sheet.begin();
  paint_title(pg, QStringLiteral("Sharpey report"), spec.label, in.case_file);
  if (in.stale) {
    pg.paragraph(
        QStringLiteral("Note: the case geometry was edited after the last solve; the results "
                       "below belong to the geometry that was solved."),
        QColor(120, 60, 0), true);
  }
  pg.heading(QStringLiteral("Model"));
  pg.paragraph(describe_case(spec));
  pg.heading(QStringLiteral("Force system"));
  pg.paragraph(describe(in.load) + '.');
  pg.paragraph(describe_resolved(r, in.load.unit).replace(QLatin1Char('\n'), QLatin1Char(' ')));
  pg.heading(QStringLiteral("Thresholds and their sources"));
  paint_thresholds(pg, spec.thresholds, sheet.body.width() / 4);
  pg.heading(QStringLiteral("Reading for %1").arg(QString::fromStdString(r.name)));
  paint_verdict(pg, sheet.font, judge(r, spec.thresholds));
  if (r.beyond_linear_range) {
    pg.paragraph(QString::fromStdString(analysis::beyond_linear_range_text(r)), QColor(120, 60, 0),
                 true);
  }
  pg.rows(key_number_rows(r), sheet.body.width() / 3);
  sheet.finish();
}

// Page 2: the level on display, its 3D view and root map.
void paint_level_page(Sheet& sheet, const ReportInputs& in, const analysis::ScenarioResult& r) {
  const QRect& body = sheet.body;
  const int line = sheet.line;
  Page pg = sheet.begin();
  pg.heading(QStringLiteral("%1: ligament pressure").arg(QString::fromStdString(r.name)));
  pg.paragraph(QStringLiteral(
      "3D view: hydrostatic pressure in the PDL (compression positive), threshold "
      "iso-lines, force arrow at the bracket, centre of resistance (CRes) and centre "
      "of rotation (CRot)."));
  pg.image(in.view_3d, body.height() / 2 - 4 * line);
  pg.paragraph(QStringLiteral(
      "Root map: the root surface unrolled, angle around the root against depth below "
      "the CEJ."));
  RootMapView map;
  // The range shown (core/quantity.h) for pressure is the key numbers' span: peak tension to
  // peak compression outside the crest edge band.
  const ValueRange shown{-r.pressure_max_tension_kpa, r.pressure_max_compression_kpa};
  map.set_map(r.root_map, in.spec->thresholds,
              QStringLiteral("Root map, %1").arg(QString::fromStdString(r.name)), &shown);
  const int map_height = std::min(body.bottom() - pg.y, body.width() * 3 / 5);
  paint_scaled(*sheet.painter, sheet.font, body, pg.y, map_height,
               [&map](QPainter& p, const QRect& area) { map.paint_into(p, area); });
  sheet.finish();
}

// Page 3: every bone level side by side, their key numbers, a reading for each and the trends.
void paint_comparison_page(Sheet& sheet, const ReportInputs& in) {
  const auto& results = *in.results;
  const QRect& body = sheet.body;
  const int line = sheet.line;
  Page pg = sheet.begin();
  pg.heading(QStringLiteral("Bone levels compared"));
  pg.paragraph(
      QStringLiteral("Same force system at every bone level; one colour scale for all views."));
  pg.image(in.comparison, body.height() / 3);
  const ScenarioTable table = make_table(results);
  // One column per bone level after the quantity's name.
  const int label_w = body.width() * 2 / 5;
  const int n_levels = static_cast<int>(table.row_names.size());
  const int col_w = (body.width() - label_w) / std::max(1, n_levels);
  std::vector<int> xs = {body.left(), body.left() + label_w};
  for (int s = 0; s < n_levels; ++s) xs.push_back(xs.back() + col_w);
  QStringList header = {QString()};
  header += table.row_names;
  std::vector<QStringList> rows;
  for (int c = 0; c < static_cast<int>(table.columns.size()); ++c) {
    QStringList row = {table.header_text(c)};
    for (int s = 0; s < n_levels; ++s) row << table.cell_text(s, c);
    rows.push_back(row);
  }
  paint_table(pg, sheet.font, xs, header, rows);
  pg.y += line;
  // A reading for every bone level, not only the one on display.
  pg.heading(QStringLiteral("Reading per bone level"));
  for (const analysis::ScenarioResult& level : results)
    pg.paragraph(QString::fromStdString(level.name) + QStringLiteral(": ") +
                 judge(level, in.spec->thresholds).detail +
                 (level.beyond_linear_range
                      ? QStringLiteral(" ") +
                            QString::fromStdString(analysis::beyond_linear_range_text(level))
                      : QString()));
  TrendPlot plot;
  plot.set_table(table);
  const int plot_height = body.bottom() - pg.y;
  if (plot_height > 10 * line)
    paint_scaled(*sheet.painter, sheet.font, body, pg.y, plot_height,
                 [&plot](QPainter& p, const QRect& area) { plot.paint_into(p, area); });
  sheet.finish();
}

// The opening words of the allowance pages: what an allowance is, the band, the practice ranges
// and the caution.
void paint_allowance_intro(Page& pg, const ReportInputs& in, const AllowanceCriterion& criterion,
                           bool band) {
  const analysis::ForceUnit unit = in.load.unit;
  pg.heading(QStringLiteral("Force allowance"));
  pg.paragraph(
      QStringLiteral("The largest force at the bracket, with the couple each movement needs, "
                     "that keeps the ") +
      describe(criterion, in.spec->thresholds) +
      QStringLiteral(", in %1; the evaluation is linear in the force (one evaluation per "
                     "movement). ")
          .arg(force_unit_label(unit)) +
      (band ? QStringLiteral("Conservative allowance: the 10th percentile of the allowances "
                             "over %1 sampled variations of the tissue properties and the "
                             "measured geometry (nine in ten allow more); it describes the "
                             "spread, not a probability for a given patient. Figures at "
                             "the right of the charts: the conservative allowances. ")
                  .arg(in.allowance_band->options.n_samples)
            : QStringLiteral("The variability band was not computed: nominal allowances "
                             "for the case's own tissue properties and geometry, no "
                             "conservative allowance; figures at the right of the charts: "
                             "the nominal allowances. ")) +
      QStringLiteral("Common-practice ranges are a fact of the trade with no single source: "
                     "a plausibility bound, never a prescription. Present force: %1.")
          .arg(describe(in.load)));
  pg.paragraph(QString::fromStdString(analysis::caution_text()), QColor(90, 60, 0), true);
}

// One bone level's allowance table and chart, `room` high from the page's current height.
void paint_allowance_level(Sheet& sheet, Page& pg, const ReportInputs& in,
                           const AllowanceLevel& level, double axis_max, bool band, int room) {
  const QRect& body = sheet.body;
  const int line = sheet.line;
  const analysis::ForceUnit unit = in.load.unit;
  const int start = pg.y;
  pg.heading(QStringLiteral("%1 (bone loss %2)")
                 .arg(level.name, with_unit(level.bone_loss_mm, QStringLiteral("mm"), 1)),
             1.15);
  const AllowanceTable table = allowance_table(level, unit);
  // Column widths: the movement and the practice range wider than the forces.
  const std::vector<int> weights = {27, 12, 15, 12, 12, 22};
  std::vector<int> xs(1, body.left());
  for (int w : weights) xs.push_back(xs.back() + body.width() * w / 100);
  paint_table(pg, sheet.font, xs, table.header, table.cells);
  pg.y += line / 2;
  const int chart_height = start + room - pg.y - line;
  if (chart_height > 6 * line)
    paint_scaled(
        *sheet.painter, sheet.font, body, pg.y, chart_height, [&](QPainter& p, const QRect& area) {
          AllowanceChartStyle style;
          style.title = false;  // the table's heading names the level
          style.background = Qt::white;
          paint_allowance_chart(p, area.adjusted(0, 0, 0, -p.fontMetrics().height()), level,
                                axis_max, in.load.magnitude, in.load.preset, unit, style);
          paint_allowance_legend(p,
                                 QRect(area.left(), area.bottom() - p.fontMetrics().height(),
                                       area.width(), p.fontMetrics().height()),
                                 band);
        });
  pg.y = start + room;
}

// The allowance pages: table and chart of every bone level, kAllowanceLevelsPerPage to a page.
void paint_allowance_pages(Sheet& sheet, const ReportInputs& in) {
  AllowanceCriterion criterion;  // peak compression against the upper limit, as summary.txt
  const std::vector<AllowanceLevel> levels =
      allowance_levels(*in.allowances, in.allowance_band, criterion, in.load.unit);
  const bool band = !levels.empty() && levels.front().rows.front().has_band();
  const double axis_max = allowance_axis_max(levels, in.load.magnitude);
  for (size_t first = 0; first < levels.size(); first += kAllowanceLevelsPerPage) {
    Page pg = sheet.begin();
    if (first == 0)
      paint_allowance_intro(pg, in, criterion, band);
    else
      pg.heading(QStringLiteral("Force allowance (continued)"));
    const size_t last = std::min(levels.size(), first + kAllowanceLevelsPerPage);
    const int room = (sheet.body.bottom() - pg.y) / static_cast<int>(last - first);
    for (size_t k = first; k < last; ++k)
      paint_allowance_level(sheet, pg, in, levels[k], axis_max, band, room);
    sheet.finish();
  }
}

// Opens `path` as an A4 PDF at 300 dpi, lets `paint` fill its pages and returns their number
// (0 and `error` when the file cannot be written).
int write_pdf(const QString& path, const QString& title, int total_pages, const QString& case_file,
              QString* error, const std::function<void(Sheet&)>& paint) {
  QPdfWriter writer(path);
  writer.setPageSize(QPageSize(QPageSize::A4));
  writer.setPageMargins(QMarginsF(16, 14, 16, 14), QPageLayout::Millimeter);
  writer.setResolution(300);
  writer.setTitle(title);
  writer.setCreator(QStringLiteral("Sharpey"));
  QPainter painter;
  if (!painter.begin(&writer)) {
    if (error)
      *error =
          QStringLiteral("cannot write %1 (no permission, or the folder does not exist)").arg(path);
    return 0;
  }
  QFont font(QStringLiteral("DejaVu Sans"));
  font.setPointSizeF(9.5);
  painter.setFont(font);
  const QRect page = painter.viewport();
  const int line = painter.fontMetrics().height();
  // The body ends half a line above the footer, whatever the caution's length.
  const QRect body(page.left(), page.top(), page.width(),
                   page.height() - footer_height(painter, page) - line / 2);
  Sheet sheet{&writer, &painter, font, page, body, line, 0, total_pages, case_file};
  paint(sheet);
  painter.end();
  return sheet.pages;
}

// ---- the multi-rooted report ----

// A MolarTable as a report table: the row names in a first column a third of the body wide.
void paint_molar_table(Page& pg, const QFont& font, const QString& corner, const MolarTable& t,
                       double name_share = 0.3, int header_lines = 2) {
  if (t.rows.empty()) return;
  const QRect& body = pg.body;
  std::vector<int> xs = {body.left(), body.left() + static_cast<int>(body.width() * name_share)};
  const int n = static_cast<int>(t.columns.size());
  for (int c = 1; c <= n; ++c) xs.push_back(xs[1] + (body.right() - xs[1]) * c / n);
  QStringList header = {corner};
  header << t.columns;
  std::vector<QStringList> rows;
  for (size_t r = 0; r < t.rows.size(); ++r) {
    QStringList cells = {t.rows[r].name};
    for (size_t c = 0; c < t.rows[r].values.size(); ++c)
      cells << molar_cell_text(t.rows[r].values[c], t.decimals_at(r, c));
    rows.push_back(cells);
  }
  QFont small = font;
  small.setPointSizeF(font.pointSizeF() * 0.85);
  pg.p->setFont(small);
  paint_table(pg, small, xs, header, rows, header_lines);
  pg.p->setFont(font);
  pg.y += pg.line / 2;
}

// Page 1: the case, the method, the thresholds, and the scenarios side by side.
void paint_molar_summary_page(Sheet& sheet, const MolarReportInputs& in) {
  const analysis::MultiRootCase& spec = *in.spec;
  Page pg = sheet.begin();
  paint_title(pg, QStringLiteral("Sharpey report: multi-rooted tooth"), spec.label, in.case_file);
  pg.heading(QStringLiteral("Case and method"));
  pg.paragraph(describe_molar_case(spec) + QStringLiteral(". PDL E %1 MPa, \u03bd %2.")
                                               .arg(spec.pdl.young_modulus_mpa, 0, 'f', 2)
                                               .arg(spec.pdl.poisson_ratio, 0, 'f', 2));
  pg.paragraph(molar_method_label() + QStringLiteral(" (docs/molars.md)."), QColor(120, 60, 0),
               true);
  if (spec.finite_elements)
    pg.paragraph(QStringLiteral(
        "The tables marked \"finite elements\" come from a finite-element model of the same "
        "tooth (faceted multi-rooted mesh, coarse sizes)."));
  if (!spec.notes.empty()) pg.paragraph(QString::fromStdString(spec.notes));
  pg.heading(QStringLiteral("Thresholds and their sources"));
  paint_thresholds(pg, spec.thresholds, sheet.body.width() / 4);
  pg.heading(QStringLiteral("Scenarios (thin-layer estimate)"));
  MolarTable t;
  t.columns = {QStringLiteral("attached (mm²)"), QStringLiteral("peak compression (kPa)"),
               QStringLiteral("CRes (mesiodistal) below the CEJ (mm)"),
               QStringLiteral("CRes below the furcation (mm)"),
               QStringLiteral("%1 allowance to %2 kPa")
                   .arg(QString::fromStdString(analysis::to_string(spec.movement)))
                   .arg(spec.thresholds.limit.value_kpa)};
  t.decimals = {1, 1, 2, 2, force_decimals(in.unit)};
  for (const analysis::MultiRootScenarioResult& r : in.result->scenarios) {
    double allowance = 0;
    for (const MolarRow& row : molar_allowance_table(r, spec.thresholds, in.unit).rows)
      if (row.name == molar_movement_label(spec.movement, in.unit)) allowance = row.values[1];
    t.rows.push_back(
        {QString::fromStdString(r.name),
         {r.areas.attached_total_mm2, r.result.tooth.peak_compression_kpa,
          r.cres_mesiodistal.below_cej_mm, r.cres_mesiodistal.below_furcation_mm, allowance}});
  }
  paint_molar_table(pg, sheet.font, QStringLiteral("scenario"), t, 0.34, 4);
  pg.paragraph(QStringLiteral("Allowances in %1 (couples in %2); each scenario's page gives the "
                              "three molar movements to both thresholds.")
                   .arg(force_unit_label(in.unit), moment_unit_label(in.unit)));
  sheet.finish();
}

// One page per scenario: its 3D view, the per-root, CRes, allowance (and finite-element)
// tables and the root maps side by side.
void paint_molar_scenario_page(Sheet& sheet, const MolarReportInputs& in, size_t k) {
  const analysis::MultiRootScenarioResult& r = in.result->scenarios[k];
  const analysis::Thresholds& thresholds = in.spec->thresholds;
  const QRect& body = sheet.body;
  Page pg = sheet.begin();
  pg.heading(QStringLiteral("Scenario %1: %2").arg(k + 1).arg(QString::fromStdString(r.name)));
  pg.paragraph(QStringLiteral("Thin-layer estimate under %1.").arg(describe_molar_case(*in.spec)));
  if (k < in.views.size()) pg.image(in.views[k], body.height() / 4);
  paint_molar_table(pg, sheet.font, QStringLiteral("per root"),
                    molar_root_table(r, thresholds, in.unit));
  paint_molar_table(pg, sheet.font, QStringLiteral("centre of resistance"), molar_cres_table(r));
  paint_molar_table(pg, sheet.font, QStringLiteral("allowance"),
                    molar_allowance_table(r, thresholds, in.unit));
  if (r.has_finite_elements)
    paint_molar_table(pg, sheet.font, QStringLiteral("finite elements"), molar_fe_table(r));
  MolarRootMaps maps;
  maps.set_maps(
      molar_map_parts(in.result->tooth, r.root_map), thresholds,
      QStringLiteral("Root maps, %1 (thin-layer estimate)").arg(QString::fromStdString(r.name)));
  const int map_height = std::min(body.bottom() - pg.y, body.width() / 2);
  paint_scaled(*sheet.painter, sheet.font, body, pg.y, map_height,
               [&maps](QPainter& p, const QRect& area) { maps.paint_into(p, area); });
  sheet.finish();
}

}  // namespace

int report_page_count(const ReportInputs& in) {
  if (!has_allowances(in)) return kReportPages;
  const int n = static_cast<int>(in.allowances->size());
  return kReportPages + (n + kAllowanceLevelsPerPage - 1) / kAllowanceLevelsPerPage;
}

int write_report(const QString& path, const ReportInputs& in, QString* error) {
  if (!in.spec || !in.results || in.results->empty()) {
    if (error)
      *error = QStringLiteral("there are no results to report yet; open or solve a case first");
    return 0;
  }
  const auto& results = *in.results;
  const int current = std::clamp(in.current, 0, static_cast<int>(results.size()) - 1);
  const analysis::ScenarioResult& r = results[static_cast<size_t>(current)];
  // The force system as set, beside the case label (which may name an older one).
  const QString title = QStringLiteral("Sharpey report: %1 (%2)")
                            .arg(QString::fromStdString(in.spec->label), describe(in.load));
  return write_pdf(path, title, report_page_count(in), in.case_file, error, [&](Sheet& sheet) {
    paint_summary_page(sheet, in, r);
    paint_level_page(sheet, in, r);
    paint_comparison_page(sheet, in);
    if (has_allowances(in)) paint_allowance_pages(sheet, in);
  });
}

int molar_report_page_count(const MolarReportInputs& in) {
  return in.result ? 1 + static_cast<int>(in.result->scenarios.size()) : 0;
}

int write_molar_report(const QString& path, const MolarReportInputs& in, QString* error) {
  if (!in.spec || !in.result || in.result->scenarios.empty()) {
    if (error) *error = QStringLiteral("there is no multi-rooted case to report; open one first");
    return 0;
  }
  const QString title = QStringLiteral("Sharpey report, multi-rooted tooth: %1")
                            .arg(QString::fromStdString(in.spec->label));
  return write_pdf(path, title, molar_report_page_count(in), in.case_file, error,
                   [&](Sheet& sheet) {
                     paint_molar_summary_page(sheet, in);
                     for (size_t k = 0; k < in.result->scenarios.size(); ++k)
                       paint_molar_scenario_page(sheet, in, k);
                   });
}

}  // namespace sharpey::app
