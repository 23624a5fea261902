#pragma once
// The electrolyzer block: inputs and tunable parameters, steady-state solve, outputs. Life cycle:
//   Block(design) → set inputs / tunable parameters → solve() → get outputs → set … → solve() …
// Outputs can be read only while they belong to the current inputs (after a successful solve
// and before the next set). A failed solve rolls the spec, the inputs and the parameters back to
// those of the last successful solve (or of the last keep_state_for_rollback()), so the block
// always holds a consistent state. A failed set changes nothing.
//
// The work is split by concern: block.cpp (variables, set/get, parameters, the solve and its
// rollback), spec_solve.cpp (the current density that meets the spec), streams.cpp (streams,
// products, feeds, the energy balance, performance), alarms.cpp, report.cpp; the plant in time:
// dynamics_defaults.cpp (what the technology and the plant's rating settle), dynamics.cpp (reset,
// advance, the integrator and its events), run_summary.cpp, state_io.cpp (save and restore).
//
// Dynamic runs: Block(design) → set inputs → reset(t0) → set inputs → advance(dt) → … A run's
// state is the stack temperature, the separator gas and the integrated totals, the current and
// its ramp, the mode and its timers, the operating hours and starts (docs/dynamics.md).
#include <bitset>
#include <cstdint>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "unit/dynamics.hpp"
#include "thermo/species.hpp"
#include "unit/plant.hpp"
#include "unit/variables.hpp"

namespace ely {

struct SolveOutcome {
    bool warning = false;  // an alarm or extrapolation flag is raised
    std::string message;   // what was raised, for the host
};

class Block {
public:
    explicit Block(PlantDesign design);

    /// The plant description as configured (tunable parameters set later are not in it).
    const PlantDesign& design() const { return design_; }
    const TechnologyInfo& technology() const { return *design_.technology; }
    /// The cell model in use: the configured one, or one rebuilt after a cell parameter was set.
    const Cell& cell() const { return *cell_; }
    /// The rated current density a description that gives none gets: the technology's (registry), or
    /// for a technology without one the cell model's maximum, A/m².
    double default_rated_current_density() const;

    // Variables are addressed by a dense index 0..count-1: the table's variables that the
    // technology has (table order), its cell parameters, then the outputs its cell adds.
    int32_t variable_count() const;
    const VariableInfo& variable(int32_t index) const;
    double start(int32_t index) const;  // the configured value of an input or parameter; NaN for outputs
    /// Position (1, 2, ...) in the technology's summary and the heading of its section; 0 and
    /// "" when the summary does not show the variable.
    int32_t summary_rank(int32_t index) const;
    const char* summary_group(int32_t index) const;
    int32_t find(std::string_view name) const;  // throws unknown_name

    /// Inputs (any of them: the spec decides which drive input the solve reads) and tunable
    /// parameters, checked against the table's limits (and, for a cell parameter, by rebuilding
    /// the cell). Throws, changing nothing, for an output, a fixed parameter or a bad value.
    void set(int32_t index, double value);
    double get(int32_t index) const;  // outputs need a current solution
    void set_spec(Spec spec);
    Spec spec() const { return spec_; }

    /// For the batch kernels (lib/batch), which read the block as a batch starts: the value a table
    /// variable holds (inputs and parameters in force), the rectifier rating in force, the cell's
    /// parameter values in force, and the table variable behind an index (-1 for a cell parameter or an
    /// output the cell adds).
    double value(Var v) const { return v_[static_cast<std::size_t>(v)]; }
    double rectifier_rated_power() const { return rectifier_rated_power_; }
    const ParameterValues* cell_parameter_values() const { return cell_values_.get(); }
    int32_t table_variable(int32_t index) const {
        const Slot s = slot(index);
        return s.kind == Kind::table ? s.id : -1;
    }

    SolveOutcome solve();  // throws on failure after rolling back
    bool solved() const { return outputs_current_; }

    /// Makes the present spec, inputs and parameters the state a failed solve returns to (as a
    /// successful solve does), with the outputs readable afterwards only if they are now. A batch
    /// takes it on its working copy, so that a failed point never loses what was set on the
    /// block between its last solve and the batch.
    void keep_state_for_rollback();

