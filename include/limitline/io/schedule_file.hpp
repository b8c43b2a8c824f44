#pragma once
// The unit file's [schedule] table, read into a Schedule.
#include <limitline/io/raw_table.hpp>
#include <limitline/model/schedule.hpp>

#include <string_view>

namespace limitline {

// Reads [schedule]: occupied = "always", or day keys (mon … sun, ranges such as "mon-fri",
// "sat-sun") with "HH:MM-HH:MM" periods (several separated by commas; "off" for none), plus
// first_weekday = "monday" … "sunday" and holidays = ["01-01", "12-25"]. Errors name the file,
// line and key.
Schedule read_schedule(const RawTable& table, std::string_view file_name);

}  // namespace limitline
