// trivet: a small streaming JSON writer. Reports are written as they are
// walked, never built as a document in memory, so a 100,000-span beam or a
// library of 10,000 beams costs little memory. Numbers are written with
// std::to_chars in their shortest form that reads back to the same double;
// NaN and infinity (which JSON cannot hold) are written as null.
#pragma once

#include <charconv>
#include <cmath>
#include <cstdint>
#include <algorithm>
#include <ostream>
#include <string>
#include <string_view>
#include <vector>

namespace trivet::reports {

// Length of the valid UTF-8 sequence that starts at s[i], or 0 when the
// bytes there are not UTF-8 (the writers then put U+FFFD in their place).
inline std::size_t utf8_sequence_length(std::string_view s, std::size_t i) {
  const auto b = [&](std::size_t k) { return static_cast<unsigned char>(s[k]); };
  const unsigned char c = b(i);
  const std::size_t n = c < 0x80 ? 1 : (c >> 5) == 6 ? 2 : (c >> 4) == 14 ? 3 : (c >> 3) == 30 ? 4 : 0;
  if (n == 0 || i + n > s.size()) return 0;
  for (std::size_t k = 1; k < n; ++k)
    if ((b(i + k) >> 6) != 2) return 0;
  return n;
}

class JsonWriter {
 public:
  explicit JsonWriter(std::ostream& out) : out_(&out), buf_(own_) { buf_.reserve(1 << 16); }
  // Writes into `target` instead, as if `depth` non-compact containers were
  // already open (so a part written here and put into the outer document
  // with raw_element() has the same bytes as one written in place).
  // The text is appended to `target` as it is made.
  JsonWriter(std::string& target, std::size_t depth) : buf_(target) { stack_.assign(depth, Level{false}); }
  ~JsonWriter() { flush(); }
  JsonWriter(const JsonWriter&) = delete;
  JsonWriter& operator=(const JsonWriter&) = delete;

  // Containers. `compact` writes the container on one line.
  void begin_object(bool compact = false) { open('{', compact); }
  void end_object() { close('}'); }
  void begin_array(bool compact = false) { open('[', compact); }
  void end_array() { close(']'); }

  // The key of the next member of the current object.
  JsonWriter& key(std::string_view k) {
    separate();
    string_body(k);
    buf_ += compact() ? ":" : ": ";
    after_key_ = true;
    return *this;
  }

  void value(double v) {
    separate();
    number_body(v);
    maybe_flush();
  }
  void value(std::string_view s) { separate(); string_body(s); maybe_flush(); }
  void value(const char* s) { value(std::string_view(s)); }
  void value(const std::string& s) { value(std::string_view(s)); }
  void value(bool b) { separate(); buf_ += b ? "true" : "false"; }
  void value(std::size_t n) { separate(); integer_body(n); }
  void value(int n) { separate(); integer_body(n); }
  void null() { separate(); buf_ += "null"; }
  // How many containers are open (for a writer that makes a part to be put
  // in here with raw_element()).
  std::size_t depth() const { return stack_.size(); }
  // Elements of the current array (or members of the current object)
  // written beforehand by a writer of the matching depth (the text starts
  // with its own line break and indent).
  void raw_element(std::string_view text) {
    if (!stack_.empty()) {
      Level& l = stack_.back();
      if (!l.empty) buf_ += ',';
      l.empty = false;
    }
    if (out_ && text.size() > 4096) {  // a large part goes to the stream as it is, without a copy
      flush();
      out_->write(text.data(), static_cast<std::streamsize>(text.size()));
      return;
    }
    buf_ += text;
    maybe_flush();
  }

  template <class T>
  void member(std::string_view k, const T& v) { key(k); value(v); }

  // A compact object of many small fields (a station, a node), written
  // field by field without the general bookkeeping: the same bytes as
  // begin_object(true), member()s and end_object(). Keys must be plain
  // ASCII that needs no escaping (the report's own field names).
  void record_begin() {
    separate();
    buf_ += '{';
    record_first_ = true;
  }
  void record(std::string_view k, double v) { record_key(k); number_body(v); }
  void record(std::string_view k, std::size_t v) { record_key(k); integer_body(v); }
  void record(std::string_view k, std::string_view v) { record_key(k); string_body(v); }
  void record_null(std::string_view k) { record_key(k); buf_ += "null"; }
  void record_end() {
    buf_ += '}';
    if (stack_.empty()) buf_ += '\n';
    maybe_flush();
  }
  void member_null(std::string_view k) { key(k); null(); }

