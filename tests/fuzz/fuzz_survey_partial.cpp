// libFuzzer target: a survey partial's lines (survey::parse_header, parse_record, and the JSON
// reader under them) on arbitrary text. What reads as a record is written back the same: its
// line, read again, writes the same line, and every figure is finite.
#include <limitline/app/survey.hpp>
#include <limitline/error.hpp>

#include "support.hpp"

namespace {

using limitline::fuzz::require;
using limitline::fuzz::require_finite;
namespace sv = limitline::survey;

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view line = limitline::fuzz::text(data, size);
  try {
    sv::Shard shard;
    const sv::SurveyInfo info = sv::parse_header(line, "fuzz", shard);
    require(shard.index >= 1 && shard.index <= shard.count, "a header's shard is K/N");
    const std::string again = sv::header_line(info, shard);
    sv::Shard shard2;
    require(sv::header_line(sv::parse_header(again, "fuzz", shard2), shard2) == again,
            "a header written back reads the same");
  } catch (const limitline::InputError&) {
  }
  try {
    const sv::SiteRecord r = sv::parse_record(line, "fuzz");
    require_finite(r.perfect_savings, "perfect savings");
    for (const auto& f : r.strategies) {
      require_finite(f.shortfall, "shortfall");
      require_finite(f.savings, "savings");
    }
    const std::string again = sv::record_line(r);
    require(sv::record_line(sv::parse_record(again, "fuzz")) == again,
            "a record written back reads the same");
  } catch (const limitline::InputError&) {
  }
  return 0;
}
