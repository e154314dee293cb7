/// \file
/// Work spread over the machine's cores for the per-loop stages (extraction, physics, rules):
/// every loop is independent of the others, and a board of thousands of gate loops should not
/// wait on one core while CI machines have two or more.
#pragma once

#include <cstddef>
#include <functional>

namespace gateloop {

/// Threads parallelFor uses: the GATELOOP_THREADS environment variable when set (1 = all work on
/// the calling thread), else the number of hardware threads, at most 8.
std::size_t workerThreads();

/// Calls \p task(i) once for every i in [0, count), spread over workerThreads() threads in
/// batches of \p grain indexes taken in turn, so uneven tasks still share out. Each task must only
/// write to its own result slot. Small counts run on the calling thread. An exception from a task
/// is rethrown here after all threads have stopped.
void parallelFor(std::size_t count, const std::function<void(std::size_t)> &task, std::size_t grain = 64);

} // namespace gateloop
