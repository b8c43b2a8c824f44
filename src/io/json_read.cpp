#include <limitline/error.hpp>
#include <limitline/io/json_read.hpp>

#include <fmt/format.h>

#include <charconv>
#include <cmath>

namespace limitline::json {
namespace {

constexpr int kMaxDepth = 64;

class Parser {
 public:
  Parser(std::string_view text, std::string_view where) : s_(text), where_(where) {}

  Value document() {
    Value v = value(0);
    skip_space();
    if (i_ != s_.size()) fail("unexpected text after the value");
    return v;
  }

 private:
  [[noreturn]] void fail(std::string_view what) const {
    throw InputError(fmt::format("{}: column {}: {}; allowed: JSON", where_, i_ + 1, what));
  }
  void skip_space() {
    while (i_ < s_.size() && (s_[i_] == ' ' || s_[i_] == '\t' || s_[i_] == '\n' || s_[i_] == '\r'))
      ++i_;
  }
  bool take(char c) {
    skip_space();
    if (i_ < s_.size() && s_[i_] == c) {
      ++i_;
      return true;
    }
    return false;
  }
  void expect(char c) {
    if (!take(c)) fail(fmt::format("expected '{}'", c));
  }
  bool word(std::string_view w) {
    if (s_.substr(i_, w.size()) != w) return false;
    i_ += w.size();
    return true;
  }

  Value value(int depth) {
    if (depth > kMaxDepth) fail("nested too deeply");
    skip_space();
    if (i_ >= s_.size()) fail("unexpected end");
    const char c = s_[i_];
    if (c == '{') return Value{object(depth)};
    if (c == '[') return Value{array(depth)};
    if (c == '"') return Value{string()};
    if (word("true")) return Value{true};
    if (word("false")) return Value{false};
    if (word("null")) return Value{nullptr};
    return Value{number()};
  }

  Object object(int depth) {
    Object o;
    expect('{');
    if (take('}')) return o;
    do {
      skip_space();
      if (i_ >= s_.size() || s_[i_] != '"') fail("expected a member name");
      std::string k = string();
      expect(':');
      Value v = value(depth + 1);
      if (!o.emplace(std::move(k), std::move(v)).second) fail("a member name is repeated");
    } while (take(','));
    expect('}');
    return o;
  }

  Array array(int depth) {
    Array a;
    expect('[');
    if (take(']')) return a;
    do a.push_back(value(depth + 1));
    while (take(','));
    expect(']');
    return a;
  }

  unsigned hex4() {
    if (i_ + 4 > s_.size()) fail("a \\u escape is cut short");
    unsigned v = 0;
    const auto r = std::from_chars(s_.data() + i_, s_.data() + i_ + 4, v, 16);
    if (r.ptr != s_.data() + i_ + 4) fail("a \\u escape needs four hex digits");
    i_ += 4;
    return v;
  }

  static void append_utf8(std::string& out, unsigned cp) {
    if (cp < 0x80) {
      out += static_cast<char>(cp);
    } else if (cp < 0x800) {
      out += static_cast<char>(0xC0 | (cp >> 6));
      out += static_cast<char>(0x80 | (cp & 0x3F));
    } else if (cp < 0x10000) {
      out += static_cast<char>(0xE0 | (cp >> 12));
      out += static_cast<char>(0x80 | ((cp >> 6) & 0x3F));
      out += static_cast<char>(0x80 | (cp & 0x3F));
    } else {
      out += static_cast<char>(0xF0 | (cp >> 18));
      out += static_cast<char>(0x80 | ((cp >> 12) & 0x3F));
      out += static_cast<char>(0x80 | ((cp >> 6) & 0x3F));
      out += static_cast<char>(0x80 | (cp & 0x3F));
    }
  }

  std::string string() {
    ++i_;  // the opening quote
    std::string out;
    for (;;) {
      if (i_ >= s_.size()) fail("a string is not closed");
      const char c = s_[i_++];
      if (c == '"') return out;
      if (static_cast<unsigned char>(c) < 0x20) fail("a control character inside a string");
      if (c != '\\') {
        out += c;
        continue;
      }
      if (i_ >= s_.size()) fail("a string is not closed");
      const char e = s_[i_++];
      switch (e) {
        case '"': out += '"'; break;
        case '\\': out += '\\'; break;
        case '/': out += '/'; break;
        case 'b': out += '\b'; break;
        case 'f': out += '\f'; break;
        case 'n': out += '\n'; break;
        case 'r': out += '\r'; break;
        case 't': out += '\t'; break;
        case 'u': {
          unsigned cp = hex4();
          if (cp >= 0xD800 && cp < 0xDC00) {
            if (!word("\\u")) fail("a lone high surrogate");
            const unsigned lo = hex4();
            if (lo < 0xDC00 || lo >= 0xE000) fail("a high surrogate without its low half");
            cp = 0x10000 + ((cp - 0xD800) << 10) + (lo - 0xDC00);
          } else if (cp >= 0xDC00 && cp < 0xE000) {
            fail("a lone low surrogate");
          }
          append_utf8(out, cp);
          break;
        }
        default: fail("an unknown escape");
      }
    }
  }

  double number() {
    const std::size_t start = i_;
    if (i_ < s_.size() && s_[i_] == '-') ++i_;
    while (i_ < s_.size() && ((s_[i_] >= '0' && s_[i_] <= '9') || s_[i_] == '.' || s_[i_] == 'e' ||
                              s_[i_] == 'E' || s_[i_] == '+' || s_[i_] == '-'))
      ++i_;
    double v = 0;
    const auto r = std::from_chars(s_.data() + start, s_.data() + i_, v);
    if (start == i_ || r.ec != std::errc() || r.ptr != s_.data() + i_ || !std::isfinite(v)) {
      i_ = start;
      fail("expected a value");
    }
    return v;
  }

  std::string_view s_;
  std::string_view where_;
  std::size_t i_ = 0;
};

[[noreturn]] void wrong(std::string_view where, std::string_view key, std::string_view kind) {
  throw InputError(fmt::format("{}: {}: expected {}", where, key, kind));
}

}  // namespace

double Value::number(std::string_view where, std::string_view key) const {
  if (const double* d = std::get_if<double>(&v)) return *d;
  wrong(where, key, "a number");
}
bool Value::boolean(std::string_view where, std::string_view key) const {
  if (const bool* b = std::get_if<bool>(&v)) return *b;
  wrong(where, key, "true or false");
}
const std::string& Value::string(std::string_view where, std::string_view key) const {
  if (const std::string* s = std::get_if<std::string>(&v)) return *s;
  wrong(where, key, "a string");
}
const Array& Value::array(std::string_view where, std::string_view key) const {
  if (const Array* a = std::get_if<Array>(&v)) return *a;
  wrong(where, key, "an array");
}
const Object& Value::object(std::string_view where, std::string_view key) const {
  if (const Object* o = std::get_if<Object>(&v)) return *o;
  wrong(where, key, "an object");
}

const Value* find(const Object& o, std::string_view key) {
  const auto it = o.find(key);
  return it == o.end() ? nullptr : &it->second;
}

const Value& member(const Object& o, std::string_view key, std::string_view where) {
  if (const Value* v = find(o, key)) return *v;
  throw InputError(fmt::format("{}: {}: missing", where, key));
}

Value parse(std::string_view text, std::string_view where) {
  return Parser(text, where).document();
}

}  // namespace limitline::json
