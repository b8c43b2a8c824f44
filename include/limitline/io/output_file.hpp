#pragma once
// A file output that is whole or absent. A regular file (or a new one) is written to a
// temporary file beside it and renamed onto it only when every byte is written and synced,
// so that a full disk, a permission error or Ctrl-C never leaves a truncated file or cuts an
// existing good one. A device, a pipe or the process's own standard output or error is
// written directly: it cannot be replaced, and `/dev/null` must stay a device.
//
// While a temporary file exists, Ctrl-C, SIGTERM and SIGHUP (when the program has no handler
// of its own for them) remove it before the process ends with exit code 128 + signal; a
// program with its own handler calls remove_pending_outputs() from it.
#include <filesystem>
#include <memory>
#include <ostream>
#include <string>
#include <string_view>
#include <vector>

namespace limitline {

class OutputFile {
 public:
  // `option` names the output in messages ("--hourly"; may be empty); "-" is standard output. A
  // folder, or a place where no file can be created, is an InputError with the system's reason.
  OutputFile(const std::filesystem::path& target, std::string option);
  // Without commit() the temporary file is removed and the target stays as it was.
  ~OutputFile();
  OutputFile(const OutputFile&) = delete;
  OutputFile& operator=(const OutputFile&) = delete;

  std::ostream& stream();
  void write(std::string_view text);
  // Flushes, syncs and renames the temporary file onto the target. A failed write at any
  // point is reported here: InputError "OPTION: cannot write 'PATH': REASON", with the
  // temporary file removed.
  void commit();

  const std::filesystem::path& target() const { return target_; }

 private:
  class Buffer;
  [[noreturn]] void fail(int error_number);

  std::filesystem::path target_;
  std::string option_;
  std::filesystem::path temp_;  // empty when written directly
  int fd_ = -1;
  bool owns_fd_ = false;
  int slot_ = -1;  // in the registry of temporary files a signal handler removes
  std::unique_ptr<Buffer> buffer_;
  std::unique_ptr<std::ostream> stream_;
};

// `text` written whole to `target` (see OutputFile).
void write_output_file(const std::filesystem::path& target, std::string_view text,
                       std::string option);

// An output that is the same file as one of `inputs` (by std::filesystem::equivalent, so
// through links and other spellings) is an InputError: writing it would destroy the input.
void refuse_input_as_output(const std::filesystem::path& output, std::string_view option,
                            const std::vector<std::filesystem::path>& inputs);

// Removes every temporary file of an OutputFile not yet committed. Async-signal-safe: for
// the handler of a signal that ends the process.
void remove_pending_outputs() noexcept;

}  // namespace limitline
