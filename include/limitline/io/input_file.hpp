#pragma once
// Reading an input file the user named: refused by what it is (a folder, a device, a missing
// file, one too large for its purpose) before a byte is parsed, so that `/dev/zero` or a
// folder never reads as empty or until memory runs out.
#include <cstdint>
#include <filesystem>
#include <functional>
#include <string>
#include <string_view>

namespace limitline {

// A path written in a file the user named (a unit file's weather or loads file): relative to
// that file's folder, as a reader of the file expects; an absolute path as written.
[[nodiscard]] std::filesystem::path path_beside(const std::filesystem::path& file,
                                                const std::filesystem::path& written);

// The whole content of `path`. `what` names the file in messages ("the weather file"); a
// regular file larger than `max_bytes`, or a pipe delivering more, is an InputError that says
// so. Pipes and standard input ("/dev/stdin", process substitution) are read up to the cap;
// folders, devices, sockets and missing files are refused with what they are.
[[nodiscard]] std::string read_input_file(const std::filesystem::path& path, std::string_view what,
                                          std::uintmax_t max_bytes);

// The same content, checks and cap, handed to `piece` in order as it is read, for a reader that
// keeps less than the whole text (the trend log).
void read_input_pieces(const std::filesystem::path& path, std::string_view what,
                       std::uintmax_t max_bytes,
                       const std::function<void(std::string_view)>& piece);

// The same checks without reading, for a reader that streams (`state --batch`).
void check_input_file(const std::filesystem::path& path, std::string_view what);

}  // namespace limitline
