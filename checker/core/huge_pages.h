/// \file
/// A hint to the operating system that a large, freshly reserved block will be filled densely,
/// so it may back it with huge pages. Filling a million-element circuit otherwise takes tens of
/// thousands of page faults and scatters hash-table probes over as many TLB entries.
#pragma once

#include <cstddef>

namespace gateloop {

/// Advises huge pages for the whole 2 MiB pages inside [p, p + bytes). Harmless where the system
/// does not support it; small blocks are left alone.
void adviseHugePages(const void *p, std::size_t bytes) noexcept;

} // namespace gateloop