    /// The solved state as a JSON object: technology, spec, the drive input it reads, name, and
    /// every variable with its value (null when not a number) and unit.
    std::string report_json() const;

    // ---- The plant in time (docs/dynamics.md) ----
    /// Starts a dynamic run at start_time (s) from the current inputs: the stack temperature takes
    /// in.temperature, the operating hours in.hours_operated, and the plant is in the mode
    /// in.mode_request asks for, at its setpoint, without a start-up sequence. Every output is
    /// valid for that state. Throws, changing nothing, when that state cannot be evaluated.
    SolveOutcome reset(double start_time);
    /// Integrates the run over `step` seconds (>= 0) with the inputs held; the outputs are valid at
    /// the end (a step of 0 applies new inputs, such as a mode request, at the current time). A
    /// failed step rolls the block back like a failed solve: to its state before the call, without
    /// the sets made since the last successful solve, reset or step. wrong_state before a reset.
    SolveOutcome advance(double step);
    bool running() const { return run_.running != 0; }
    double time() const;  // s; wrong_state before a reset
    const RunState& run_state() const { return run_; }
    /// The figures of the run since its reset as JSON (run_summary.cpp): hydrogen, energy, water,
    /// hours in each mode, starts, full-load hours, alarms, degradation. wrong_state before a reset.
    std::string run_summary_json() const;
    /// Everything a result of this block depends on (inputs, parameters, spec, outputs, warm starts,
    /// the run) as bytes, headed by the producer's name and version and the plant's fingerprint.
    std::string save_state(std::string_view producer) const;
    /// Takes a state saved by a block of the same plant description and producer; throws
    /// invalid_argument, changing nothing, for any other.
    void restore_state(std::string_view bytes, std::string_view producer);
    /// A hash of the plant description as this block settled it: blocks created from the same
    /// description share it.
    uint64_t design_fingerprint() const { return fingerprint_; }
    /// Heat lost to ambient at a stack temperature, W (param.thermal.heat_loss_coefficient per
    /// stack, to in.ambient_temperature).
    double heat_loss_at(double temperature) const;
    /// The energy balance of an operating point, W: the one place that computes it (streams.cpp), for the
    /// steady outputs and for a dynamic layer that needs the heat released at the stack's temperature.
    struct EnergyBalance {
        double released = 0;      // P_DC + enthalpy of what enters the stacks − of what leaves them at T
        double loss = 0;          // heat lost to ambient
        double duty = 0;          // released − loss: heat to remove to hold the stack temperature
        double gas_coolers = 0;   // heat removed in the gas coolers (stack temperature → cooler outlet)
        double feed_heating = 0;  // heat supplied to raise steam and heat sweep air (steam-fed cells)
    };

private:
    enum class Kind : uint8_t { table, cell_parameter, own_output };
    struct Slot {
        Kind kind;
        int32_t id;  // Var, parameter index or own-output index
    };
    struct Layout;  // per technology, built once (block.cpp)
    struct PointResult;
    struct PlantStreams;

    Slot slot(int32_t index) const;
    [[noreturn]] void bad_index(int32_t index) const;
    void set_plant_parameter(Var v, double value);
    void set_cell_parameter(std::size_t k, double value);
    double rectifier_rating() const;

    // spec_solve.cpp
    double max_current_density(double temperature, double p_anode, double p_cathode) const;
    double solve_current_density(double j_max);
    void evaluate_at(double current_density, PointResult& out) const;
    // streams.cpp
    void plant_streams(const PointResult& r, PlantStreams& out) const;
    EnergyBalance energy_balance(const PointResult& r, const PlantStreams& streams) const;
    void fill_outputs(const PointResult& r);
    // alarms.cpp
    void fill_alarms(const PointResult& r);
    std::string alarm_message() const;
    // block.cpp: the outputs of the plant in time that a steady solve also gives
    void fill_steady_state_outputs();
    void commit_good_state();

