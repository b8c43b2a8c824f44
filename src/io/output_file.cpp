#include <limitline/io/output_file.hpp>

#include <limitline/error.hpp>

#include <fmt/format.h>

#include <fcntl.h>
#include <sys/stat.h>
#include <unistd.h>

#include <atomic>
#include <csignal>
#include <cerrno>
#include <climits>
#include <cstdio>
#include <cstring>
#include <streambuf>

namespace limitline {
namespace {

namespace fs = std::filesystem;

// Temporary files not yet committed, for a signal handler to remove. Fixed slots of plain
// characters: the handler may read them at any moment and must not allocate or lock.
struct PendingSlot {
  std::atomic<bool> taken{false};
  std::atomic<bool> armed{false};
  char path[PATH_MAX];
};
constexpr int kSlots = 16;  // a command writes at most a few files at once
PendingSlot g_pending[kSlots];

extern "C" void remove_pending_and_exit(int sig) {
  remove_pending_outputs();
  _exit(128 + sig);
}

// Ctrl-C, SIGTERM and SIGHUP would end the process and leave the temporary file: where
// nothing else handles them, they now remove it first (exit 128 + signal, as the shell
// reports a killed command). A command's own handler (sensors, year --batch) is left alone.
void remove_pending_on_signals() {
  static std::atomic<bool> installed{false};
  if (installed.exchange(true)) return;
  for (int sig : {SIGINT, SIGTERM, SIGHUP}) {
    struct sigaction old {};
    if (sigaction(sig, nullptr, &old) != 0 || old.sa_handler != SIG_DFL) continue;
    struct sigaction sa {};
    sa.sa_handler = remove_pending_and_exit;
    sigemptyset(&sa.sa_mask);
    sigaction(sig, &sa, nullptr);
  }
}

int register_pending(const std::string& path) {
  remove_pending_on_signals();
  if (path.size() >= PATH_MAX) return -1;
  for (int i = 0; i < kSlots; ++i) {
    bool expected = false;
    if (!g_pending[i].taken.compare_exchange_strong(expected, true)) continue;
    std::memcpy(g_pending[i].path, path.c_str(), path.size() + 1);
    g_pending[i].armed = true;
    return i;
  }
  return -1;
}

void release_pending(int slot) {
  if (slot < 0) return;
  g_pending[slot].armed = false;
  g_pending[slot].taken = false;
}

std::string reason(int error_number) { return std::strerror(error_number); }

// The path as messages name it: whole, so the file name is seen, unless it holds characters
// a terminal would act on.
std::string named(const fs::path& p) {
  const std::string s = p.string();
  for (unsigned char c : s)
    if (c < 0x20 || c == 0x7f) return echo(s);
  return "'" + s + "'";
}

// A link is followed to the file it names, so the link stays a link and the file behind it
// is the one replaced.
fs::path resolve_links(fs::path p) {
  std::error_code ec;
  for (int hops = 0; hops < 40 && fs::is_symlink(fs::symlink_status(p, ec)); ++hops) {
    const fs::path to = fs::read_symlink(p, ec);
    if (ec) break;
    p = to.is_absolute() ? to : p.parent_path() / to;
  }
  return p;
}

// The descriptor among standard output and error that is this very file, or -1: writing
// "/dev/stdout" (or the file it was redirected to) goes through the descriptor, never
// replaces the file the shell opened.
int standard_descriptor_for(const struct stat& st) {
  for (int fd : {STDOUT_FILENO, STDERR_FILENO}) {
    struct stat s {};
    if (fstat(fd, &s) == 0 && s.st_dev == st.st_dev && s.st_ino == st.st_ino) return fd;
  }
  return -1;
}

mode_t new_file_mode() {
  const mode_t mask = umask(0);
  umask(mask);
  return 0666 & ~mask;
}

}  // namespace

// Bytes gathered and written with write(2), keeping the first error's errno for the message.
class OutputFile::Buffer : public std::streambuf {
 public:
  explicit Buffer(int fd) : fd_(fd), data_(1 << 16) {
    setp(data_.data(), data_.data() + data_.size());
  }
  int error() const { return error_; }

  bool drain() {
    const char* p = pbase();
    std::size_t left = static_cast<std::size_t>(pptr() - pbase());
    while (left > 0 && error_ == 0) {
      const ssize_t n = ::write(fd_, p, left);
      if (n < 0) {
        if (errno == EINTR) continue;
        error_ = errno;
        break;
      }
      p += n;
      left -= static_cast<std::size_t>(n);
    }
    setp(data_.data(), data_.data() + data_.size());
    return error_ == 0;
  }

 protected:
  int_type overflow(int_type ch) override {
    if (!drain()) return traits_type::eof();
    if (!traits_type::eq_int_type(ch, traits_type::eof())) sputc(traits_type::to_char_type(ch));
    return traits_type::not_eof(ch);
  }
  int sync() override { return drain() ? 0 : -1; }

