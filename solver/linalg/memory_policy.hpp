// How the process hands freed memory back to the system.
#pragma once

#include <cstddef>

namespace oxystrat {

//! Keeps freed heap memory for reuse instead of returning it to the kernel. A large network
//! allocates and frees vectors of tens of megabytes on every Newton step; by default glibc maps
//! blocks above a moving threshold separately and unmaps them on free, and trims the heap top,
//! so each step touched fresh pages again. On the development machine (a virtual machine) a first
//! touch costs some microseconds per 4 KiB page: 1.5-3 s of a 10^6-zone solve went to the kernel.
//! Call once at the start of main(); peak memory is unchanged (the freed blocks are reused).
void retain_freed_memory();

//! Asks the kernel to back [data, data + bytes) with 2 MiB pages where it can: for a buffer of
//! hundreds of megabytes filled once (the lifelines' event lists), first touches then cost one
//! fault per 2 MiB instead of per 4 KiB. Advice only: ignored where not supported.
void prefer_huge_pages(void* data, std::size_t bytes);

}  // namespace oxystrat
