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
// products, feeds, the energy balance, performance), alarms.cpp, report.cpp.
#include <cstdint>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

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
    double last_current_density_ = -1;  // warm start of the spec solves
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
