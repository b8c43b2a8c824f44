// Measuring how deep a TOML document nests, without recursion, before it is parsed.
#include <limitline/io/toml_depth.hpp>

#include <limitline/error.hpp>

#include <fmt/format.h>

#include <cstdint>
#include <vector>

namespace limitline {
namespace {

class DepthScan {
 public:
  DepthScan(std::string_view text, std::string_view name) : text_(text), name_(name) {}

  void run() {
    while (i_ < text_.size()) {
      const char c = text_[i_];
      if (c == '\n') {
        ++line_;
        // Outside brackets a line ends its key-value pair.
        if (open_.empty()) key_ = true, parts_ = 1, line_start_ = true;
        ++i_;
      } else if (c == ' ' || c == '\t' || c == '\r') {
        ++i_;
      } else if (c == '#') {
        while (i_ < text_.size() && text_[i_] != '\n') ++i_;
      } else if (c == '"' || c == '\'') {
        skip_string();
        line_start_ = false;
      } else if (line_start_ && open_.empty() && c == '[') {
        header();
      } else {
        line_start_ = false;
        key_ ? key_char(c) : value_char(c);
        ++i_;
      }
    }
  }

 private:
  struct Open {
    char kind;  // '[' array or '{' inline table
    int saved;  // the depth of the value it is part of, restored when it closes
    int depth;  // the depth of what it holds
  };

  void check(int depth) const {
    if (depth > kMaxTomlDepth)
      throw InputError(
          fmt::format("{}:{}: TOML nested more than {} levels deep (tables, dotted "
                      "keys, inline tables and arrays together); no unit file or "
                      "code table needs that many",
                      name_, line_, kMaxTomlDepth));
  }

  int base() const { return open_.empty() ? header_ : open_.back().depth; }

  // [a.b.c] or [[a.b.c]]: its parts are the depth of the keys below it.
  void header() {
    ++i_;
    int parts = 1;
    while (i_ < text_.size() && text_[i_] != ']' && text_[i_] != '\n') {
      const char c = text_[i_];
      if (c == '"' || c == '\'') {
        skip_string();
        continue;
      }
      if (c == '.') check(++parts);
      ++i_;
    }
    while (i_ < text_.size() && text_[i_] == ']') ++i_;
    header_ = parts;
    key_ = true, parts_ = 1, line_start_ = false;
  }

  void key_char(char c) {
    if (c == '.') {
      check(base() + ++parts_);
    } else if (c == '=') {
      key_ = false;
      value_ = base() + parts_;
      check(value_);
    } else if (c == '}' && !open_.empty()) {  // an empty inline table, or a trailing comma
      close();
    }
  }

  void value_char(char c) {
    switch (c) {
      case '[':
      case '{':
        open_.push_back({c, value_, value_ + 1});
        check(value_ + 1);
        if (c == '[')
          value_ = value_ + 1;
        else
          key_ = true, parts_ = 1;
        break;
      case ']':
      case '}':
        if (!open_.empty()) close();
        break;
      case ',':
        if (open_.empty()) break;
        if (open_.back().kind == '{')
          key_ = true, parts_ = 1;
        else
          value_ = open_.back().depth;
        break;
      default: break;
    }
  }

  void close() {
    value_ = open_.back().saved;
    open_.pop_back();
    key_ = false;
  }

  // "basic", 'literal', """multi-line""" and '''multi-line''': skipped whole, escapes in the
  // basic forms honoured, lines counted. An unterminated string runs to the end.
  void skip_string() {
    const char q = text_[i_];
    const bool triple = text_.substr(i_, 3) == std::string(3, q);
    i_ += triple ? 3 : 1;
    while (i_ < text_.size()) {
      const char c = text_[i_];
      if (c == '\\' && q == '"') {
        i_ += 2;
        continue;
      }
      if (c == '\n') {
        ++line_;
        if (!triple) return;  // a one-line string cannot continue: the parser will say so
      }
      if (c == q && (!triple || text_.substr(i_, 3) == std::string(3, q))) {
        i_ += triple ? 3 : 1;
        return;
      }
      ++i_;
    }
  }

  std::string_view text_, name_;
  std::size_t i_ = 0;
  std::uint32_t line_ = 1;
  std::vector<Open> open_;
  int header_ = 0;   // parts of the current [table] header
  int value_ = 0;    // depth of the value being read
  int parts_ = 1;    // parts of the key being read
  bool key_ = true;  // reading a key, not a value
  bool line_start_ = true;
};

}  // namespace

void check_toml_depth(std::string_view text, std::string_view name) { DepthScan(text, name).run(); }

}  // namespace limitline
