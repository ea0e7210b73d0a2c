// The app's icons, drawn with QPainter (no image files): simple shapes of the app's own design.
#pragma once

#include <QIcon>

namespace sharpey::app {

enum class IconKind { kNew, kOpen, kSave, kSolve, kCancel, kImage, kReport, kExportData, kApp };
QIcon make_icon(IconKind kind);

}  // namespace sharpey::app
