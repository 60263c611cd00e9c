// trivet: a small streaming JSON writer. Reports are written as they are
// walked, never built as a document in memory, so a 100,000-span beam or a
// library of 10,000 beams costs little memory. Numbers are written with
// std::to_chars in their shortest form that reads back to the same double;
// NaN and infinity (which JSON cannot hold) are written as null.
#pragma once

#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstdio>
#include <cstring>
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
  explicit JsonWriter(std::ostream& out) : out_(&out), buf_(own_) { start(); }
  // Writes into `target` instead, as if `depth` non-compact containers were
  // already open (so a part written here and put into the outer document
  // with raw_element() has the same bytes as one written in place).
  // The text is appended to `target`; `target` holds it all once the
  // writer is destroyed (not before: it is written through a cursor).
  JsonWriter(std::string& target, std::size_t depth) : buf_(target) {
    stack_.assign(depth, Level{false});
    start();
  }
  // Writes into `target` one value as it reads inside a compact container
  // (no line break or indent before it), for raw_value().
  explicit JsonWriter(std::string& target) : buf_(target) {
    stack_.assign(1, Level{true});
    start(256);  // a small value: little room, grown when needed
  }
  ~JsonWriter() {
    flush();
    buf_.resize(used());  // a string target: its text, without the room left for more
  }
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
    put(compact() ? std::string_view(":") : std::string_view(": "));
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
  void value(bool b) { separate(); put(b ? std::string_view("true") : std::string_view("false")); }
  void value(std::size_t n) { separate(); integer_body(n); }
  void value(int n) { separate(); integer_body(n); }
  void null() { separate(); put("null"); }
  // How many containers are open (for a writer that makes a part to be put
  // in here with raw_element()).
  std::size_t depth() const { return stack_.size(); }
  // Elements of the current array (or members of the current object)
  // written beforehand by a writer of the matching depth (the text starts
  // with its own line break and indent).
  void raw_element(std::string_view text) {
    if (!stack_.empty()) {
      Level& l = stack_.back();
      if (!l.empty) put(',');
      l.empty = false;
    }
    if (out_ && text.size() > 4096) {  // a large part goes to the stream as it is, without a copy
      flush();
      out_->write(text.data(), static_cast<std::streamsize>(text.size()));
      return;
    }
    put(text);
    maybe_flush();
  }

  // A value written beforehand by a JsonWriter(target) (a compact object
  // written once and put in many places).
  void raw_value(std::string_view text) {
    separate();
    put(text);
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
    put('{');
    record_first_ = true;
  }
  void record(std::string_view k, double v) { record_key(k); number_body(v); }
  void record(std::string_view k, std::size_t v) { record_key(k); integer_body(v); }
  void record(std::string_view k, std::string_view v) { record_key(k); string_body(v); }
  void record_null(std::string_view k) { record_key(k); put("null"); }
  void record_end() {
    put('}');
    if (stack_.empty()) put('\n');
    maybe_flush();
  }
  void member_null(std::string_view k) { key(k); null(); }

  void flush() {
    if (!out_) return;  // writing into a string: it is already there
    out_->write(buf_.data(), static_cast<std::streamsize>(used()));
    cur_ = buf_.data();
  }

 private:
  struct Level {
    bool compact;
    bool empty = true;
  };
  // The text goes into buf_ through a cursor: buf_ is kept longer than the
  // text (its size is the room), so that a character or a number is one
  // copy, not a call to std::string's append.
  static constexpr std::size_t kRoom = std::size_t(1) << 16;
  void start(std::size_t room_first = kRoom) {
    const std::size_t n = buf_.size();
    buf_.resize(n + room_first);
    cur_ = buf_.data() + n;
    end_ = buf_.data() + buf_.size();
  }
  std::size_t used() const { return static_cast<std::size_t>(cur_ - buf_.data()); }
  // At least n bytes of room at the cursor.
  void room(std::size_t n) {
    if (static_cast<std::size_t>(end_ - cur_) >= n) return;
    grow(n);
  }
  void grow(std::size_t n) {
    flush();  // a stream writer empties its buffer instead of growing it, when it can
    const std::size_t u = used();
    if (buf_.size() - u < n) buf_.resize(std::max(2 * buf_.size(), u + n + 256));
    cur_ = buf_.data() + u;
    end_ = buf_.data() + buf_.size();
  }
  void put(char c) {
    room(1);
    *cur_++ = c;
  }
  void put(std::string_view s) {
    room(s.size());
    std::memcpy(cur_, s.data(), s.size());
    cur_ += s.size();
  }
  bool compact() const { return !stack_.empty() && stack_.back().compact; }
  void separate() {
    if (after_key_) { after_key_ = false; return; }
    if (stack_.empty()) return;
    Level& l = stack_.back();
    if (!l.empty) put(',');
    l.empty = false;
    if (!l.compact) newline();
  }
  void newline() {
    room(1 + stack_.size());
    *cur_++ = '\n';
    std::memset(cur_, ' ', stack_.size());
    cur_ += stack_.size();
  }
  void open(char c, bool compact_here) {
    separate();
    put(c);
    stack_.push_back({compact_here || compact()});
  }
  void close(char c) {
    const Level l = stack_.back();
    stack_.pop_back();
    if (!l.empty && !l.compact) newline();
    put(c);
    if (stack_.empty()) put('\n');
    maybe_flush();
  }
  void string_body(std::string_view s) {
    // Most strings (every key) need no escaping: one scan, one copy.
    if (std::none_of(s.begin(), s.end(), [](char ch) {
          const unsigned char c = static_cast<unsigned char>(ch);
          return c < 0x20 || c >= 0x80 || c == '"' || c == '\\';
        })) {
      room(s.size() + 2);
      *cur_++ = '"';
      std::memcpy(cur_, s.data(), s.size());
      cur_ += s.size();
      *cur_++ = '"';
      return;
    }
    put('"');
    for (std::size_t i = 0; i < s.size();) {
      const unsigned char c = static_cast<unsigned char>(s[i]);
      if (c >= 0x80) {
        const std::size_t n = utf8_sequence_length(s, i);
        if (n == 0) { put("\\ufffd"); ++i; }  // not UTF-8: the replacement character
        else { put(s.substr(i, n)); i += n; }
        continue;
      }
      ++i;
      switch (c) {
        case '"': put("\\\""); break;
        case '\\': put("\\\\"); break;
        case '\n': put("\\n"); break;
        case '\r': put("\\r"); break;
        case '\t': put("\\t"); break;
        default:
          if (c < 0x20) {
            char b[8];
            std::snprintf(b, sizeof b, "\\u%04x", c);
            put(std::string_view(b));
          } else {
            put(static_cast<char>(c));
          }
      }
    }
    put('"');
  }
  void record_key(std::string_view k) {
    room(k.size() + 4);
    if (!record_first_) *cur_++ = ',';
    record_first_ = false;
    *cur_++ = '"';
    std::memcpy(cur_, k.data(), k.size());
    cur_ += k.size();
    *cur_++ = '"';
    *cur_++ = ':';  // a record is compact
  }
  void number_body(double v) {
    if (!std::isfinite(v)) {
      put("null");
      return;
    }
    // The shortest form that reads back to the same double is at most 24
    // characters; 2 more for ".0".
    room(32);
    char* const first = cur_;
    cur_ = std::to_chars(first, first + 30, v).ptr;
    // Keep a double recognisable as one ("2" -> "2.0"), as JSON readers
    // that distinguish integers expect.
    bool plain = true;  // digits only (a finite double from to_chars: no 'E', no "nan")
    for (const char* q = first; q != cur_; ++q) plain = plain && *q != '.' && *q != 'e';
    if (plain) {
      *cur_++ = '.';
      *cur_++ = '0';
    }
  }
  template <class I>
  void integer_body(I n) {
    room(24);
    cur_ = std::to_chars(cur_, cur_ + 24, n).ptr;
  }
  void maybe_flush() {
    if (out_ && used() > kRoom / 2) flush();
  }

  std::ostream* out_ = nullptr;
  std::string own_;
  std::string& buf_;
  char* cur_ = nullptr;
  char* end_ = nullptr;
  std::vector<Level> stack_;
  bool after_key_ = false;
  bool record_first_ = true;
};

}  // namespace trivet::reports
