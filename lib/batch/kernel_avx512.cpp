// The PEM batch kernel for avx512f (see pem_kernel.hpp; CMake gives this file its instruction-set flags).
#define ELY_LANES_NS avx512_lanes
#include "batch/pem_kernel.hpp"

namespace ely::batch {
void pem_kernel_avx512(const PemConstants& k, const PemChunk& c) {
    batch_kernel::pem_points<xsimd::batch<double, xsimd::avx512f>>(k, c);
}
}  // namespace ely::batch
