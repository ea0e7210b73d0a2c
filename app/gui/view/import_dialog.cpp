#include "view/import_dialog.h"

#include <vtkActor.h>
#include <vtkBillboardTextActor3D.h>
#include <vtkCamera.h>
#include <vtkCellArray.h>
#include <vtkLineSource.h>
#include <vtkPoints.h>
#include <vtkPolyData.h>
#include <vtkPolyDataMapper.h>
#include <vtkProperty.h>
#include <vtkRenderer.h>
#include <vtkSphereSource.h>
#include <vtkTextProperty.h>
#include <vtkTubeFilter.h>

#include <QApplication>
#include <QCheckBox>
#include <QComboBox>
#include <QFileDialog>
#include <QFileInfo>
#include <QFormLayout>
#include <QHBoxLayout>
#include <QLabel>
#include <QPushButton>
#include <QVBoxLayout>

#include "core/colour_map.h"
#include "sharpey/error.h"
#include "view/vtk_view.h"

namespace sharpey::app {

namespace {

// The dialog's own marks: the axis and its two ends in amber, the CEJ points in sea green, the
// side names in the label colours of the main view's boxes.
const Rgb kSurfaceColour = {0.90, 0.87, 0.80};
const Rgb kAxisColour = {0.96, 0.68, 0.22};
const Rgb kCejColour = {0.45, 0.82, 0.66};
const Rgb kSideColour = {0.98, 0.95, 0.86};

QString tooth_name(mesh::ToothType t) {
  return QString::fromStdString(mesh::to_string(t)).replace('_', ' ');
}

}  // namespace

// The VTK actors of the preview.
struct ImportDialog::Scene {
  vtkNew<vtkActor> surface;
  vtkNew<vtkActor> axis;
  std::vector<vtkSmartPointer<vtkActor>> marks;
  std::vector<vtkSmartPointer<vtkBillboardTextActor3D>> labels;
};

ImportDialog::ImportDialog(const QString& start_folder, QWidget* parent)
    : QDialog(parent), start_folder_(start_folder), scene_(std::make_unique<Scene>()) {
  setWindowTitle(QStringLiteral("Import a tooth surface"));
  auto* layout = new QHBoxLayout(this);
  add_view(layout);
  auto* side = new QVBoxLayout;
  layout->addLayout(side);
  auto* form = new QFormLayout;
  side->addLayout(form);
  add_file_rows(form);
  add_axis_rows(form);
  add_swap_boxes(side);
  add_tooth_and_confirmation(side);
  add_message_and_buttons(side);
  refresh();
}

// The 3D preview: the surface, and the axis drawn over it.
void ImportDialog::add_view(QHBoxLayout* layout) {
  view_ = new VtkView;
  view_->setMinimumSize(420, 420);
  layout->addWidget(view_, 1);
  vtkRenderer* r = view_->renderer();
  r->GradientBackgroundOn();
  const Rgb bottom = view_background_bottom(), top = view_background_top();
  r->SetBackground(bottom[0], bottom[1], bottom[2]);
  r->SetBackground2(top[0], top[1], top[2]);
  r->AddActor(scene_->surface);
  view_->overlay()->AddActor(scene_->axis);
}

// The surface file and its chooser.
void ImportDialog::add_file_rows(QFormLayout* form) {
  file_label_ = new QLabel(QStringLiteral("none"));
  file_label_->setWordWrap(true);
  auto* choose = new QPushButton(QStringLiteral("Choose surface\u2026"));
  connect(choose, &QPushButton::clicked, this, [this]() {
    const QString path = QFileDialog::getOpenFileName(
        this, QStringLiteral("Tooth surface"), start_folder_,
        QStringLiteral("Triangulated surfaces (*.stl *.STL *.ply *.PLY *.obj *.OBJ)"));
    if (!path.isEmpty()) open_surface(path);
  });
  form->addRow(QStringLiteral("Surface"), file_label_);
  form->addRow(QString(), choose);
}

// Where the axis comes from: landmarks from a case file or the proposal from the shape.
void ImportDialog::add_axis_rows(QFormLayout* form) {
  axis_label_ = new QLabel;
  axis_label_->setWordWrap(true);
  landmarks_button_ = new QPushButton(QStringLiteral("Landmarks from a case\u2026"));
  connect(landmarks_button_, &QPushButton::clicked, this, [this]() {
    const QString path =
        QFileDialog::getOpenFileName(this, QStringLiteral("Case file with the landmarks"),
                                     start_folder_, QStringLiteral("Sharpey cases (*.json)"));
    if (!path.isEmpty()) open_landmarks(path);
  });
  proposal_button_ = new QPushButton(QStringLiteral("Use the proposal"));
  connect(proposal_button_, &QPushButton::clicked, this, [this]() {
    import_.clear_landmarks();
    refresh();
  });
  auto* axis_buttons = new QHBoxLayout;
  axis_buttons->addWidget(landmarks_button_);
  axis_buttons->addWidget(proposal_button_);
  form->addRow(QStringLiteral("Axis"), axis_label_);
  form->addRow(QString(), axis_buttons);
}

// The three boxes that turn the axis round.
void ImportDialog::add_swap_boxes(QVBoxLayout* side) {
  swap_crown_ = new QCheckBox(QStringLiteral("Crown and apex the other way round"));
  swap_labial_ = new QCheckBox(QStringLiteral("Labial and lingual the other way round"));
  swap_mesial_ = new QCheckBox(QStringLiteral("Mesial and distal the other way round"));
  swap_mesial_->setToolTip(
      QStringLiteral("A tooth of the other side of the mouth: the surface is mirrored so that "
                     "mesial is where the label says."));
  for (QCheckBox* box : {swap_crown_, swap_labial_, swap_mesial_}) {
    side->addWidget(box);
    connect(box, &QCheckBox::toggled, this, [this]() {
      import_.set_swap_crown_apex(swap_crown_->isChecked());
      import_.set_swap_labial_lingual(swap_labial_->isChecked());
      import_.set_swap_mesial_distal(swap_mesial_->isChecked());
      confirm_->setChecked(false);  // a turned axis needs a new look
      refresh();
    });
  }
}

// The tooth type, the summary and the confirmation of the axis.
void ImportDialog::add_tooth_and_confirmation(QVBoxLayout* side) {
  auto* form2 = new QFormLayout;
  side->addLayout(form2);
  tooth_ = new QComboBox;
  for (mesh::ToothType t : mesh::all_tooth_types())
    tooth_->addItem(tooth_name(t), static_cast<int>(t));
  connect(tooth_, &QComboBox::currentIndexChanged, this, [this]() {
    import_.set_tooth_type(static_cast<mesh::ToothType>(tooth_->currentData().toInt()));
  });
  form2->addRow(QStringLiteral("Tooth"), tooth_);

  summary_ = new QLabel;
  summary_->setWordWrap(true);
  side->addWidget(summary_);
  confirm_ =
      new QCheckBox(QStringLiteral("The axis is right: crown at the top, the side names\n"
                                   "where those sides of the tooth are"));
  connect(confirm_, &QCheckBox::toggled, this, [this](bool on) {
    import_.set_confirmed(on);
    create_->setEnabled(on && import_.has_surface());
  });
  side->addWidget(confirm_);
}

// The message line, Cancel and Create case.
void ImportDialog::add_message_and_buttons(QVBoxLayout* side) {
  message_ = new QLabel;
  message_->setWordWrap(true);
  message_->setTextInteractionFlags(Qt::TextSelectableByMouse);
  message_->setMinimumWidth(320);
  side->addWidget(message_);
  side->addStretch(1);

  auto* buttons = new QHBoxLayout;
  create_ = new QPushButton(QStringLiteral("Create case"));
  create_->setDefault(true);
  connect(create_, &QPushButton::clicked, this, [this]() { create_case(); });
  auto* cancel = new QPushButton(QStringLiteral("Cancel"));
  connect(cancel, &QPushButton::clicked, this, &QDialog::reject);
  buttons->addStretch(1);
  buttons->addWidget(cancel);
  buttons->addWidget(create_);
  side->addLayout(buttons);
}

ImportDialog::~ImportDialog() = default;

QString ImportDialog::message() const { return message_->text(); }

void ImportDialog::show_message(const QString& text, bool is_error) {
  message_->setText(text);
  // Dark red on the dialog's own background for a refused file; plain text otherwise.
  message_->setStyleSheet(is_error ? QStringLiteral("color: #9a2a1c;") : QString());
}

bool ImportDialog::open_surface(const QString& path) {
  // Reading and checking a large scan takes a moment (self-intersection test).
  QApplication::setOverrideCursor(Qt::WaitCursor);
  const bool ok = import_.read_surface(path);
  QApplication::restoreOverrideCursor();
  swap_crown_->setChecked(false);
  swap_labial_->setChecked(false);
  swap_mesial_->setChecked(false);
  confirm_->setChecked(false);
  if (ok)
    show_message(QStringLiteral("Check the axis: the crown at the top, the labial, lingual, "
                                "mesial and distal names beside those sides. Turn it round "
                                "with the boxes if needed, then confirm."),
                 false);
  else
    show_message(import_.error(), true);
  refresh();
  return ok;
}

bool ImportDialog::open_landmarks(const QString& case_path) {
  const bool ok = import_.read_landmarks(case_path);
  confirm_->setChecked(false);
  show_message(ok ? QStringLiteral("Landmarks taken from %1.").arg(QFileInfo(case_path).fileName())
                  : import_.error(),
               !ok);
  refresh();
  return ok;
}

bool ImportDialog::create_case() {
  try {
    case_ = import_.build_case();
  } catch (const Error& e) {
    show_message(QString::fromStdString(e.what()), true);
    return false;
  }
  accept();
  return true;
}

void ImportDialog::refresh() {
  Scene& s = *scene_;
  vtkRenderer* o = view_->overlay();
  for (auto& a : s.marks) o->RemoveActor(a);
  for (auto& t : s.labels) o->RemoveActor(t);
  s.marks.clear();
  s.labels.clear();

  const bool have = import_.has_surface();
  s.surface->SetVisibility(have);
  s.axis->SetVisibility(have);
  refresh_controls(have);
  if (!have) {
    summary_->clear();
    view_->update();
    return;
  }
  const mesh::SurfaceMesh& surface = *import_.surface();
  show_surface(surface);
  const std::vector<ShownLandmark> marks = import_.shown_landmarks();
  const double length = import_.length_mm();
  show_axis_and_landmarks(marks, length);
  aim_camera(marks, length);
  summary_->setText(QStringLiteral("%1 triangles, %2 mm long along the axis.")
                        .arg(surface.triangles.size())
                        .arg(length, 0, 'f', 1));
  view_->update();
}

// Buttons and boxes enabled as the import allows; the file and axis labels.
void ImportDialog::refresh_controls(bool have) {
  landmarks_button_->setEnabled(have);
  proposal_button_->setEnabled(import_.axis_source() == AxisSource::kLandmarks);
  for (QCheckBox* box : {swap_crown_, swap_labial_, swap_mesial_, confirm_}) box->setEnabled(have);
  create_->setEnabled(have && import_.confirmed());
  file_label_->setText(have ? QFileInfo(import_.surface_path()).fileName()
                            : QStringLiteral("none"));
  switch (import_.axis_source()) {
    case AxisSource::kNone:
      axis_label_->setText(QStringLiteral("\u2014"));
      break;
    case AxisSource::kLandmarks:
      axis_label_->setText(QStringLiteral("from the case file's landmarks"));
      break;
    case AxisSource::kPrincipalAxes:
      axis_label_->setText(
          QStringLiteral("proposed from the shape (principal axes): its labial and mesial "
                         "sides are a guess, check them"));
      break;
  }
}

// The surface in tooth coordinates.
void ImportDialog::show_surface(const mesh::SurfaceMesh& surface) {
  Scene& s = *scene_;
  const std::vector<Eigen::Vector3d> v = import_.placed_vertices();
  vtkNew<vtkPoints> points;
  points->SetNumberOfPoints(static_cast<vtkIdType>(v.size()));
  for (size_t i = 0; i < v.size(); ++i)
    points->SetPoint(static_cast<vtkIdType>(i), v[i].x(), v[i].y(), v[i].z());
  vtkNew<vtkCellArray> cells;
  for (const auto& t : surface.triangles) {
    const vtkIdType ids[3] = {t[0], t[1], t[2]};
    cells->InsertNextCell(3, ids);
  }
  vtkNew<vtkPolyData> poly;
  poly->SetPoints(points);
  poly->SetPolys(cells);
  vtkNew<vtkPolyDataMapper> mapper;
  mapper->SetInputData(poly);
  s.surface->SetMapper(mapper);
  s.surface->GetProperty()->SetColor(kSurfaceColour[0], kSurfaceColour[1], kSurfaceColour[2]);
  s.surface->GetProperty()->SetOpacity(0.55);  // the axis inside stays visible
}

// A name at `at` in the overlay, in a box like the main view's labels.
void ImportDialog::add_label(const QString& text, const Eigen::Vector3d& at, const Rgb& colour) {
  auto t = vtkSmartPointer<vtkBillboardTextActor3D>::New();
  t->SetInput(text.toUtf8().constData());
  t->SetPosition(at.x(), at.y(), at.z());
  const Rgb box = label_box_colour();
  t->GetTextProperty()->SetFontSize(14);
  t->GetTextProperty()->SetColor(colour[0], colour[1], colour[2]);
  t->GetTextProperty()->SetBackgroundColor(box[0], box[1], box[2]);
  t->GetTextProperty()->SetBackgroundOpacity(label_box_opacity());
  view_->overlay()->AddActor(t);
  scene_->labels.push_back(t);
}

// The axis from apex to crown tip, and the landmarks with their names.
void ImportDialog::show_axis_and_landmarks(const std::vector<ShownLandmark>& marks, double length) {
  Scene& s = *scene_;
  vtkRenderer* o = view_->overlay();
  vtkNew<vtkLineSource> line;
  line->SetPoint1(marks[0].point_mm.data());
  line->SetPoint2(marks[1].point_mm.data());
  vtkNew<vtkTubeFilter> tube;
  tube->SetInputConnection(line->GetOutputPort());
  tube->SetRadius(0.012 * length);
  tube->SetNumberOfSides(12);
  vtkNew<vtkPolyDataMapper> axis_mapper;
  axis_mapper->SetInputConnection(tube->GetOutputPort());
  s.axis->SetMapper(axis_mapper);
  s.axis->GetProperty()->SetColor(kAxisColour[0], kAxisColour[1], kAxisColour[2]);

  for (size_t i = 0; i < marks.size(); ++i) {
    const Rgb& colour = i < 2 ? kAxisColour : kCejColour;
    vtkNew<vtkSphereSource> ball;
    ball->SetCenter(marks[i].point_mm.data());
    ball->SetRadius(0.022 * length);
    ball->SetThetaResolution(16);
    ball->SetPhiResolution(12);
    vtkNew<vtkPolyDataMapper> m;
    m->SetInputConnection(ball->GetOutputPort());
    auto a = vtkSmartPointer<vtkActor>::New();
    a->SetMapper(m);
    a->GetProperty()->SetColor(colour[0], colour[1], colour[2]);
    o->AddActor(a);
    s.marks.push_back(a);
  }
  // Side names beyond the CEJ points (the way the tooth coordinate system says they lie), and the
  // crown name above the crown tip.
  const double out = 0.18 * length;
  add_label(QStringLiteral("labial"), marks[2].point_mm + Eigen::Vector3d(out, 0, 0), kSideColour);
  add_label(QStringLiteral("lingual"), marks[3].point_mm + Eigen::Vector3d(-out, 0, 0),
            kSideColour);
  add_label(QStringLiteral("mesial"), marks[4].point_mm + Eigen::Vector3d(0, out, 0), kSideColour);
  add_label(QStringLiteral("distal"), marks[5].point_mm + Eigen::Vector3d(0, -out, 0), kSideColour);
  add_label(QStringLiteral("crown"), marks[1].point_mm + Eigen::Vector3d(0, 0, 0.08 * length),
            kAxisColour);
  add_label(QStringLiteral("apex"), marks[0].point_mm + Eigen::Vector3d(0, 0, -0.08 * length),
            kAxisColour);
}

// Seen from mesiolabial and above, the crown up, so all four sides' names show.
void ImportDialog::aim_camera(const std::vector<ShownLandmark>& marks, double length) {
  vtkRenderer* r = view_->renderer();
  vtkCamera* camera = r->GetActiveCamera();
  camera->SetFocalPoint(0, 0, 0.5 * (marks[0].point_mm.z() + marks[1].point_mm.z()));
  camera->SetPosition(1.9 * length, 1.1 * length, 1.7 * length);
  camera->SetViewUp(0, 0, 1);
  r->ResetCamera();
  camera->Zoom(0.8);  // room for the crown and side names around the surface
  r->ResetCameraClippingRange();
}

}  // namespace sharpey::app
