#include "sharpey/analysis/study.h"

namespace sharpey::analysis {

const std::string& caution_text() {
  static const std::string text =
      "Caution: these figures are a model estimate from an idealised, linear-elastic finite-element "
      "model of one tooth, its ligament and bone; they are not a prescription. Tissue properties and "
      "anatomy vary between patients. Clinical judgement and local regulations prevail.";
  return text;
}

}  // namespace sharpey::analysis