 private:
  int fd_;
  int error_ = 0;
  std::vector<char> data_;
};

OutputFile::OutputFile(const fs::path& target, std::string option)
    : target_(target), option_(std::move(option)) {
  if (target_ == "-") {
    std::fflush(stdout);
    fd_ = STDOUT_FILENO;
  } else {
    const fs::path real = resolve_links(target_);
    struct stat st {};
    const bool exists = ::stat(real.c_str(), &st) == 0;
    if (exists && S_ISDIR(st.st_mode))
      throw InputError(
          fmt::format("{}: {} is a folder; give a file name", option_, named(target_)));
    const int standard = exists ? standard_descriptor_for(st) : -1;
    if (standard >= 0) {
      std::fflush(standard == STDOUT_FILENO ? stdout : stderr);
      fd_ = standard;
    } else if (exists && !S_ISREG(st.st_mode)) {
      // A device or a pipe: written in place, it cannot be half-replaced.
      fd_ = ::open(real.c_str(), O_WRONLY | O_CLOEXEC);
      if (fd_ < 0)
        throw InputError(
            fmt::format("{}: cannot write {}: {}", option_, named(target_), reason(errno)));
      owns_fd_ = true;
    } else {
      // Renaming would replace a file the user may not write; refuse as opening it would.
      if (exists && ::access(real.c_str(), W_OK) != 0)
        throw InputError(
            fmt::format("{}: cannot write {}: {}", option_, named(target_), reason(errno)));
      const fs::path dir = real.parent_path().empty() ? fs::path(".") : real.parent_path();
      std::string pattern = (dir / ("." + real.filename().string() + ".limitline-XXXXXX")).string();
      fd_ = ::mkostemp(pattern.data(), O_CLOEXEC);
      if (fd_ < 0)
        throw InputError(
            fmt::format("{}: cannot write {}: {}", option_, named(target_), reason(errno)));
      owns_fd_ = true;
      temp_ = pattern;
      slot_ = register_pending(pattern);
      // The replacement keeps the target's permissions; a new file gets the usual ones.
      ::fchmod(fd_, exists ? (st.st_mode & 07777) : new_file_mode());
      target_ = real;
    }
  }
  buffer_ = std::make_unique<Buffer>(fd_);
  stream_ = std::make_unique<std::ostream>(buffer_.get());
}

OutputFile::~OutputFile() {
  if (owns_fd_) ::close(fd_);
  if (!temp_.empty()) ::unlink(temp_.c_str());
  release_pending(slot_);
}

std::ostream& OutputFile::stream() { return *stream_; }

void OutputFile::write(std::string_view text) {
  stream_->write(text.data(), static_cast<std::streamsize>(text.size()));
}

void OutputFile::fail(int error_number) {
  if (owns_fd_) ::close(fd_);
  owns_fd_ = false;
  if (!temp_.empty()) ::unlink(temp_.c_str());
  temp_.clear();
  release_pending(slot_);
  slot_ = -1;
  const std::string what = fmt::format(
      "cannot write {}: {}", target_ == "-" ? std::string("to standard output") : named(target_),
      reason(error_number));
  throw InputError(option_.empty() ? what : fmt::format("{}: {}", option_, what));
}

void OutputFile::commit() {
  stream_->flush();
  if (buffer_->error()) fail(buffer_->error());
  if (!stream_->good()) fail(EIO);
  if (temp_.empty()) {
    if (owns_fd_ && ::close(fd_) != 0) {
      owns_fd_ = false;
      fail(errno);
    }
    owns_fd_ = false;
    return;
  }
  // Delayed allocation can report a full disk only at sync or close.
  if (::fsync(fd_) != 0) fail(errno);
  const int closed = ::close(fd_);
  owns_fd_ = false;
  if (closed != 0) fail(errno);
  if (::rename(temp_.c_str(), target_.c_str()) != 0) fail(errno);
  temp_.clear();
  release_pending(slot_);
  slot_ = -1;
}

void write_output_file(const fs::path& target, std::string_view text, std::string option) {
  OutputFile f(target, std::move(option));
  f.write(text);
  f.commit();
}

void refuse_input_as_output(const fs::path& output, std::string_view option,
                            const std::vector<fs::path>& inputs) {
  if (output == "-") return;
  for (const fs::path& in : inputs) {
    std::error_code ec;
    if (!in.empty() && fs::equivalent(output, in, ec) && !ec)
      throw InputError(
          fmt::format("{}: {} is also an input ({}); writing it would destroy the "
                      "input: give another file name",
                      option, named(output), named(in)));
  }
}

void remove_pending_outputs() noexcept {
  for (auto& slot : g_pending)
    if (slot.armed.load()) ::unlink(slot.path);
}

}  // namespace limitline
