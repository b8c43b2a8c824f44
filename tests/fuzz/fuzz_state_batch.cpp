// libFuzzer target: `state --batch` (write_state_batch) on an arbitrary CSV, in both unit
// systems. No output cell is NaN or infinite.
#include <limitline/error.hpp>
#include <limitline/app/state_batch.hpp>

#include "support.hpp"

#include <sstream>
#include <string>

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string input(limitline::fuzz::text(data, size));
  for (const auto system : {limitline::units::System::ip, limitline::units::System::si}) {
    std::istringstream in(input);
    std::ostringstream out;
    limitline::StateBatchOptions options;
    options.system = system;
    options.origin = "fuzz.csv";
    try {
      (void)limitline::write_state_batch(in, out, options);
    } catch (const limitline::InputError&) {
    }
    // What was written before an error counts too.
    const std::string text = out.str();
    std::size_t start = 0;
    for (std::size_t i = 0; i <= text.size(); ++i)
      if (i == text.size() || text[i] == ',' || text[i] == '\n') {
        limitline::fuzz::require(
            !limitline::fuzz::non_finite_word(std::string_view(text).substr(start, i - start)),
            "an output cell is NaN or infinite");
        start = i + 1;
      }
  }
  return 0;
}
