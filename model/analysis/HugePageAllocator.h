#pragma once

#include <cstddef>
#include <cstdlib>
#include <memory>
#include <new>

#if defined(__linux__)
#include <sys/mman.h>
#endif

namespace rb::analysis {

// A std::allocator that asks the kernel for 2 MB pages (transparent huge pages,
// madvise mode) for arrays of 2 MB or more. The decision diagram's arrays are
// probed all over; at 50,000 items they span more memory than the processor's
// address cache covers with 4 kB pages, and every probe also paid a page walk.
template <typename T> struct HugePageAllocator {
    using value_type = T;
    static constexpr std::size_t kHuge = std::size_t(2) << 20;

    HugePageAllocator() = default;
    template <typename U> HugePageAllocator(const HugePageAllocator<U>&) {}

    T* allocate(std::size_t n) {
        const std::size_t bytes = n * sizeof(T);
        if (bytes < kHuge)
            return std::allocator<T>().allocate(n);
        const std::size_t rounded = (bytes + kHuge - 1) / kHuge * kHuge;
        void* p = std::aligned_alloc(kHuge, rounded);
        if (!p)
            throw std::bad_alloc();
#if defined(__linux__) && defined(MADV_HUGEPAGE)
        madvise(p, rounded, MADV_HUGEPAGE); // advice only: 4 kB pages if refused
#endif
        return static_cast<T*>(p);
    }
    void deallocate(T* p, std::size_t n) {
        if (n * sizeof(T) < kHuge)
            std::allocator<T>().deallocate(p, n);
        else
            std::free(p);
    }
    template <typename U> bool operator==(const HugePageAllocator<U>&) const {
        return true;
    }
};

} // namespace rb::analysis
