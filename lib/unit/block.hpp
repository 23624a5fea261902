#pragma once
// The electrolyzer block: inputs, steady-state solve, outputs. Life cycle:
//   Block(design) → set inputs → solve() → get outputs → set … → solve() …
// Outputs can be read only while they belong to the current inputs (after a successful
// solve and before the next set). A failed solve rolls the spec and inputs back to those of the last
// successful solve, so the block always holds a consistent solved state (or none yet).
#include <array>
#include <cstdint>
#include <deque>
#include <memory>
#include <string>
#include <string_view>
#include <vector>

#include "unit/plant.hpp"
#include "unit/variables.hpp"

namespace ely {

struct SolveOutcome {
    bool warning = false;     // an alarm or extrapolation flag is raised
    std::string message;      // what was raised, for the host
};

class Block {
public:
    explicit Block(PlantDesign design);

    const PlantDesign& design() const { return design_; }

    // Variables are addressed by a dense index 0..count-1 over the variables of this
    // block's technology, in table order.
    int32_t variable_count() const { return static_cast<int32_t>(index_to_var_.size()); }
    const VariableInfo& variable(int32_t index) const;
    int32_t find(std::string_view name) const;  // throws unknown_name
    Var var_of(int32_t index) const;

    void set(int32_t index, double value);  // inputs only; validated; throws, changing nothing
    double get(int32_t index) const;        // outputs need a current solution
    void set_spec(Spec spec);
    Spec spec() const { return spec_; }

    SolveOutcome solve();  // throws on failure after rolling back
    bool solved() const { return outputs_current_; }

    /// The solved state as a JSON object (inputs, outputs, alarms).
    std::string report_json() const;

private:
    // Variables a configuration adds to the table: one current efficiency and one product rate
    // per half-reaction of a custom cell ("reaction.cathode_1.current_efficiency", ...).
    // Immutable once built and shared by clones, so the names stay valid while any clone lives.
    struct ExtraVariables {
        std::deque<std::string> text;
        std::vector<VariableInfo> info;
    };
    void add_reaction_variables();

    struct PointResult;
    void evaluate_at(double current_density, PointResult& out) const;
    double max_current_density(double temperature, double p_anode, double p_cathode) const;
    double solve_current_density(double j_max);
    void fill_outputs(const PointResult& r);

    PlantDesign design_;
    std::vector<Var> index_to_var_;
    std::shared_ptr<const ExtraVariables> extra_;
    Spec spec_;
    std::vector<double> v_;          // values by Var (table variables, then extra ones)
    std::vector<double> last_good_;  // v_ at the last successful solve
    Spec last_good_spec_;            // spec_ at the last successful solve
    bool has_solution_ = false;
    bool outputs_current_ = false;
    double rectifier_rated_power_ = 0;
    double last_current_density_ = -1;  // warm start of the spec solves
};

}  // namespace ely
