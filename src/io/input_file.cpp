#include <limitline/io/input_file.hpp>

#include <limitline/error.hpp>

#include <fmt/format.h>

#include <cerrno>
#include <cstring>
#include <fstream>

namespace limitline {
namespace {

namespace fs = std::filesystem;

std::string size_words(std::uintmax_t bytes) {
  if (bytes >= (std::uintmax_t{1} << 20)) return fmt::format("{:.0f} MiB", bytes / 1048576.0);
  if (bytes >= 1024) return fmt::format("{:.0f} KiB", bytes / 1024.0);
  return fmt::format("{} bytes", bytes);
}

// The path as the start of a message: as written, unless it holds characters a terminal
// would act on.
std::string origin(const fs::path& path) {
  const std::string p = path.string();
  for (unsigned char c : p)
    if (c < 0x20 || c == 0x7f) return echo(p);
  return p;
}

// The file's type, refused unless it can be read as text: a regular file or a pipe.
fs::file_status checked_status(const fs::path& path, std::string_view what) {
  const std::string name = origin(path);
  std::error_code ec;
  const fs::file_status st = fs::status(path, ec);
  if (ec || st.type() == fs::file_type::not_found) {
    std::error_code lec;
    if (fs::is_symlink(fs::symlink_status(path, lec)))
      throw InputError(fmt::format("{}: cannot open {}: it is a link to a file that does not exist",
                                   name, what));
    throw InputError(fmt::format("{}: cannot open {} ({})", name, what,
                                 ec ? ec.message() : std::strerror(ENOENT)));
  }
  switch (st.type()) {
    case fs::file_type::regular:
    case fs::file_type::fifo: return st;
    case fs::file_type::directory:
      throw InputError(fmt::format("{}: {} is a folder; allowed: a file", name, what));
    case fs::file_type::character:
    case fs::file_type::block:
      throw InputError(fmt::format("{}: {} is a device, not a file; allowed: a file", name, what));
    default:
      throw InputError(fmt::format("{}: {} is not a regular file; allowed: a file", name, what));
  }
}

}  // namespace

fs::path path_beside(const fs::path& file, const fs::path& written) {
  return written.is_relative() ? file.parent_path() / written : written;
}

void check_input_file(const fs::path& path, std::string_view what) {
  (void)checked_status(path, what);
}

void read_input_pieces(const fs::path& path, std::string_view what, std::uintmax_t max_bytes,
                       const std::function<void(std::string_view)>& piece) {
  const fs::file_status st = checked_status(path, what);
  const std::string name = origin(path);
  const auto too_large = [&](std::uintmax_t size, bool at_least) {
    return InputError(fmt::format("{}: {} is {}{}; allowed: at most {}", name, what,
                                  at_least ? "more than " : "", size_words(size),
                                  size_words(max_bytes)));
  };
  if (st.type() == fs::file_type::regular) {
    std::error_code ec;
    const std::uintmax_t size = fs::file_size(path, ec);
    if (!ec && size > max_bytes) throw too_large(size, false);
  }
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw InputError(fmt::format("{}: cannot open {} ({})", name, what, std::strerror(errno)));
  std::uintmax_t total = 0;
  char buffer[1 << 16];
  // A pipe has no size to check first, and a regular file may grow while read: cap as we go.
  while (in.read(buffer, sizeof buffer) || in.gcount() > 0) {
    const auto n = static_cast<std::size_t>(in.gcount());
    total += n;
    if (total > max_bytes) throw too_large(max_bytes, true);
    piece(std::string_view(buffer, n));
  }
  if (in.bad())
    throw InputError(fmt::format("{}: cannot read {} ({})", name, what, std::strerror(errno)));
}

std::string read_input_file(const fs::path& path, std::string_view what, std::uintmax_t max_bytes) {
  std::string text;
  read_input_pieces(path, what, max_bytes, [&](std::string_view p) { text.append(p); });
  return text;
}

}  // namespace limitline
