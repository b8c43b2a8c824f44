#pragma once
// A small streaming JSON writer: objects, arrays, strings, finite numbers, booleans, null.
// Non-finite numbers are a programming error here (std::logic_error): the tool never prints
// NaN or inf, so a value that could be undefined must be written as null by the caller.
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace limitline::report {

class Json {
 public:
  explicit Json(int indent = 2) : indent_(indent) {}

  Json& begin_object();
  Json& end_object();
  Json& begin_array();
  Json& end_array();
  Json& key(std::string_view k);

  Json& value(std::string_view s);
  Json& value(const char* s) { return value(std::string_view(s)); }
  Json& value(const std::string& s) { return value(std::string_view(s)); }
  Json& value(double v, int significant = 10);
  Json& value(int v) { return value(static_cast<long long>(v)); }
  Json& value(long long v);
  Json& value(std::size_t v) { return value(static_cast<long long>(v)); }
  Json& value(bool b);
  Json& null();

  // key + value in one call.
  template <class T>
  Json& field(std::string_view k, const T& v) {
    key(k);
    return value(v);
  }
  Json& field(std::string_view k, double v, int significant) {
    key(k);
    return value(v, significant);
  }
  // key + an array of strings.
  Json& strings(std::string_view k, std::span<const std::string> values);

  // The document so far, with a final newline once the outermost value is closed.
  const std::string& str() const { return out_; }

 private:
  void before_value();
  void newline();
  std::string out_;
  std::vector<bool> first_;  // per open container: no element written yet
  bool after_key_ = false;
  int indent_;
};

std::string json_escape(std::string_view s);

}  // namespace limitline::report
