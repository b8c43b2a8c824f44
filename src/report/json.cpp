#include <limitline/report/json.hpp>

#include <fmt/format.h>

#include <cmath>
#include <stdexcept>

namespace limitline::report {

std::string json_escape(std::string_view s) {
  std::string out;
  out.reserve(s.size() + 2);
  for (unsigned char c : s) {
    switch (c) {
      case '"': out += "\\\""; break;
      case '\\': out += "\\\\"; break;
      case '\n': out += "\\n"; break;
      case '\r': out += "\\r"; break;
      case '\t': out += "\\t"; break;
      default:
        if (c < 0x20)
          out += fmt::format("\\u{:04x}", c);
        else
          out += static_cast<char>(c);
    }
  }
  return out;
}

void Json::newline() {
  if (indent_ <= 0) return;
  out_ += '\n';
  out_.append(first_.size() * static_cast<std::size_t>(indent_), ' ');
}

void Json::before_value() {
  if (after_key_) {
    after_key_ = false;
    return;
  }
  if (!first_.empty()) {
    if (!first_.back()) out_ += ',';
    first_.back() = false;
    newline();
  }
}

Json& Json::begin_object() {
  before_value();
  out_ += '{';
  first_.push_back(true);
  return *this;
}

Json& Json::end_object() {
  const bool empty = first_.back();
  first_.pop_back();
  if (!empty) newline();
  out_ += '}';
  if (first_.empty()) out_ += '\n';
  return *this;
}

Json& Json::begin_array() {
  before_value();
  out_ += '[';
  first_.push_back(true);
  return *this;
}

Json& Json::end_array() {
  const bool empty = first_.back();
  first_.pop_back();
  if (!empty) newline();
  out_ += ']';
  if (first_.empty()) out_ += '\n';
  return *this;
}

Json& Json::key(std::string_view k) {
  before_value();
  out_ += '"';
  out_ += json_escape(k);
  out_ += indent_ > 0 ? "\": " : "\":";
  after_key_ = true;
  return *this;
}

Json& Json::value(std::string_view s) {
  before_value();
  out_ += '"';
  out_ += json_escape(s);
  out_ += '"';
  return *this;
}

Json& Json::value(double v, int significant) {
  if (!std::isfinite(v)) throw std::logic_error("report::Json: non-finite number");
  before_value();
  if (v == 0.0) v = 0.0;  // no "-0"
  out_ += fmt::format("{:.{}g}", v, significant);
  return *this;
}

Json& Json::strings(std::string_view k, std::span<const std::string> values) {
  key(k).begin_array();
  for (const std::string& s : values) value(s);
  return end_array();
}

Json& Json::value(long long v) {
  before_value();
  out_ += fmt::format("{}", v);
  return *this;
}

Json& Json::value(bool b) {
  before_value();
  out_ += b ? "true" : "false";
  return *this;
}

Json& Json::null() {
  before_value();
  out_ += "null";
  return *this;
}

}  // namespace limitline::report
