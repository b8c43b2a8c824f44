#pragma once
// Splitting delimited text lines (RFC 4180 quoting: "a, b" and doubled quotes "").
#include <string>
#include <string_view>
#include <vector>

namespace limitline::csv {

// Splits one line on `delimiter`, honouring double quotes; trims spaces around unquoted
// fields. A trailing carriage return is ignored.
std::vector<std::string> split_line(std::string_view line, char delimiter = ',');

// The delimiter a header line most plausibly uses: ',', ';' or tab (most occurrences outside
// quotes; ',' on a tie).
char guess_delimiter(std::string_view header_line);

}  // namespace limitline::csv
