#pragma once
// The SIMD number types of the batch kernels: xsimd batches of doubles (Debian's libxsimd-dev,
// header-only) with the operations of base/lanes.hpp. Included only by the kernel translation units
// (kernel_*.cpp), each compiled for its instruction set with ELY_LANES_NS set to its name.
#include <xsimd/xsimd.hpp>

#include "base/lanes.hpp"

ELY_KERNEL_BEGIN
namespace lanes {

template <class A>
struct ops<xsimd::batch<double, A>> {
    using V = xsimd::batch<double, A>;
    using mask = xsimd::batch_bool<double, A>;
    static constexpr int size = static_cast<int>(V::size);
    static V select(const mask& m, const V& a, const V& b) { return xsimd::select(m, a, b); }
    static V exp(const V& x) { return xsimd::exp(x); }
    static V log(const V& x) { return xsimd::log(x); }
    static V log1p(const V& x) { return xsimd::log1p(x); }
    static V sqrt(const V& x) { return xsimd::sqrt(x); }
    static V asinh(const V& x) { return xsimd::asinh(x); }
    static V abs(const V& x) { return xsimd::abs(x); }
    static mask isfinite(const V& x) { return xsimd::isfinite(x); }
};

template <class A>
struct mask_ops<xsimd::batch_bool<double, A>> {
    static bool any(const xsimd::batch_bool<double, A>& m) { return xsimd::any(m); }
    static bool all(const xsimd::batch_bool<double, A>& m) { return xsimd::all(m); }
};

}  // namespace lanes
ELY_KERNEL_END