    // dynamics_defaults.cpp
    void settle_dynamic_defaults();
    // state_io.cpp
    static uint64_t fingerprint_of(const PlantDesign& design, std::size_t own_count);
    // dynamics.cpp
    struct RunWorkspace;
    /// The scratch space of the integrator: a copy of a block starts with none (never shared).
    class WorkspaceSlot {
    public:
        WorkspaceSlot();
        WorkspaceSlot(const WorkspaceSlot&);
        WorkspaceSlot& operator=(const WorkspaceSlot&);
        WorkspaceSlot(WorkspaceSlot&&) noexcept;
        WorkspaceSlot& operator=(WorkspaceSlot&&) noexcept;
        ~WorkspaceSlot();
        RunWorkspace& get();

    private:
        std::unique_ptr<RunWorkspace> w_;
    };
    void evaluate_point(double temperature, double hours, double current_density, PointResult& out);
    void forget_rates();  // the remembered last point of the integrator no longer applies
    double drive_quantity(const PointResult& r) const;  // spec_solve.cpp
    double rated_current_density() const;
    ModeRequest effective_request(double temperature);
    void apply_request(double t);
    void begin_start(double t, Mode mode);
    void set_mode(double t, Mode mode);
    void complete_startup(double t);
    RunSegment make_segment(double t, double temperature) const;
    void open_segment(double t);
    double target_current_density(const RunSegment& seg, double temperature, double hours, PointResult& pr,
                                  double tolerance, double* slope);
    void rates_at(const RunSegment& seg, double t, const double* y, RunRates& out, bool final);
    void derivative_of(const RunSegment& seg, const RunRates& r, const double* x, double* dxdt) const;
    double event_function(int event, const RunSegment& seg, double t, const double* y);
    bool event_detected(int event, const RunSegment& seg, const double* y, const RunRates& r) const;
    void handle_event(int event, double t);
    int extend_segment(double t_want, double& t_event);
    void move_to(double t, bool need_current);
    void account(const RunSegment& seg, double t0, double t1);
    void finish_step_outputs();
    SolveOutcome dynamic_outcome() const;
    void roll_back();  // block.cpp: back to the last successful solve, reset or step

public:
    /// advance() with the outputs left unevaluated when `finish` is false (a profile run sets the
    /// next inputs before it reads the outputs).
    SolveOutcome advance(double step, bool finish);

private:
    RunState run_;
    std::bitset<kVarCount> automatic_;  // values settled by settle_dynamic_defaults, settled again as parameters change
    WorkspaceSlot workspace_;
    uint64_t fingerprint_ = 0;

    // Ideal-gas molar enthalpies at the stack and gas-cooler temperatures, kept between solves (streams.cpp):
    // batches and spec solves at one temperature need them once (a cache of a pure function).
    struct GasEnthalpies {
        double temperature = -1.0;
        uint32_t known = 0;  // bit per Species
        double enthalpy[kSpeciesCount] = {};
    };
    double gas_enthalpy(Species species, double temperature) const;

    PlantDesign design_;
    const Layout* layout_;  // static, per technology
    std::size_t own_count_;
    std::shared_ptr<const Cell> names_owner_;  // the configured cell: it owns the own outputs' descriptions
    std::shared_ptr<const Cell> cell_;
    std::shared_ptr<const ParameterValues> cell_values_;
    Spec spec_;
    std::vector<double> v_;  // by Var, then the own outputs
    double rectifier_rated_power_ = 0;
    double last_current_density_ = -1;  // of the last solve (kept in saved states; the spec solves do not read it)
    mutable GasEnthalpies gas_enthalpies_[2];
    mutable int gas_enthalpies_next_ = 0;

    // The last successful solve, for rollback.
    std::vector<double> last_good_;
    Spec last_good_spec_;
    std::shared_ptr<const Cell> last_good_cell_;
    std::shared_ptr<const ParameterValues> last_good_cell_values_;
    double last_good_rating_ = 0;
    bool last_good_outputs_current_ = false;
    bool has_solution_ = false;
    bool outputs_current_ = false;
};

}  // namespace ely
