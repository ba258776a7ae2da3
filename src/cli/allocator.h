// The process's memory allocator, set once at start-up by main.
//
// A solve at 10^6 pipes allocates and frees several blocks of tens to hundreds of megabytes
// (the file text, the line index, the element records, the solver's arrays). By default glibc
// maps each block above 128 KiB (rising to 32 MiB as blocks are freed) straight from the
// kernel and returns it on free, so the next large block is mapped afresh: every 4 KiB page is
// faulted in and zeroed again. Measured at 10^6 "distribution" pipes: 248,000 page faults and
// 0.34-0.36 s of system time by default; with large blocks kept in the heap and reused,
// 201,000 faults, 0.27-0.30 s, and the wall time 1-2% lower, for 0.6% more peak memory
// (docs/performance.md).
#pragma once

namespace gradeline {

// Keeps freed large blocks in the process for reuse (glibc; elsewhere nothing is done).
void configure_allocator();

}  // namespace gradeline
