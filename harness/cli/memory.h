// trivet: how the process takes memory from the system.
#pragma once

namespace trivet::cli {

// Fresh pages cost a fault each, and on a virtual machine the faults were
// the largest single cost of a long beam (perf: a fifth of the time for
// 100,000 spans). So freed memory is kept for reuse (a batch allocates and
// frees much the same for every beam), large blocks come from the heap
// rather than from mappings of their own (which are handed back on free),
// and the main heap is grown once by a large step marked for transparent
// huge pages (the effect of glibc's
// malloc.hugetlb tunable; a hint the kernel may ignore). Only address
// space is reserved: pages are used when touched. Call once, first thing
// in main. Does nothing where malloc is not glibc's (e.g. under ASan).
void prefer_huge_pages();

}  // namespace trivet::cli
