// trivet: SHA-256 (FIPS 180-4), for the provenance of a report's input files.
#pragma once

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>

namespace trivet::reports {

class Sha256 {
 public:
  Sha256();
  void update(const void* data, std::size_t size);
  void update(const std::string& s) { update(s.data(), s.size()); }
  // The digest as 64 lower-case hex digits; the object is spent afterwards.
  std::string hex();

 private:
  void block(const unsigned char* p);
  std::uint32_t h_[8];
  unsigned char buf_[64];
  std::size_t used_ = 0;
  std::uint64_t bytes_ = 0;
};

// The SHA-256 of a text, as hex.
std::string sha256_hex(const std::string& data);
// The SHA-256 of a file's bytes, or nothing if it cannot be read.
std::optional<std::string> sha256_file(const std::string& path);

}  // namespace trivet::reports
