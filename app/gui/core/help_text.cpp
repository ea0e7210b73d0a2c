#include "core/help_text.h"

#include "sharpey/output/report_output.h"

namespace sharpey::app {

namespace {
struct Entry {
  const char* term;
  const char* words;
};

// Our own wording; each paragraph says what the number is, where it is taken and how to read it.
const Entry kEntries[] = {
    {"hydrostatic pressure",
     "The average squeeze on a small piece of ligament from all sides, in kilopascals (kPa). The "
     "app "
     "counts squeezing (compression) as positive and pulling apart (tension) as negative. "
     "Compression "
     "in the ligament can narrow its blood vessels, which is why it is compared with the "
     "thresholds "
     "below."},
    {"principal strain",
     "How much a small piece of ligament is stretched along the direction in which it stretches "
     "most, as a percentage of its length. 1 % means a 0.2 mm wide ligament is 2 micrometres wider "
     "there."},
    {"von Mises stress",
     "A single number for how much a piece of ligament is being distorted (sheared) rather than "
     "squeezed evenly, in kPa. It is high where the ligament is twisted or sheared, even where the "
     "pressure is low."},
    {"equivalent force",
     "For a tooth with bone loss: the force on the healthy tooth of the same case, in the same "
     "direction and with the same moment-to-force ratio, that gives the same peak compression. "
     "A lower equivalent force than the force applied means the reduced support feels the force "
     "more strongly."},
    {"area rule",
     "A second, simpler equivalent force: the force applied, scaled by how much root surface is "
     "still attached compared with the healthy tooth. It ignores where the support was lost, so it "
     "is a rough guide only."},
    {"95th percentile",
     "The compression that is exceeded on only 5 % of the attached root surface. Unlike the peak, "
     "it does not depend on a single point of the model, so it changes little when the mesh is "
     "refined."},
    {"CRes",
     "Centre of resistance: the point on the long axis where a force moves the tooth bodily, "
     "without "
     "tipping. It is given as a distance below the bone crest and as a share of the root held in "
     "bone; it moves toward the apex as bone is lost."},
    {"CRot",
     "Centre of rotation: the point about which the tooth turns under the force system applied. "
     "Far away means the tooth moves almost bodily; at the CRes would mean pure rotation."},
    {"M/F",
     "Moment-to-force ratio, in millimetres: the couple applied at the bracket divided by the "
     "force. "
     "The ratio needed for a bodily movement is shown beside the one applied; less gives tipping, "
     "more moves the root ahead of the crown."},
    {"crest edge band",
     "The strip of ligament just below the bone crest, one ligament width deep. Where the free "
     "edge "
     "of the ligament meets root and bone, an elastic model gives values that keep rising as the "
     "mesh gets finer, so the key numbers and the colour bar's ends leave this strip out. The 3D "
     "view marks it with a violet line; its own range is written under the colour bar."},
};
}  // namespace

QStringList help_terms() {
  QStringList out;
  for (const Entry& e : kEntries) out << QString::fromLatin1(e.term);
  return out;
}

QString help_html(const analysis::Thresholds& t) {
  QString html = QStringLiteral("<h2>What the numbers mean</h2>");
  for (const Entry& e : kEntries)
    html += QStringLiteral("<p><b>%1</b>: %2</p>")
                .arg(QString::fromLatin1(e.term), QString::fromLatin1(e.words));
  html += QStringLiteral(
              "<h3>The two thresholds</h3><p><b>Capillary pressure</b> (%1 kPa in this case): "
              "about the "
              "blood pressure in the smallest vessels of the ligament; compression above it may "
              "close them "
              "locally. Where the figure comes from: %2.</p><p><b>Physiological limit</b> (%3 kPa "
              "in this "
              "case): the compression above which the case takes the ligament to be at risk of "
              "damage. Where the "
              "figure comes from: %4.</p><p>The reading for each bone level names the threshold "
              "passed and "
              "the root area above it, e.g. \"above the 16.0 kPa physiological limit over 4.2 "
              "mm\u00b2\".</p>")
              .arg(QString::number(t.capillary.value_kpa, 'f', 1),
                   QString::fromStdString(t.capillary.source).toHtmlEscaped(),
                   QString::number(t.limit.value_kpa, 'f', 1),
                   QString::fromStdString(t.limit.source).toHtmlEscaped());
  html += QStringLiteral("<p><i>%1</i></p>")
              .arg(QString::fromStdString(analysis::caution_text()).toHtmlEscaped());
  return html;
}

}  // namespace sharpey::app
