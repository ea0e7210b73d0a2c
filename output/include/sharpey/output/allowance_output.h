// Report outputs of the force allowance: the "allowance" section of results.json, allowance.csv and
// the allowance paragraph of summary.txt. Shared by the batch command and the app's export; every
// output carries analysis::caution_text(). Never prints. Layout: docs/case-format.md, "Force
// allowance outputs".
#pragma once

#include <string>
#include <vector>

#include "sharpey/analysis/allowance_band.h"
#include "sharpey/analysis/case_spec.h"
#include "sharpey/analysis/force_allowance.h"

namespace sharpey::analysis {

// What the reports state: the nominal allowances (always) and the band (when it was computed).
struct AllowanceReport {
  std::vector<ScenarioAllowances> nominal;  // nominal_allowances(study)
  const AllowanceBand* band = nullptr;      // not owned; null when the band was not asked for
};

// results.json's "allowance" object, as JSON text: method and caution, the nominal allowances per
// scenario and movement in N and g with the common-practice range, and the band (ranges with their
// sources, percentiles, conservative allowance, sensitivity ranking, every sample's inputs) or
// null. Infinite allowances (no compression) are written as null with limited_by_compression false.
std::string allowance_json(const CaseSpec& spec, const AllowanceReport& report);

// allowance.csv: `#` comment lines (caution, units, meaning of the columns), a header, one row per
// scenario and movement: nominal allowances and band percentiles in the case's force unit, the
// common-practice range beside them. "unbounded" where compression does not limit the movement;
// empty band columns when the band was not computed.
std::string allowance_csv(const CaseSpec& spec, const AllowanceReport& report);

// The summary.txt paragraph: per bone level and movement, in words, the conservative allowance
// (the band's 10th percentile; the nominal allowance when the band was not computed, said so), in
// the case's force unit, against the upper limit and capillary pressure, beside the common-practice
// range; the input that moves the allowance most; and the caution. Lines wrapped at `width`.
std::string allowance_summary_text(const CaseSpec& spec, const AllowanceReport& report,
                                   size_t width = 96);

}  // namespace sharpey::analysis
