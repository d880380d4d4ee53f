#include "audit/json_writer.h"

#include <charconv>
#include <cmath>

#include "corpus/json_string.h"

namespace evenhand::audit {

void JsonWriter::newline() {
  if (indent_ <= 0) return;
  out_ += '\n';
  out_.append(first_.size() * static_cast<size_t>(indent_), ' ');
}

void JsonWriter::before_value() {
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

JsonWriter& JsonWriter::begin_object() {
  before_value();
  out_ += '{';
  first_.push_back(true);
  return *this;
}

JsonWriter& JsonWriter::end_object() {
  bool empty = first_.back();
  first_.pop_back();
  if (!empty) newline();
  out_ += '}';
  return *this;
}

JsonWriter& JsonWriter::begin_array() {
  before_value();
  out_ += '[';
  first_.push_back(true);
  return *this;
}

JsonWriter& JsonWriter::end_array() {
  bool empty = first_.back();
  first_.pop_back();
  if (!empty) newline();
  out_ += ']';
  return *this;
}

JsonWriter& JsonWriter::key(std::string_view k) {
  before_value();
  out_ += '"';
  corpus::append_json_escaped(k, out_);
  out_ += indent_ > 0 ? "\": " : "\":";
  after_key_ = true;
  return *this;
}

JsonWriter& JsonWriter::value(std::string_view s) {
  before_value();
  out_ += '"';
  corpus::append_json_escaped(s, out_);
  out_ += '"';
  return *this;
}

JsonWriter& JsonWriter::value(uint64_t n) {
  before_value();
  char buf[24];
  auto r = std::to_chars(buf, buf + sizeof buf, n);
  out_.append(buf, r.ptr);
  return *this;
}

JsonWriter& JsonWriter::value(int64_t n) {
  before_value();
  char buf[24];
  auto r = std::to_chars(buf, buf + sizeof buf, n);
  out_.append(buf, r.ptr);
  return *this;
}

JsonWriter& JsonWriter::value(double d) {
  if (!std::isfinite(d)) return null();
  before_value();
  char buf[32];
  auto r = std::to_chars(buf, buf + sizeof buf, d);
  out_.append(buf, r.ptr);
  return *this;
}

JsonWriter& JsonWriter::value(bool b) {
  before_value();
  out_ += b ? "true" : "false";
  return *this;
}

JsonWriter& JsonWriter::null() {
  before_value();
  out_ += "null";
  return *this;
}

JsonWriter& JsonWriter::raw(std::string_view json) {
  before_value();
  out_.append(json);
  return *this;
}

}  // namespace evenhand::audit
