#include <limitline/report/cautions.hpp>

namespace limitline::report {
namespace {

const char* const kCommon[] = {
    "Results are engineering estimates from a simplified model of the air handler and the "
    "weather given; they are not a guarantee of performance.",
    "The adopted energy code, its local amendments and the authority having jurisdiction "
    "govern; code tables in this tool are provided as data and must be verified against the "
    "adopted edition.",
    "Ventilation minimums, freeze protection, building pressurisation and humidity control "
    "remain the designer's responsibility.",
    "Defer to licensed professional practice for any design or compliance decision.",
};

const char* const kSequence =
    "This sequence must be reviewed by the engineer of record and coordinated with the "
    "controls contractor and the adopted code before it is issued.";
const char* const kAudit =
    "Findings come from trend data whose sensors may themselves be wrong; confirm each one in "
    "the field before acting on it.";
const char* const kSurvey =
    "A survey judges every site with one air handler and the weather files given; a zone's "
    "summary is a guide for a specification or a review of a code table, not a design for any "
    "one building: study each project with its own unit, loads and weather.";

}  // namespace

std::vector<std::string> cautions(CautionTopic topic) {
  std::vector<std::string> out;
  if (topic == CautionTopic::sequence) out.emplace_back(kSequence);
  if (topic == CautionTopic::audit) out.emplace_back(kAudit);
  if (topic == CautionTopic::survey) out.emplace_back(kSurvey);
  for (const char* c : kCommon) out.emplace_back(c);
  return out;
}

std::string cautions_text(CautionTopic topic) {
  std::string out = "Cautions:\n";
  for (const auto& c : cautions(topic)) out += "  - " + c + "\n";
  return out;
}

std::string cautions_markdown(CautionTopic topic) {
  std::string out = "## Cautions\n\n";
  for (const auto& c : cautions(topic)) out += "- " + c + "\n";
  return out;
}

}  // namespace limitline::report
