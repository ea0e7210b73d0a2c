// The help page "What the numbers mean": every quantity the app shows, in plain words for a
// clinician (HTML for a text browser). Plain logic, no widgets.
#pragma once

#include <QString>
#include <QStringList>

#include "sharpey/analysis/case_spec.h"

namespace sharpey::app {

// The page, with the case's thresholds and their sources filled in.
QString help_html(const analysis::Thresholds& thresholds);
// The terms the page explains, in its order (for the test that each has its paragraph).
QStringList help_terms();

}  // namespace sharpey::app
