#include "view/case_panel.h"

#include <QCheckBox>
#include <QComboBox>
#include <QDoubleSpinBox>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QHeaderView>
#include <QLabel>
#include <QLineEdit>
#include <QPushButton>
#include <QTableWidget>
#include <QVBoxLayout>

#include "core/case_session.h"
#include "sharpey/error.h"

namespace sharpey::app {

namespace {

// A number field that reports only finished edits (no keyboard tracking).
QDoubleSpinBox* number_box(double lo, double hi, int decimals, double step, const QString& suffix,
                           const QString& tip) {
  auto* s = new QDoubleSpinBox;
  s->setRange(lo, hi);
  s->setDecimals(decimals);
  s->setSingleStep(step);
  s->setSuffix(suffix);
  s->setToolTip(tip);
  s->setKeyboardTracking(false);
  return s;
}

}  // namespace

QString tooth_name(int tooth_type) {
  return QString::fromStdString(mesh::to_string(static_cast<mesh::ToothType>(tooth_type)))
      .replace('_', ' ');
}

CasePanel::CasePanel(CaseSession* session, QWidget* parent) : QWidget(parent), session_(session) {
  auto* outer = new QVBoxLayout(this);
  build_case_form(outer);
  build_levels(outer);
  build_defect_form(outer);
  build_materials(outer);
  build_thresholds(outer);
  build_solve(outer);
  connect_case_form();
  connect_levels();
  reload();
}

// Label, tooth, ligament width and mesh preset.
void CasePanel::build_case_form(QVBoxLayout* outer) {
  auto* form = new QFormLayout;
  form->setFieldGrowthPolicy(QFormLayout::AllNonFixedFieldsGrow);
  label_ = new QLineEdit;
  label_->setPlaceholderText(QStringLiteral("what this case is (invented cases say so)"));
  form->addRow(QStringLiteral("Label"), label_);
  tooth_ = new QComboBox;
  for (mesh::ToothType t : mesh::all_tooth_types())
    tooth_->addItem(tooth_name(static_cast<int>(t)), static_cast<int>(t));
  form->addRow(QStringLiteral("Tooth"), tooth_);
  pdl_width_ = new QDoubleSpinBox;
  pdl_width_->setRange(0.05, 0.60);
  pdl_width_->setDecimals(2);
  pdl_width_->setSingleStep(0.01);
  pdl_width_->setSuffix(QStringLiteral(" mm"));
  pdl_width_->setKeyboardTracking(false);
  pdl_width_->setToolTip(
      QStringLiteral("Uniform ligament width (a case file may give a crest / "
                     "mid-root / apex profile)"));
  form->addRow(QStringLiteral("PDL width"), pdl_width_);
  preset_ = new QComboBox;
  for (auto p : {mesh::MeshPreset::kCoarse, mesh::MeshPreset::kStandard, mesh::MeshPreset::kFine})
    preset_->addItem(QString::fromStdString(mesh::to_string(p)), static_cast<int>(p));
  preset_->setToolTip(QStringLiteral("Mesh fineness: coarse is quick, fine is slow"));
  form->addRow(QStringLiteral("Mesh"), preset_);
  outer->addLayout(form);
}

// The bone-level table and the row that adds or removes a level.
void CasePanel::build_levels(QVBoxLayout* outer) {
  outer->addWidget(new QLabel(QStringLiteral("<b>Bone levels</b> (tick two to four to compare)")));
  levels_ = new QTableWidget(0, 4);
  levels_->setHorizontalHeaderLabels({QStringLiteral("compare"), QStringLiteral("name"),
                                      QStringLiteral("loss (mm)"),
                                      QStringLiteral("angular defect")});
  levels_->horizontalHeaderItem(2)->setToolTip(
      QStringLiteral("Horizontal bone loss below the healthy crest"));
  levels_->horizontalHeader()->setStretchLastSection(true);
  levels_->verticalHeader()->setVisible(false);
  levels_->setSelectionBehavior(QAbstractItemView::SelectRows);
  levels_->setSelectionMode(QAbstractItemView::SingleSelection);
  levels_->setMinimumHeight(120);
  outer->addWidget(levels_);
  auto* add_row = new QHBoxLayout;
  new_loss_ = new QDoubleSpinBox;
  new_loss_->setRange(0, 15);
  new_loss_->setDecimals(1);
  new_loss_->setValue(5.0);
  new_loss_->setSuffix(QStringLiteral(" mm"));
  add_level_ = new QPushButton(QStringLiteral("Add level"));
  remove_level_ = new QPushButton(QStringLiteral("Remove"));
  add_row->addWidget(new_loss_);
  add_row->addWidget(add_level_);
  add_row->addWidget(remove_level_);
  outer->addLayout(add_row);
}

void CasePanel::build_defect_form(QVBoxLayout* outer) {
  // Angular defect of the selected level (case file: scenarios[i].angular_defect).
  defect_title_ = new QLabel;
  outer->addWidget(defect_title_);
  auto* defect = new QFormLayout;
  defect->setRowWrapPolicy(QFormLayout::WrapLongRows);
  defect_depth_ =
      number_box(0, 15, 1, 0.5, QStringLiteral(" mm"),
                 QStringLiteral("Depth of the vertical defect below this level's crest (0 = none); "
                                "the root must keep at least a few millimetres of attachment"));
  defect_depth_->setSpecialValueText(QStringLiteral("none"));
  defect_surface_ = new QComboBox;
  for (mesh::ToothSurface t : {mesh::ToothSurface::kMesial, mesh::ToothSurface::kDistal,
                               mesh::ToothSurface::kLabial, mesh::ToothSurface::kLingual})
    defect_surface_->addItem(QString::fromStdString(mesh::to_string(t)), static_cast<int>(t));
  defect_surface_->setToolTip(QStringLiteral("Root surface the defect is centred on"));
  defect_width_ =
      number_box(20, 180, 0, 10, QStringLiteral("\u00b0"),
                 QStringLiteral("Width of the defect around the root, 20\u00b0 to 180\u00b0"));
  defect->addRow(QStringLiteral("Depth below crest"), defect_depth_);
  defect->addRow(QStringLiteral("Centred on"), defect_surface_);
  defect->addRow(QStringLiteral("Width"), defect_width_);
  outer->addLayout(defect);

  connect(defect_depth_, &QDoubleSpinBox::valueChanged, this, [this]() { defect_edited(); });
  connect(defect_width_, &QDoubleSpinBox::valueChanged, this, [this]() { defect_edited(); });
  connect(defect_surface_, &QComboBox::currentIndexChanged, this, [this]() { defect_edited(); });
}

void CasePanel::build_materials(QVBoxLayout* outer) {
  // Materials (case file: pdl.material, bone.cortical_material, bone.cancellous_material).
  outer->addWidget(new QLabel(QStringLiteral("<b>Materials</b> (linear elastic)")));
  auto* materials = new QFormLayout;
  materials->setRowWrapPolicy(QFormLayout::WrapLongRows);
  for (MaterialPart part :
       {MaterialPart::kPdl, MaterialPart::kCorticalBone, MaterialPart::kCancellousBone}) {
    const int i = static_cast<int>(part);
    const bool pdl = part == MaterialPart::kPdl;
    const QString key = QString::fromStdString(case_key(part));
    auto* e =
        number_box(pdl ? 0.001 : 1.0, 1e6, pdl ? 3 : 0, pdl ? 0.01 : 100.0, QStringLiteral(" MPa"),
                   QStringLiteral("%1 (%2.young_modulus_mpa): more than 0, at most 1e6 MPa")
                       .arg(label(part), key));
    auto* nu =
        number_box(0.0, 0.499, 3, 0.01, QString(),
                   QStringLiteral("%1 (%2.poisson_ratio): 0 to below 0.5").arg(label(part), key));
    modulus_[i] = e;
    poisson_[i] = nu;
    QString name = label(part);
    name[0] = name[0].toUpper();
    materials->addRow(name + QStringLiteral(" modulus"), e);
    materials->addRow(name + QStringLiteral(" Poisson ratio"), nu);
    connect(e, &QDoubleSpinBox::valueChanged, this, [this, i]() { material_edited(i); });
    connect(nu, &QDoubleSpinBox::valueChanged, this, [this, i]() { material_edited(i); });
  }
  outer->addLayout(materials);
}

// The two thresholds with their sources.
void CasePanel::build_thresholds(QVBoxLayout* outer) {
  outer->addWidget(new QLabel(QStringLiteral("<b>Pressure thresholds</b>")));
  auto* thresholds = new QFormLayout;
  capillary_ = new QDoubleSpinBox;
  limit_ = new QDoubleSpinBox;
  for (QDoubleSpinBox* s : {capillary_, limit_}) {
    s->setRange(0.1, 200);
    s->setDecimals(1);
    s->setSuffix(QStringLiteral(" kPa"));
    s->setKeyboardTracking(false);
  }
  capillary_source_ = new QLabel;
  limit_source_ = new QLabel;
  for (QLabel* l : {capillary_source_, limit_source_}) {
    l->setWordWrap(true);
    l->setStyleSheet(QStringLiteral("color: #5a5a5a; font-size: 9pt;"));
    l->setTextInteractionFlags(Qt::TextSelectableByMouse);
  }
  thresholds->addRow(QStringLiteral("Capillary"), capillary_);
  thresholds->addRow(capillary_source_);
  thresholds->addRow(QStringLiteral("Limit"), limit_);
  thresholds->addRow(limit_source_);
  outer->addLayout(thresholds);

  auto thresholds_edited = [this]() {
    if (!updating_) session_->set_thresholds(capillary_->value(), limit_->value());
  };
  connect(capillary_, &QDoubleSpinBox::valueChanged, this, thresholds_edited);
  connect(limit_, &QDoubleSpinBox::valueChanged, this, thresholds_edited);
}

// The stale notice and the solve button.
void CasePanel::build_solve(QVBoxLayout* outer) {
  stale_ = new QLabel;
  stale_->setWordWrap(true);
  stale_->setStyleSheet(QStringLiteral("background: #f6e7c1; color: #5b4100; padding: 4px;"));
  outer->addWidget(stale_);
  solve_ = new QPushButton(QStringLiteral("Mesh and solve"));
  solve_->setToolTip(QStringLiteral("Meshes and solves every bone level (F5)"));
  outer->addWidget(solve_);
  outer->addStretch(1);

  connect(solve_, &QPushButton::clicked, this, &CasePanel::solve_requested);
}

void CasePanel::connect_case_form() {
  connect(label_, &QLineEdit::editingFinished, this, [this]() {
    if (!updating_) session_->set_label(label_->text());
  });
  connect(tooth_, &QComboBox::currentIndexChanged, this, [this]() {
    if (!updating_)
      session_->set_tooth(static_cast<mesh::ToothType>(tooth_->currentData().toInt()));
  });
  connect(pdl_width_, &QDoubleSpinBox::valueChanged, this, [this](double v) {
    if (!updating_) session_->set_pdl_width(v);
  });
  connect(preset_, &QComboBox::currentIndexChanged, this, [this]() {
    if (!updating_)
      session_->set_mesh_preset(static_cast<mesh::MeshPreset>(preset_->currentData().toInt()));
  });
}

// Add, remove, rename, re-level or tick a level for comparison; the defect form follows the row.
void CasePanel::connect_levels() {
  connect(add_level_, &QPushButton::clicked, this, [this]() {
    ScenarioList list = session_->levels();
    try {
      list.add(new_loss_->value());
      session_->set_levels(list);  // the case-file rules, checked on entry
    } catch (const InputError& e) {
      emit edit_refused(QStringLiteral("Bone level"), QString::fromStdString(e.what()));
      return;
    }
    reload_levels();
  });
  connect(remove_level_, &QPushButton::clicked, this, [this]() {
    const int row = levels_->currentRow();
    if (row < 0) return;
    ScenarioList list = session_->levels();
    try {
      list.remove(row);
      session_->set_levels(list);
    } catch (const InputError& e) {
      emit edit_refused(QStringLiteral("Bone level"), QString::fromStdString(e.what()));
      return;
    }
    reload_levels();
  });
  connect(levels_, &QTableWidget::itemChanged, this, [this](QTableWidgetItem* item) {
    if (updating_) return;
    if (item->column() == 3) return;
    if (item->column() == 0) {
      if (!session_->set_compared(item->row(), item->checkState() == Qt::Checked)) {
        emit edit_refused(QStringLiteral("Compare"),
                          QStringLiteral("At most four bone levels can be compared at once."));
      }
      reload_levels();
      emit comparison_changed();
      return;
    }
    levels_edited();
  });
  connect(levels_, &QTableWidget::currentCellChanged, this, [this]() { reload_defect(); });
}

void CasePanel::reload_defect() {
  const int row = std::max(0, levels_->currentRow());
  const ScenarioList& list = session_->levels();
  const bool on = row < list.size();
  for (QWidget* w : std::initializer_list<QWidget*>{defect_depth_, defect_surface_, defect_width_})
    w->setEnabled(on);
  if (!on) return;
  const bool was = updating_;
  updating_ = true;
  const mesh::BoneLoss& loss = list.at(row).loss;
  defect_title_->setText(QStringLiteral("<b>Angular defect</b> of \"%1\"")
                             .arg(QString::fromStdString(list.at(row).name).toHtmlEscaped()));
  defect_depth_->setValue(loss.defect_depth_mm);
  defect_surface_->setCurrentIndex(
      defect_surface_->findData(static_cast<int>(loss.defect_surface)));
  defect_width_->setValue(loss.defect_width_deg);
  defect_surface_->setEnabled(loss.defect_depth_mm > 0);
  defect_width_->setEnabled(loss.defect_depth_mm > 0);
  updating_ = was;
}

void CasePanel::defect_edited() {
  if (updating_) return;
  const int row = std::max(0, levels_->currentRow());
  try {
    session_->set_defect(row, defect_depth_->value(),
                         static_cast<mesh::ToothSurface>(defect_surface_->currentData().toInt()),
                         defect_width_->value());
  } catch (const InputError& e) {
    emit edit_refused(QStringLiteral("Angular defect"), QString::fromStdString(e.what()));
  }
  reload_levels();
  if (levels_->currentRow() != row && row < levels_->rowCount()) levels_->setCurrentCell(row, 1);
  reload_defect();
}

void CasePanel::material_edited(int i) {
  if (updating_) return;
  const auto part = static_cast<MaterialPart>(i);
  try {
    session_->set_material(part, fem::Material{modulus_[i]->value(), poisson_[i]->value()});
  } catch (const InputError& e) {
    emit edit_refused(QStringLiteral("Material"), QString::fromStdString(e.what()));
    updating_ = true;
    modulus_[i]->setValue(session_->material(part).young_modulus_mpa);
    poisson_[i]->setValue(session_->material(part).poisson_ratio);
    updating_ = false;
  }
}

void CasePanel::reload() {
  updating_ = true;
  const analysis::CaseSpec& s = session_->spec();
  label_->setText(QString::fromStdString(s.label));
  tooth_->setCurrentIndex(tooth_->findData(static_cast<int>(s.model.tooth.type)));
  pdl_width_->setValue(s.model.pdl.mid_width_mm);
  preset_->setCurrentIndex(preset_->findData(static_cast<int>(s.model.sizing.preset)));
  capillary_->setValue(s.thresholds.capillary.value_kpa);
  limit_->setValue(s.thresholds.limit.value_kpa);
  for (MaterialPart part :
       {MaterialPart::kPdl, MaterialPart::kCorticalBone, MaterialPart::kCancellousBone}) {
    modulus_[static_cast<int>(part)]->setValue(session_->material(part).young_modulus_mpa);
    poisson_[static_cast<int>(part)]->setValue(session_->material(part).poisson_ratio);
  }
  capillary_source_->setText(QStringLiteral("Source: ") +
                             QString::fromStdString(s.thresholds.capillary.source));
  limit_source_->setText(QStringLiteral("Source: ") +
                         QString::fromStdString(s.thresholds.limit.source));
  updating_ = false;
  reload_levels();
}

void CasePanel::reload_levels() {
  updating_ = true;
  const ScenarioList& list = session_->levels();
  levels_->setRowCount(list.size());
  for (int i = 0; i < list.size(); ++i) {
    auto* check = new QTableWidgetItem;
    check->setFlags(Qt::ItemIsUserCheckable | Qt::ItemIsEnabled | Qt::ItemIsSelectable);
    check->setCheckState(list.is_compared(i) ? Qt::Checked : Qt::Unchecked);
    levels_->setItem(i, 0, check);
    levels_->setItem(i, 1, new QTableWidgetItem(QString::fromStdString(list.at(i).name)));
    levels_->setItem(i, 2,
                     new QTableWidgetItem(QString::number(list.at(i).loss.horizontal_mm, 'f', 1)));
    const mesh::BoneLoss& loss = list.at(i).loss;
    auto* defect = new QTableWidgetItem(
        loss.defect_depth_mm > 0
            ? QStringLiteral("%1 mm %2, %3\u00b0")
                  .arg(QString::number(loss.defect_depth_mm, 'f', 1),
                       QString::fromStdString(mesh::to_string(loss.defect_surface)))
                  .arg(loss.defect_width_deg, 0, 'f', 0)
            : QStringLiteral("none"));
    defect->setFlags(Qt::ItemIsEnabled | Qt::ItemIsSelectable);  // edited below the table
    levels_->setItem(i, 3, defect);
  }
  levels_->resizeColumnsToContents();
  updating_ = false;
  reload_defect();
}

void CasePanel::levels_edited() {
  ScenarioList list = session_->levels();
  try {
    for (int i = 0; i < list.size(); ++i) {
      const QString name = levels_->item(i, 1)->text();
      if (name.toStdString() != list.at(i).name) list.rename(i, name);
      bool ok = false;
      const double loss = levels_->item(i, 2)->text().toDouble(&ok);
      if (!ok || loss < 0) {
        throw InputError("scenarios[" + std::to_string(i) + "].horizontal_loss_mm",
                         "\"" + levels_->item(i, 2)->text().toStdString() +
                             "\" is not a bone loss; enter a number of millimetres, 0 or more");
      }
      if (loss != list.at(i).loss.horizontal_mm) {
        mesh::BoneLoss l = list.at(i).loss;
        l.horizontal_mm = loss;
        list.set_loss(i, l);
      }
    }
    session_->set_levels(list);  // the case-file rules (e.g. a loss the root cannot take), on entry
  } catch (const InputError& e) {
    emit edit_refused(QStringLiteral("Bone level"), QString::fromStdString(e.what()));
    reload_levels();
    return;
  }
  reload_levels();  // names generated from the loss follow it
}

void CasePanel::set_stale(bool stale, bool solving) {
  stale_->setVisible(stale && !solving);
  stale_->setText(
      QStringLiteral("The results shown do not match the case any more (geometry, "
                     "materials, mesh or bone levels changed). Mesh and solve again to "
                     "update them."));
  solve_->setEnabled(!solving);
}

}  // namespace sharpey::app
