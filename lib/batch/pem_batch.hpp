#pragma once
// The vectorized batch of a PEM block at the current-density, power or voltage spec: points in structure-of-arrays
// chunks through a SIMD kernel (pem_kernel.hpp), the instruction set picked at run time (AVX-512,
// AVX2 or SSE2 on x86-64). The C interface's ely_block_solve_batch uses it when it applies and solves
// on the scalar path every point the kernel does not take; results equal the scalar path's to 1e-12
// relative (tests/model/test_batch_kernel.cpp). docs/batch.md describes it.
#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "batch/pem_kernel_types.hpp"

namespace ely {
class Block;
}

namespace ely::batch {

/// The instruction sets this machine runs, widest first ("avx512", "avx2", "sse2"; the Windows build
/// has "sse2" only).
std::vector<const char*> instruction_sets();

class PemBatch {
public:
    /// Points per kernel call; divides the progress interval of the C batch (1024).
    static constexpr std::size_t kChunk = 512;
    /// Doubles between two columns of the workspace (kChunk and one cache line).
    static constexpr std::size_t kStride = kChunk + 8;

    /// A batch on `block` (its state at the start of the batch) whose rows set the inputs
    /// input_indices and read output_indices. usable() tells whether the kernel applies: a PEM block
    /// at the current-density, power or voltage spec with closed-form Butler-Volmer kinetics, rows
    /// setting only the spec's drive input, temperature and pressures, outputs of the table only. isa: an instruction
    /// set of instruction_sets() (tests), nullptr for the widest.
    PemBatch(const Block& block, int32_t n_inputs, const int32_t* input_indices, int32_t n_outputs,
             const int32_t* output_indices, const char* isa = nullptr);
    bool usable() const { return kernel_ != nullptr; }
    /// The warning of a point whose verdict is 4 + alarm_bits, worded as Block::solve words it
    /// ("solved with alarms: ...").
    static std::string alarm_message(unsigned alarm_bits);
    const char* instruction_set() const { return isa_; }

    /// Rows [first, first + count) of the row-major inputs (count <= kChunk): their output rows and
    /// verdict[r] for row first + r: 0 solved, 2 not taken (solve it on the scalar path: an error, open
    /// circuit, standby, an input outside its limits...), 4 + b solved with alarms raised (b as
    /// alarm_message takes it).
    void run(const double* inputs, std::size_t first, std::size_t count, double* outputs, uint8_t* verdict);
    /// The same with the inputs and outputs as columns (inputs[i][row], outputs[o][row]): whole vectors
    /// are read from and written into the caller's columns, without a copy.
    void run_columns(const double* const* inputs, std::size_t first, std::size_t count, double* const* outputs,
                     uint8_t* verdict);

private:
    PemChunk chunk_of(std::size_t count);  // the chunk's settings, verdicts in the workspace

    struct Source {      // where output o comes from
        int kind;        // 0 kernel output (slot), 1 row input (column), 2 constant
        int index;
        double constant;
    };
    struct Limit {
        double min, max;
        bool min_exclusive;
    };
    PemKernel kernel_ = nullptr;
    const char* isa_ = "";
    PemConstants k_{};
    int spec_ = 0;  // PemChunk::spec
    int32_t n_inputs_ = 0, n_outputs_ = 0;
    int column_[4] = {-1, -1, -1, -1};  // input column of j, T, p_c, p_a (-1: the block's value)
    double fixed_[4] = {};
    std::vector<Limit> limits_;         // per input column
    std::vector<Var> slot_var_;         // kernel outputs wanted, one slot each
    std::vector<Source> sources_;       // per output column
    struct Copy {        // output column `output` from the workspace (offset + row) or a row's input (offset)
        std::size_t output, offset;
    };
    struct Fixed {
        std::size_t output;
        double value;
    };
    std::vector<Copy> from_kernel_, from_row_;
    std::vector<std::size_t> slot_column_;  // per kernel slot, the first output column that asks for it
    std::vector<Fixed> fixed_outputs_;
    bool energy_ = false;               // an output asked for needs the energy balance
    bool streams_ = false;              // an output asked for needs the streams' water vapour
    InputLimit input_limits_[4] = {};   // per kernel column (check false: the block's value)
    std::vector<double> work_;          // inputs, outputs and verdicts of one chunk (SoA, kStride apart)
};

}  // namespace ely::batch
