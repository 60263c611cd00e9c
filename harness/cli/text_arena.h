// trivet: storage for the report parts of a batch run.
//
// A library run keeps every beam's report text (JSON, JUnit, console) until
// all beams are checked, because the report's summary comes first. Kept as
// separate strings, that text costs one page fault per 4 KiB page touched,
// and on a virtual machine the faults were the largest single cost of the
// run (perf: a third of the wall time for 10,000 beams). This arena hands
// out text from large blocks and asks the system to back them with huge
// pages where it allows (madvise; a hint, ignored where unsupported), so
// the same text costs a few hundred faults. Not thread-safe: one per worker.
#pragma once

#include <cstddef>
#include <cstring>
#include <string_view>
#include <vector>

#include <sys/mman.h>

namespace trivet::cli {

class TextArena {
 public:
  TextArena() = default;
  TextArena(const TextArena&) = delete;
  TextArena& operator=(const TextArena&) = delete;
  TextArena(TextArena&& o) noexcept { swap(o); }
  TextArena& operator=(TextArena&& o) noexcept { swap(o); return *this; }
  ~TextArena() {
    for (const auto& b : blocks_) munmap(b.data, b.size);
  }

  // A copy of `s` that lives as long as the arena.
  std::string_view add(std::string_view s) {
    if (s.empty()) return {};
    if (blocks_.empty() || blocks_.back().size - used_ < s.size()) grow(s.size());
    char* p = blocks_.back().data + used_;
    std::memcpy(p, s.data(), s.size());
    used_ += s.size();
    return {p, s.size()};
  }

 private:
  struct Block {
    char* data;
    std::size_t size;
  };
  static constexpr std::size_t kBlock = std::size_t{32} << 20;  // 32 MiB, a multiple of 2 MiB

  void grow(std::size_t at_least) {
    const std::size_t size = at_least > kBlock ? (at_least + kBlock - 1) / kBlock * kBlock : kBlock;
    void* p = mmap(nullptr, size, PROT_READ | PROT_WRITE, MAP_PRIVATE | MAP_ANONYMOUS, -1, 0);
    if (p == MAP_FAILED) throw std::bad_alloc();
#ifdef MADV_HUGEPAGE
    madvise(p, size, MADV_HUGEPAGE);
#endif
    blocks_.push_back({static_cast<char*>(p), size});
    used_ = 0;
  }
  void swap(TextArena& o) noexcept {
    blocks_.swap(o.blocks_);
    std::swap(used_, o.used_);
  }

  std::vector<Block> blocks_;
  std::size_t used_ = 0;
};

}  // namespace trivet::cli
