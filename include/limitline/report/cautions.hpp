#pragma once
// The cautions printed wherever results feed a design or an inspection (docs/model.md §Scope).
#include <string>
#include <vector>

namespace limitline::report {

enum class CautionTopic { design, code, sequence, audit, survey };

// The paragraphs for a topic, in order, as plain sentences.
std::vector<std::string> cautions(CautionTopic topic);

// The same as a block of text ("Cautions:" and one "- " line each).
std::string cautions_text(CautionTopic topic);
std::string cautions_markdown(CautionTopic topic);

}  // namespace limitline::report
