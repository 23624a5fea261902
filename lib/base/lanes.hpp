#pragma once
// Arithmetic written once for one point or for several points at a time ("lanes").
//
// The model's kernels (IF97 water, reaction thermodynamics, the water cells, the plant balance) are
// templates over a number type V: `double` for one point (the block's solve) or a SIMD batch of
// doubles for a batch of points (lib/batch, which adds the batch types in lanes_simd.hpp). A kernel
// computes without branching on a point's values: `select(mask, a, b)` where scalar code would use
// `if`, comparisons give masks (`bool` for double), and the math functions below. Its scalar
// instantiation is the model the block solves; its batch instantiations compute the same operations
// in the same order per lane, so they differ only where a SIMD math function rounds differently
// from the C library (exp, log, log1p, asinh: at most about 2 ulp; sqrt and the arithmetic are exact).
//
// Code generated for one instruction set must never be shared with another: a batch kernel's
// translation unit is compiled with AVX2 or AVX-512 flags, and an inline function it shared with
// the rest of the library (the linker keeps one copy of each) could end up executing AVX-512
// instructions on a machine without them. So every kernel template and inline helper lives in the
// inline namespace ELY_LANES_NS, which each kernel translation unit names after its instruction set
// before it includes anything (lib/batch/kernel_*.cpp); elsewhere it is `scalar_lanes`. The name
// lookup does not see the inline namespace (ely::kernel::f), the linker does.
#include <cmath>

#ifndef ELY_LANES_NS
#define ELY_LANES_NS scalar_lanes
#endif

#define ELY_KERNEL_BEGIN \
    namespace ely {      \
    inline namespace ELY_LANES_NS {
#define ELY_KERNEL_END \
    }                  \
    }

ELY_KERNEL_BEGIN
namespace lanes {

/// The operations of a number type; specialised for double here and for SIMD batches in
/// lanes_simd.hpp. `mask` is the type comparisons give.
template <class V, class Enable = void>
struct ops;

template <>
struct ops<double> {
    using mask = bool;
    static constexpr int size = 1;
    static double select(bool m, double a, double b) { return m ? a : b; }
    static double exp(double x) { return std::exp(x); }
    static double log(double x) { return std::log(x); }
    static double log1p(double x) { return std::log1p(x); }
    static double sqrt(double x) { return std::sqrt(x); }
    static double asinh(double x) { return std::asinh(x); }
    static double abs(double x) { return std::fabs(x); }
    static bool isfinite(double x) { return std::isfinite(x); }
};

template <class V>
using mask_t = typename ops<V>::mask;

template <class M, class V>
inline V select(const M& m, const V& a, const V& b) { return ops<V>::select(m, a, b); }
/// std::min and std::max exactly (the second argument when it compares smaller / larger, the first
/// otherwise), so that a kernel gives what the scalar code it replaces gave, NaN and ±0 included.
template <class V>
inline V min(const V& a, const V& b) { return ops<V>::select(b < a, b, a); }
template <class V>
inline V max(const V& a, const V& b) { return ops<V>::select(a < b, b, a); }
template <class V>
inline V exp(const V& x) { return ops<V>::exp(x); }
template <class V>
inline V log(const V& x) { return ops<V>::log(x); }
template <class V>
inline V log1p(const V& x) { return ops<V>::log1p(x); }
template <class V>
inline V sqrt(const V& x) { return ops<V>::sqrt(x); }
template <class V>
inline V asinh(const V& x) { return ops<V>::asinh(x); }
template <class V>
inline V abs(const V& x) { return ops<V>::abs(x); }
/// True where x is neither NaN nor infinite.
template <class V>
inline mask_t<V> isfinite(const V& x) { return ops<V>::isfinite(x); }

/// Whether any / every lane of a mask is set (a bool is one lane).
template <class M>
struct mask_ops;
template <>
struct mask_ops<bool> {
    static bool any(bool m) { return m; }
    static bool all(bool m) { return m; }
};
template <class M>
inline bool any_lane(const M& m) { return mask_ops<M>::any(m); }
template <class M>
inline bool all_lanes(const M& m) { return mask_ops<M>::all(m); }

}  // namespace lanes
ELY_KERNEL_END