  void flush() {
    if (!out_) return;  // writing into a string: it is already there
    out_->write(buf_.data(), static_cast<std::streamsize>(buf_.size()));
    buf_.clear();
  }

 private:
  struct Level {
    bool compact;
    bool empty = true;
  };
  bool compact() const { return !stack_.empty() && stack_.back().compact; }
  void separate() {
    if (after_key_) { after_key_ = false; return; }
    if (stack_.empty()) return;
    Level& l = stack_.back();
    if (!l.empty) buf_ += ',';
    l.empty = false;
    if (!l.compact) newline();
  }
  void newline() {
    buf_ += '\n';
    buf_.append(stack_.size(), ' ');
  }
  void open(char c, bool compact_here) {
    separate();
    buf_ += c;
    stack_.push_back({compact_here || compact()});
  }
  void close(char c) {
    const Level l = stack_.back();
    stack_.pop_back();
    if (!l.empty && !l.compact) newline();
    buf_ += c;
    if (stack_.empty()) buf_ += '\n';
    maybe_flush();
  }
  void string_body(std::string_view s) {
    buf_ += '"';
    // Most strings (every key) need no escaping: one scan, one append.
    if (std::none_of(s.begin(), s.end(), [](char ch) {
          const unsigned char c = static_cast<unsigned char>(ch);
          return c < 0x20 || c >= 0x80 || c == '"' || c == '\\';
        })) {
      buf_.append(s);
      buf_ += '"';
      return;
    }
    for (std::size_t i = 0; i < s.size();) {
      const unsigned char c = static_cast<unsigned char>(s[i]);
      if (c >= 0x80) {
        const std::size_t n = utf8_sequence_length(s, i);
        if (n == 0) { buf_ += "\\ufffd"; ++i; }  // not UTF-8: the replacement character
        else { buf_.append(s.substr(i, n)); i += n; }
        continue;
      }
      ++i;
      switch (c) {
        case '"': buf_ += "\\\""; break;
        case '\\': buf_ += "\\\\"; break;
        case '\n': buf_ += "\\n"; break;
        case '\r': buf_ += "\\r"; break;
        case '\t': buf_ += "\\t"; break;
        default:
          if (c < 0x20) {
            char b[8];
            std::snprintf(b, sizeof b, "\\u%04x", c);
            buf_ += b;
          } else {
            buf_ += static_cast<char>(c);
          }
      }
    }
    buf_ += '"';
  }
  void record_key(std::string_view k) {
    buf_ += record_first_ ? "\"" : ",\"";
    record_first_ = false;
    buf_ += k;
    buf_ += "\":";  // a record is compact
  }
  void number_body(double v) {
    if (!std::isfinite(v)) {
      buf_ += "null";
      return;
    }
    char b[32];
    auto r = std::to_chars(b, b + sizeof b, v);
    std::string_view s(b, static_cast<std::size_t>(r.ptr - b));
    buf_ += s;
    // Keep a double recognisable as one ("2" -> "2.0"), as JSON readers
    // that distinguish integers expect.
    bool plain = true;  // digits only (a finite double from to_chars: no 'E', no "nan")
    for (const char c : s) plain = plain && c != '.' && c != 'e';
    if (plain) buf_ += ".0";
  }
  template <class I>
  void integer_body(I n) {
    char b[24];
    auto r = std::to_chars(b, b + sizeof b, n);
    buf_.append(b, static_cast<std::size_t>(r.ptr - b));
  }
  void maybe_flush() {
    if (out_ && buf_.size() > (1 << 16)) flush();
  }

  std::ostream* out_ = nullptr;
  std::string own_;
  std::string& buf_;
  std::vector<Level> stack_;
  bool after_key_ = false;
  bool record_first_ = true;
};

}  // namespace trivet::reports
