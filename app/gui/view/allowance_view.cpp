#include "view/allowance_view.h"

#include <QComboBox>
#include <QHBoxLayout>
#include <QLabel>
#include <QPainter>
#include <QPainterPath>
#include <QProgressBar>
#include <QPushButton>
#include <QScrollArea>
#include <QVBoxLayout>
#include <algorithm>
#include <cmath>

#include "core/allowance_job.h"
#include "core/axis_ticks.h"
#include "core/case_session.h"
#include "core/units.h"

namespace sharpey::app {

namespace {

// Our own palette: slate ink, a muted teal bar for the band, warm sand for the practice strip,
// a plum line for the present force.
constexpr QColor kInk(38, 48, 60);
constexpr QColor kGrid(214, 218, 222);
constexpr QColor kBand(56, 128, 134);
constexpr QColor kBandMedian(236, 244, 242);
constexpr QColor kPractice(222, 200, 150);
constexpr QColor kPracticeEdge(168, 138, 76);
constexpr QColor kCurrent(142, 44, 104);
constexpr QColor kHighlight(240, 236, 246);
constexpr QColor kUnbounded(120, 128, 136);
constexpr QColor kChartBackground(250, 250, 248);

void draw_diamond(QPainter& p, QPointF centre, double r, const QColor& fill) {
  QPainterPath path;
  path.moveTo(centre + QPointF(0, -r));
  path.lineTo(centre + QPointF(r, 0));
  path.lineTo(centre + QPointF(0, r));
  path.lineTo(centre + QPointF(-r, 0));
  path.closeSubpath();
  p.fillPath(path, fill);
  p.setPen(QPen(Qt::white, std::max(1.0, r / 4)));
  p.drawPath(path);
}

}  // namespace

namespace {

// The chart's geometry: the row labels at the left, the values at the right, the force axis
// between them from 0 to `top`.
struct ChartFrame {
  QRect rect, plot;
  int line = 0, label_w = 0, value_w = 0;
  double top = 1.0;
  double x_of(double v) const { return plot.left() + plot.width() * std::clamp(v / top, 0.0, 1.0); }
};

ChartFrame chart_frame(const QFontMetrics& fm, const QRect& rect, const AllowanceLevel& level,
                       double axis_max) {
  ChartFrame f;
  f.rect = rect;
  f.line = fm.height();
  for (const AllowanceRow& r : level.rows)
    f.label_w = std::max(f.label_w, fm.horizontalAdvance(label(r.movement)));
  f.label_w += f.line / 2;
  f.value_w = fm.horizontalAdvance(QStringLiteral("unbounded")) + f.line / 2;
  f.plot = QRect(rect.left() + f.label_w, rect.top() + f.line + f.line / 2,
                 std::max(10, rect.width() - f.label_w - f.value_w),
                 std::max(10, rect.height() - 3 * f.line));
  f.top = axis_max > 0 ? axis_max * 1.06 : 1.0;
  return f;
}

void paint_chart_title(QPainter& p, const ChartFrame& f, const AllowanceLevel& level,
                       const AllowanceChartStyle& style) {
  if (!style.title) return;
  const QFont base = p.font();
  QFont bold = base;
  bold.setBold(true);
  p.setFont(bold);
  p.setPen(kInk);
  const QString title =
      QStringLiteral("%1%2 (bone loss %3)")
          .arg(style.highlight_level ? QStringLiteral("\u25b6 ") : QString(), level.name,
               with_unit(level.bone_loss_mm, QStringLiteral("mm"), 1));
  p.drawText(QRect(f.rect.left(), f.rect.top(), f.rect.width(), f.line),
             Qt::AlignLeft | Qt::AlignVCenter, title);
  p.setFont(base);
}

// Vertical grid lines with their tick labels, and the unit at the axis end.
void paint_chart_axis(QPainter& p, const ChartFrame& f, analysis::ForceUnit unit) {
  const std::vector<double> ticks = nice_ticks(0, f.top, 6);
  const double step = nice_step(0, f.top, 6);
  for (double t : ticks) {
    const double x = f.x_of(t);
    p.setPen(QPen(kGrid, 1));
    p.drawLine(QPointF(x, f.plot.top()), QPointF(x, f.plot.bottom()));
    p.setPen(kInk);
    p.drawText(QRectF(x - 40, f.plot.bottom() + 2, 80, f.line), Qt::AlignHCenter | Qt::AlignTop,
               tick_label(t, step));
  }
  p.drawText(QRect(f.plot.right() + 4, f.plot.bottom() + 2, f.value_w, f.line), Qt::AlignLeft,
             force_unit_label(unit));
}

// A movement that compression never limits: a grey arrow to the axis end, with its words on the
// row's own background.
void paint_unbounded_row(QPainter& p, const ChartFrame& f, double mid, double bar_h,
                         const QColor& background) {
  const QFontMetrics fm = p.fontMetrics();
  p.setPen(QPen(kUnbounded, std::max(1.0, bar_h / 5), Qt::SolidLine, Qt::RoundCap));
  p.drawLine(QPointF(f.plot.left(), mid), QPointF(f.plot.right() - bar_h / 2, mid));
  QPainterPath head;
  head.moveTo(f.plot.right(), mid);
  head.lineTo(f.plot.right() - bar_h, mid - bar_h / 2);
  head.lineTo(f.plot.right() - bar_h, mid + bar_h / 2);
  head.closeSubpath();
  p.fillPath(head, kUnbounded);
  const QString words = QStringLiteral("not limited by compression");
  const QRectF box(f.plot.left() + f.line, mid - f.line / 2.0,
                   fm.horizontalAdvance(words) + f.line / 2, f.line);
  p.fillRect(box, background);
  p.setPen(kInk);
  p.drawText(box, Qt::AlignCenter, words);
}

// The band (10th to 90th percentile, median marked) and the nominal allowance's diamond.
void paint_limited_row(QPainter& p, const ChartFrame& f, const AllowanceRow& r, double bar_y,
                       double bar_h) {
  if (r.has_band()) {
    const double a = f.x_of(r.band_p10);
    const double b = std::isfinite(r.band_p90) ? f.x_of(r.band_p90) : f.plot.right();
    p.fillRect(QRectF(a, bar_y, std::max(2.0, b - a), bar_h), kBand);
    if (std::isfinite(r.band_p50)) {
      p.setPen(QPen(kBandMedian, std::max(1.0, bar_h / 6)));
      p.drawLine(QPointF(f.x_of(r.band_p50), bar_y), QPointF(f.x_of(r.band_p50), bar_y + bar_h));
    }
  }
  if (std::isfinite(r.nominal))
    draw_diamond(p, QPointF(f.x_of(r.nominal), bar_y + bar_h / 2), bar_h * 0.55, kInk);
}

// One movement's row from height y0, row_h high: its name, the common-practice strip, the
// allowance (or the unbounded arrow) and the figure at the right.
void paint_allowance_row(QPainter& p, const ChartFrame& f, const AllowanceRow& r, double y0,
                         double row_h, bool highlighted, analysis::ForceUnit unit,
                         const AllowanceChartStyle& style) {
  if (highlighted) p.fillRect(QRectF(f.rect.left(), y0, f.rect.width(), row_h), kHighlight);
  p.setPen(kInk);
  p.drawText(QRectF(f.rect.left(), y0, f.label_w - f.line / 4, row_h),
             Qt::AlignRight | Qt::AlignVCenter, label(r.movement));
  // Common practice: a sand strip in the lower third of the row.
  const QRectF practice(f.x_of(r.practice_low), y0 + row_h * 0.68,
                        std::max(1.0, f.x_of(r.practice_high) - f.x_of(r.practice_low)),
                        row_h * 0.2);
  p.fillRect(practice, kPractice);
  p.setPen(QPen(kPracticeEdge, 1));
  p.drawRect(practice);
  const double bar_y = y0 + row_h * 0.22, bar_h = row_h * 0.36;
  QString value;
  if (!r.limited) {
    paint_unbounded_row(p, f, bar_y + bar_h / 2, bar_h,
                        highlighted ? kHighlight : style.background);
    value = QStringLiteral("unbounded");
  } else {
    paint_limited_row(p, f, r, bar_y, bar_h);
    value = allowance_text(r.has_band() ? r.band_p10 : r.nominal, unit);
  }
  p.setPen(kInk);
  p.drawText(QRectF(f.plot.right() + 4, y0, f.value_w, row_h), Qt::AlignLeft | Qt::AlignVCenter,
             value);
}

// The present force: a dashed line across the rows, its value above.
void paint_present_force(QPainter& p, const ChartFrame& f, double current,
                         analysis::ForceUnit unit) {
  if (!std::isfinite(current) || current < 0) return;
  const double x = f.x_of(current);
  p.setPen(QPen(kCurrent, std::max(1.5, f.line / 9.0), Qt::DashLine));
  p.drawLine(QPointF(x, f.plot.top() - f.line / 3), QPointF(x, f.plot.bottom()));
  p.setPen(kCurrent);
  const QString text = QStringLiteral("present ") + allowance_text(current, unit);
  const int w = p.fontMetrics().horizontalAdvance(text);
  const double tx = std::clamp(x - w / 2.0, static_cast<double>(f.plot.left()),
                               static_cast<double>(f.rect.right() - w));
  p.drawText(QRectF(tx, f.rect.top(), w + 2, f.line), Qt::AlignRight | Qt::AlignVCenter, text);
}

}  // namespace

void paint_allowance_chart(QPainter& p, const QRect& rect, const AllowanceLevel& level,
                           double axis_max, double current, analysis::MovementPreset highlighted,
                           analysis::ForceUnit unit, const AllowanceChartStyle& style) {
  p.save();
  p.setRenderHint(QPainter::Antialiasing, true);
  const ChartFrame f = chart_frame(p.fontMetrics(), rect, level, axis_max);
  paint_chart_title(p, f, level, style);
  paint_chart_axis(p, f, unit);
  const int n_rows = static_cast<int>(level.rows.size());
  const double row_h = static_cast<double>(f.plot.height()) / std::max(1, n_rows);
  for (int i = 0; i < n_rows; ++i) {
    const AllowanceRow& r = level.rows[static_cast<size_t>(i)];
    paint_allowance_row(p, f, r, f.plot.top() + i * row_h, row_h, r.movement == highlighted, unit,
                        style);
  }
  p.setPen(QPen(kInk, 1));
  p.drawLine(f.plot.bottomLeft(), f.plot.bottomRight());
  paint_present_force(p, f, current, unit);
  p.restore();
}

void paint_allowance_legend(QPainter& p, const QRect& rect, bool with_band) {
  p.save();
  p.setRenderHint(QPainter::Antialiasing, true);
  const QFontMetrics fm = p.fontMetrics();
  const int h = fm.height();
  int x = rect.left();
  const int y = rect.top();
  auto text = [&](const QString& t) {
    p.setPen(kInk);
    p.drawText(QRect(x, y, fm.horizontalAdvance(t) + 2, h), Qt::AlignLeft | Qt::AlignVCenter, t);
    x += fm.horizontalAdvance(t) + h;
  };
  if (with_band) {
    p.fillRect(QRect(x, y + h / 4, 2 * h, h / 2), kBand);
    x += 2 * h + h / 4;
    text(QStringLiteral("band: 10th to 90th percentile, median marked"));
  }
  draw_diamond(p, QPointF(x + h / 3.0, y + h / 2.0), h / 3.0, kInk);
  x += h;
  text(QStringLiteral("nominal"));
  p.fillRect(QRect(x, y + h / 3, 2 * h, h / 3), kPractice);
  x += 2 * h + h / 4;
  text(QStringLiteral("common practice"));
  p.setPen(QPen(kCurrent, 2, Qt::DashLine));
  p.drawLine(x, y + h / 2, x + 2 * h, y + h / 2);
  x += 2 * h + h / 4;
  text(QStringLiteral("present force"));
  p.restore();
}

// The charts of every level, two to a row.
class AllowanceCharts : public QWidget {
 public:
  explicit AllowanceCharts(QWidget* parent = nullptr) : QWidget(parent) { setMinimumHeight(260); }
  void set(const std::vector<AllowanceLevel>* levels, double current, int current_level,
           analysis::MovementPreset highlighted, analysis::ForceUnit unit, bool band) {
    levels_ = levels;
    current_ = current;
    current_level_ = current_level;
    highlighted_ = highlighted;
    unit_ = unit;
    band_ = band;
    update();
  }
  void paint_into(QPainter& p, const QRect& area) const {
    p.fillRect(area, kChartBackground);
    const int line = p.fontMetrics().height();
    if (!levels_ || levels_->empty()) {
      p.setPen(kInk);
      p.drawText(area, Qt::AlignCenter,
                 QStringLiteral("The allowances follow as soon as a bone level is solved."));
      return;
    }
    const int n = static_cast<int>(levels_->size());
    const int cols = n > 1 && area.width() > 700 ? 2 : 1;
    const int rows = (n + cols - 1) / cols;
    const QRect inner = area.adjusted(line / 2, line / 2, -line / 2, -2 * line);
    const int cw = inner.width() / cols, ch = inner.height() / rows;
    const double axis_max = allowance_axis_max(*levels_, current_);
    for (int k = 0; k < n; ++k) {
      const QRect cell(inner.left() + (k % cols) * cw, inner.top() + (k / cols) * ch, cw, ch);
      AllowanceChartStyle style;
      style.highlight_level = k == current_level_ && n > 1;
      style.background = kChartBackground;
      paint_allowance_chart(p, cell.adjusted(line / 2, 0, -line, -line / 2),
                            (*levels_)[static_cast<size_t>(k)], axis_max, current_, highlighted_,
                            unit_, style);
    }
    paint_allowance_legend(
        p, QRect(inner.left() + line / 2, area.bottom() - 1.5 * line, inner.width(), line), band_);
  }

