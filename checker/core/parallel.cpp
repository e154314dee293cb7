#include "checker/core/parallel.h"

#include <algorithm>
#include <atomic>
#include <cstdlib>
#include <exception>
#include <mutex>
#include <thread>
#include <vector>

namespace gateloop {

std::size_t workerThreads() {
  if (const char *env = std::getenv("GATELOOP_THREADS")) {
    char *end = nullptr;
    long n = std::strtol(env, &end, 10);
    if (end != env && *end == '\0' && n >= 1) return static_cast<std::size_t>(std::min(n, 64L));
  }
  unsigned hw = std::thread::hardware_concurrency();
  return std::clamp<std::size_t>(hw == 0 ? 1 : hw, 1, 8);
}

void parallelFor(std::size_t count, const std::function<void(std::size_t)> &task, std::size_t grain) {
  grain = std::max<std::size_t>(grain, 1);
  const std::size_t threads = std::min(workerThreads(), (count + grain - 1) / grain);
  if (threads <= 1) {
    for (std::size_t i = 0; i < count; ++i) task(i);
    return;
  }
  std::atomic<std::size_t> next{0};
  std::atomic<bool> failed{false};
  std::exception_ptr error;
  std::mutex errorMutex;
  auto work = [&] {
    try {
      while (!failed.load(std::memory_order_relaxed)) {
        const std::size_t begin = next.fetch_add(grain, std::memory_order_relaxed);
        if (begin >= count) break;
        const std::size_t end = std::min(count, begin + grain);
        for (std::size_t i = begin; i < end; ++i) task(i);
      }
    } catch (...) {
      std::lock_guard<std::mutex> lock(errorMutex);
      if (!error) error = std::current_exception();
      failed = true;
    }
  };
  std::vector<std::thread> pool;
  pool.reserve(threads - 1);
  try {
    for (std::size_t t = 1; t < threads; ++t) pool.emplace_back(work);
  } catch (...) {
    // No thread to be had: the calling thread does the rest alone.
  }
  work();
  for (auto &th : pool) th.join();
  if (error) std::rethrow_exception(error);
}

} // namespace gateloop