 protected:
  void paintEvent(QPaintEvent*) override {
    QPainter p(this);
    paint_into(p, rect());
  }

 private:
  const std::vector<AllowanceLevel>* levels_ = nullptr;
  double current_ = NAN;
  int current_level_ = 0;
  analysis::MovementPreset highlighted_ = analysis::MovementPreset::kNone;
  analysis::ForceUnit unit_ = analysis::ForceUnit::kGram;
  bool band_ = false;
};

namespace {

const std::vector<std::pair<QString, AllowanceCriterion>>& criteria() {
  using analysis::AllowanceMeasure;
  using analysis::AllowanceThreshold;
  static const std::vector<std::pair<QString, AllowanceCriterion>> list = {
      {QStringLiteral("peak compression \u2264 upper limit"),
       {AllowanceMeasure::kPeak, AllowanceThreshold::kLimit}},
      {QStringLiteral("peak compression \u2264 capillary pressure"),
       {AllowanceMeasure::kPeak, AllowanceThreshold::kCapillary}},
      {QStringLiteral("95th percentile \u2264 upper limit"),
       {AllowanceMeasure::kP95, AllowanceThreshold::kLimit}},
      {QStringLiteral("95th percentile \u2264 capillary pressure"),
       {AllowanceMeasure::kP95, AllowanceThreshold::kCapillary}}};
  return list;
}

}  // namespace

AllowanceView::AllowanceView(CaseSession* session, QWidget* parent)
    : QWidget(parent), session_(session), job_(std::make_unique<AllowanceJob>()) {
  build_layout();
  connect_controls();
  connect_job();
  refresh();
}

QHBoxLayout* AllowanceView::build_controls() {
  auto* row = new QHBoxLayout;
  movement_box_ = new QComboBox;
  for (analysis::MovementPreset m : analysis::all_movement_presets())
    movement_box_->addItem(label(m), static_cast<int>(m));
  movement_box_->setToolTip(QStringLiteral("The movement the apply button sets"));
  criterion_box_ = new QComboBox;
  for (const auto& c : criteria()) criterion_box_->addItem(c.first);
  criterion_box_->setToolTip(
      QStringLiteral("Which pressure measure the allowance keeps below "
                     "which threshold"));
  apply_ = new QPushButton(QStringLiteral("Apply allowance to the force"));
  band_ = new QPushButton(QStringLiteral("Compute variability band"));
  band_->setToolTip(QStringLiteral(
      "Solves the model again for sampled tissue properties and readings (the case's "
      "allowance settings); runs in the background"));
  cancel_ = new QPushButton(QStringLiteral("Stop"));
  progress_ = new QProgressBar;
  progress_->setRange(0, 1000);
  progress_->setMaximumWidth(180);
  row->addWidget(new QLabel(QStringLiteral("Movement")));
  row->addWidget(movement_box_);
  row->addSpacing(8);
  row->addWidget(new QLabel(QStringLiteral("Keep")));
  row->addWidget(criterion_box_);
  row->addSpacing(8);
  row->addWidget(apply_);
  row->addStretch(1);
  row->addWidget(band_);
  row->addWidget(progress_);
  row->addWidget(cancel_);
  return row;
}

void AllowanceView::build_layout() {
  auto* outer = new QVBoxLayout(this);
  outer->setContentsMargins(6, 6, 6, 6);
  outer->addLayout(build_controls());
  status_ = new QLabel;
  status_->setWordWrap(true);
  outer->addWidget(status_);
  charts_ = new AllowanceCharts;
  outer->addWidget(charts_, 1);
  notes_ = new QLabel;
  notes_->setWordWrap(true);
  notes_->setStyleSheet(QStringLiteral("color: #3b4652;"));
  outer->addWidget(notes_);
  caution_ = new QLabel(QString::fromStdString(analysis::caution_text()));
  caution_->setObjectName(QStringLiteral("allowance_caution"));
  caution_->setWordWrap(true);
  caution_->setStyleSheet(QStringLiteral("color: #463200; font-style: italic;"));
  outer->addWidget(caution_);
  progress_->hide();
  cancel_->hide();
}

void AllowanceView::connect_controls() {
  connect(movement_box_, &QComboBox::currentIndexChanged, this, [this]() { refresh(); });
  connect(criterion_box_, &QComboBox::currentIndexChanged, this, [this](int i) {
    if (i >= 0) set_criterion(criteria()[static_cast<size_t>(i)].second);
  });
  connect(apply_, &QPushButton::clicked, this, [this]() { apply_allowance(); });
  connect(band_, &QPushButton::clicked, this, [this]() { compute_band(); });
  connect(cancel_, &QPushButton::clicked, this, [this]() { job_->cancel_band(); });

  connect(session_, &CaseSession::results_changed, this, &AllowanceView::follow_session);
  connect(session_, &CaseSession::current_changed, this, [this]() { refresh(); });
  connect(session_, &CaseSession::case_replaced, this, [this]() { follow_session(false); });
}

// The background job's results and progress, shown as they come.
void AllowanceView::connect_job() {
  connect(job_.get(), &AllowanceJob::nominal_ready, this, [this](int n) {
    refresh();
    emit nominal_shown(n);
  });
  connect(job_.get(), &AllowanceJob::nominal_failed, this, [this](const QString& message) {
    status_->setText(QStringLiteral("Allowances not computed: ") + message);
  });
  connect(job_.get(), &AllowanceJob::band_progress, this,
          [this](const QString& stage, double fraction) {
            progress_->setValue(static_cast<int>(1000 * fraction));
            status_->setText(QStringLiteral("Variability band: ") + stage);
          });
  auto band_ended = [this](const QString& text) {
    progress_->hide();
    cancel_->hide();
    refresh();
    status_->setText(text);
  };
  connect(job_.get(), &AllowanceJob::band_finished, this, [this, band_ended]() {
    band_ended(QStringLiteral("Variability band computed over %1 samples (%2 solves).")
                   .arg(job_->band()->options.n_samples)
                   .arg(job_->band()->n_solves));
  });
  connect(job_.get(), &AllowanceJob::band_cancelled, this, [band_ended]() {
    band_ended(QStringLiteral("Variability band stopped; the nominal allowances are shown."));
  });
  connect(job_.get(), &AllowanceJob::band_failed, this, [band_ended](const QString& message) {
    band_ended(QStringLiteral("Variability band failed: ") + message);
  });
}

AllowanceView::~AllowanceView() = default;

analysis::MovementPreset AllowanceView::movement() const {
  return static_cast<analysis::MovementPreset>(movement_box_->currentData().toInt());
}

void AllowanceView::set_movement(analysis::MovementPreset movement) {
  const int i = movement_box_->findData(static_cast<int>(movement));
  if (i >= 0) movement_box_->setCurrentIndex(i);
}

void AllowanceView::set_criterion(const AllowanceCriterion& criterion) {
  criterion_ = criterion;
  for (size_t i = 0; i < criteria().size(); ++i) {
    const AllowanceCriterion& c = criteria()[i].second;
    if (c.measure == criterion.measure && c.threshold == criterion.threshold &&
        criterion_box_->currentIndex() != static_cast<int>(i)) {
      const QSignalBlocker block(criterion_box_);
      criterion_box_->setCurrentIndex(static_cast<int>(i));
    }
  }
  refresh();
}

void AllowanceView::follow_session(bool interactive) {
  // A slider moves only the present-force line; the allowances do not depend on the magnitude.
  if (!interactive)
    job_->update(session_->shared_study(), session_->spec().load, session_->spec().thresholds);
  // A movement preset chosen in the force panel becomes the movement shown here.
  const analysis::MovementPreset preset = session_->load_controls().preset;
  if (preset != followed_preset_) {
    followed_preset_ = preset;
    if (preset != analysis::MovementPreset::kNone) set_movement(preset);
  }
  refresh();
}

QString AllowanceView::status_text() const { return status_->text(); }

void AllowanceView::refresh() {
  const LoadControls& load = session_->load_controls();
  const bool band = job_->band_matches_load();
  levels_ = allowance_levels(job_->nominal(), band ? job_->band() : nullptr, criterion_, load.unit);
  const analysis::MovementPreset highlighted = movement();
  charts_->set(&levels_, load.magnitude, session_->current(), highlighted, load.unit, band);
  const analysis::Study* study = session_->study();
  band_->setEnabled(study && study->complete() && !job_->band_running());
  progress_->setVisible(job_->band_running());
  cancel_->setVisible(job_->band_running());
  const bool has_level = session_->current() < static_cast<int>(levels_.size());
  apply_->setEnabled(has_level);
  apply_->setText(band ? QStringLiteral("Apply conservative allowance")
                       : QStringLiteral("Apply nominal allowance"));
  QString notes = QStringLiteral(
                      "Allowance: the largest force at the bracket, with the couple the "
                      "movement needs, that keeps the ") +
                  describe(criterion_, session_->spec().thresholds) +
                  QStringLiteral(" (linear in the force: one evaluation per movement). ");
  if (band)
    notes += QStringLiteral(
        "Conservative allowance: the 10th percentile over the sampled tissue properties and "
        "readings (nine variations in ten allow more); it describes the spread, not a "
        "probability for a given patient. ");
  else if (job_->band())
    notes += QStringLiteral(
        "The band was computed under the force direction and thresholds of the last solve and is "
        "hidden for the present ones; solve again (F5) and compute it anew. ");
  else
    notes += QStringLiteral("Variability band not computed: the nominal allowance is shown. ");
  notes += band ? QStringLiteral("Figures at the right: the conservative allowances. ")
                : QStringLiteral("Figures at the right: the nominal allowances. ");
  notes += QStringLiteral(
      "Common-practice ranges (sand strips) are a fact of the trade with no single source: a "
      "plausibility bound, never a prescription.");
  notes_->setText(notes);
  if (!job_->band_running() && status_->text().isEmpty() && levels_.empty())
    status_->setText(QStringLiteral("Waiting for a solved bone level."));
  else if (!job_->band_running() && status_->text().startsWith(QStringLiteral("Waiting")))
    status_->clear();
}

bool AllowanceView::compute_band() {
  const analysis::Study* study = session_->study();
  QString why;
  bool ok = study != nullptr;
  if (ok) {
    try {
      ok = job_->start_band(analysis::band_options(study->spec()), &why);
    } catch (const std::exception& e) {
      ok = false;
      why = QString::fromStdString(e.what());
    }
  } else {
    why = QStringLiteral("nothing is solved yet");
  }
  if (!ok) {
    status_->setText(QStringLiteral("Variability band not started: ") + why);
    return false;
  }
  progress_->setValue(0);
  status_->setText(QStringLiteral("Variability band: starting\u2026"));
  refresh();
  return true;
}

bool AllowanceView::apply_allowance() {
  const int k = session_->current();
  if (k < 0 || k >= static_cast<int>(levels_.size())) {
    status_->setText(QStringLiteral("No allowance to apply yet: the level on display has none."));
    return false;
  }
  // Copies: applying the force refreshes the session and this view (levels_ is rebuilt).
  const QString level_name = levels_[static_cast<size_t>(k)].name;
  const AllowanceRow* row = levels_[static_cast<size_t>(k)].row(movement());
  const LoadControls present = session_->load_controls();
  const std::optional<AppliedAllowance> maybe =
      row ? allowance_to_apply(*row, present.unit) : std::nullopt;
  const QString what = label(movement());
  if (!maybe) {
    status_->setText(
        QStringLiteral("%1 at %2 has no allowance to apply (not limited by compression, or "
                       "below the smallest force the field shows).")
            .arg(what, level_name));
    return false;
  }
  const AppliedAllowance applied = *maybe;
  emit apply_requested(controls_for_allowance(present, movement(), applied.force));
  status_->setText(
      QStringLiteral("Applied the %1 allowance of %2 at %3: %4.")
          .arg(applied.is_conservative ? QStringLiteral("conservative") : QStringLiteral("nominal"),
               what.toLower(), level_name, allowance_text(applied.force, present.unit)));
  return true;
}

QImage AllowanceView::grab_charts() { return charts_->grab().toImage(); }

}  // namespace sharpey::app
