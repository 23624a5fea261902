// The block: its variables (table, cell parameters, outputs of the cell), set/get with the
// table's limits, tunable parameters, and the solve with its rollback.
#include "unit/block.hpp"

#include <algorithm>
#include <cmath>
#include <cstring>
#include <fmt/format.h>
#include <limits>
#include <map>

#include "base/check.hpp"
#include "base/excerpt.hpp"
#include "base/text.hpp"
#include "unit/point_result.hpp"

namespace ely {

namespace {
constexpr double kNaN = std::numeric_limits<double>::quiet_NaN();

/// The table's limits; the message names the variable, the value and the limit crossed.
void check_limits(const VariableInfo& v, double x) {
    require_finite(x, v.name, v.unit);
    if (v.min_exclusive ? !(x > v.min) : x < v.min)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("{} {} is {} {}", v.name, quantity_text(x, v.unit), v.min_exclusive ? "not above" : "below",
                                quantity_text(v.min, v.unit)));
    if (x > v.max)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("{} {} is above {}", v.name, quantity_text(x, v.unit), quantity_text(v.max, v.unit)));
}
}  // namespace

// The part of a block's variable list that depends on its technology only: the table's
// variables it has, its cell parameters, and their places in its summary. Built once for every
// technology of the registry and never changed.
struct Block::Layout {
    std::vector<Slot> slots;
    std::vector<int32_t> rank;        // summary position of each slot, 0 = not shown
    std::vector<const char*> group;   // heading of its summary section
    int32_t own_after = -1;           // the outputs of the cell follow this rank (-1: not shown)
    const char* own_group = "";

    explicit Layout(const TechnologyInfo& tech) {
        for (int i = 0; i < kVarCount; ++i)
            if (technology_has(tech, variable_info(static_cast<Var>(i)))) slots.push_back({Kind::table, i});
        const auto& parameters = cell_parameter_variables(tech);
        for (std::size_t k = 0; k < parameters.size(); ++k)
            slots.push_back({Kind::cell_parameter, static_cast<int32_t>(k)});
        rank.assign(slots.size(), 0);
        group.assign(slots.size(), "");
        int32_t next = 0;
        const auto show = [&](const char* name, const char* title) {
            for (std::size_t s = 0; s < slots.size(); ++s)
                if (std::strcmp(info(tech, slots[s]).name, name) == 0 && rank[s] == 0) {
                    rank[s] = ++next;
                    group[s] = title;
                }
        };
        for (const auto& g : tech.summary) {
            for (const char* name : g.variables) show(name, g.title);
            if (g.own_outputs) {
                own_after = next;
                own_group = g.title;
            }
        }
        // Every technology's summary ends with its alarms, declared once in the table.
        for (int a = alarm_first; a <= alarm_last; ++a) show(variable_info(static_cast<Var>(a)).name, "Alarms");
    }

    static const VariableInfo& info(const TechnologyInfo& tech, Slot s) {
        return s.kind == Kind::table ? variable_info(static_cast<Var>(s.id))
                                     : cell_parameter_variables(tech)[static_cast<std::size_t>(s.id)];
    }

    static const Layout& of(const TechnologyInfo& tech) {
        static const std::map<const TechnologyInfo*, Layout> all = [] {
            std::map<const TechnologyInfo*, Layout> m;
            for (const auto& t : technologies()) m.emplace(&t, Layout(t));
            return m;
        }();
        return all.at(&tech);
    }
};

Block::Block(PlantDesign design)
    : design_(std::move(design)), spec_(design_.spec), last_good_spec_(design_.spec) {
    if (!design_.cell || !design_.technology) throw Error(ErrorKind::internal, "block created without a cell model");
    layout_ = &Layout::of(*design_.technology);
    names_owner_ = cell_ = design_.cell;
    cell_values_ = design_.cell_parameters;
    if (design_.technology->parameters && !cell_values_)
        throw Error(ErrorKind::internal, "block created without the cell's parameter values");
    own_count_ = cell_->own_outputs().size();
    v_.assign(kVarCount + own_count_, kNaN);
    for (int i = 0; i < kVarCount; ++i)
        if (variable_info(static_cast<Var>(i)).causality != Causality::output)
            v_[static_cast<std::size_t>(i)] = design_.configured[static_cast<std::size_t>(i)];
    // 0 (or not given) means the cell model's own maximum: the variable holds the value in force.
    if (!(v_[par_current_density_max] > 0)) v_[par_current_density_max] = cell_->envelope().current_density_max;
    if (!(v_[par_rated_current_density] > 0)) v_[par_rated_current_density] = default_rated_current_density();
    rectifier_rated_power_ = rectifier_rating();
    // What the plant in time takes from the technology and the plant's rating (coolant, heater,
    // heat capacity, ...): settled once, into the design's values, so they are the start values.
    settle_dynamic_defaults();
    fingerprint_ = fingerprint_of(design_, own_count_);
    last_good_ = v_;
    last_good_cell_ = cell_;
    last_good_cell_values_ = cell_values_;
    last_good_rating_ = rectifier_rated_power_;
}

int32_t Block::variable_count() const { return static_cast<int32_t>(layout_->slots.size() + own_count_); }

void Block::bad_index(int32_t index) const {
    throw Error(ErrorKind::invalid_argument, fmt::format("variable index {} is outside 0..{}", index, variable_count() - 1));
}

Block::Slot Block::slot(int32_t index) const {
    const auto i = static_cast<std::size_t>(index);
    const auto& slots = layout_->slots;
    if (i < slots.size()) return slots[i];  // a negative index wraps to a large size_t
    if (index < 0 || i >= slots.size() + own_count_) bad_index(index);
    return {Kind::own_output, static_cast<int32_t>(i - slots.size())};
}

const VariableInfo& Block::variable(int32_t index) const {
    const Slot s = slot(index);
    if (s.kind == Kind::own_output) return names_owner_->own_outputs()[static_cast<std::size_t>(s.id)];
    return Layout::info(*design_.technology, s);
}

double Block::start(int32_t index) const {
    const Slot s = slot(index);
    switch (s.kind) {
        case Kind::table: return design_.configured[static_cast<std::size_t>(s.id)];
        case Kind::cell_parameter: return design_.cell_parameters->values()[static_cast<std::size_t>(s.id)];
        case Kind::own_output: break;
    }
    return kNaN;
}

int32_t Block::summary_rank(int32_t index) const {
    const Slot s = slot(index);
    const auto& l = *layout_;
    if (s.kind == Kind::own_output) return l.own_after < 0 ? 0 : l.own_after + 1 + s.id;
    const int32_t r = l.rank[static_cast<std::size_t>(index)];
    return (l.own_after >= 0 && r > l.own_after) ? r + static_cast<int32_t>(own_count_) : r;
}

const char* Block::summary_group(int32_t index) const {
    const Slot s = slot(index);
    if (s.kind == Kind::own_output) return layout_->own_after < 0 ? "" : layout_->own_group;
    return layout_->group[static_cast<std::size_t>(index)];
}

int32_t Block::find(std::string_view name) const {
    for (int32_t i = 0; i < variable_count(); ++i)
        if (name == variable(i).name) return i;
    for (int i = 0; i < kVarCount; ++i)
        if (name == variable_info(static_cast<Var>(i)).name)
            throw Error(ErrorKind::unknown_name, fmt::format("variable '{}' does not exist for technology '{}'", name,
                                                             design_.technology->name));
    throw Error(ErrorKind::unknown_name, fmt::format("unknown variable '{}'", excerpt(name)));
}

void Block::set(int32_t index, double value) {
    const Slot s = slot(index);
    const auto& info = variable(index);
    if (info.causality == Causality::output)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("'{}' is an output; only inputs and tunable parameters can be set", info.name));
    if (info.causality == Causality::parameter && info.variability != Variability::tunable)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("'{}' is a structural parameter, fixed by the plant description ({}); create a block "
                                "from a changed description to change it",
                                info.name, info.config_key ? info.config_key : "its stack section"));
    check_limits(info, value);
    // Modes and switches take whole numbers only (the config reads them as integers).
    const bool whole = info.variability == Variability::discrete ||
                       (s.kind == Kind::table && (s.id == par_temperature_control || s.id == par_standby_method));
    if (whole && value != std::floor(value))
        throw Error(ErrorKind::invalid_argument, fmt::format("{} {:g} is not a whole number", info.name, value));
    const double before = s.kind == Kind::cell_parameter ? cell_values_->values()[static_cast<std::size_t>(s.id)]
                                                         : v_[static_cast<std::size_t>(s.id)];
    if (info.causality == Causality::parameter) {
        // A parameter can change what the plant's automatic values (the coolant sized at rated
        // load, ...) come to: they are settled again, and the set is undone if that fails.
        const std::vector<double> values = v_;
        const auto automatic = automatic_;
        const auto cell = cell_;
        const auto cell_values = cell_values_;
        const double rating = rectifier_rated_power_;
        try {
            if (s.kind == Kind::cell_parameter) {
                set_cell_parameter(static_cast<std::size_t>(s.id), value);
            } else {
                automatic_.reset(static_cast<std::size_t>(s.id));
                set_plant_parameter(static_cast<Var>(s.id), value);
            }
            if (automatic_.any()) settle_dynamic_defaults();
        } catch (...) {
            v_ = values;
            automatic_ = automatic;
            cell_ = cell;
            cell_values_ = cell_values;
            rectifier_rated_power_ = rating;
            throw;
        }
    } else {
        automatic_.reset(static_cast<std::size_t>(s.id));
        v_[static_cast<std::size_t>(s.id)] = value;
    }
    outputs_current_ = false;
    // A dynamic run's next step starts a new segment at the new value (the same value keeps it).
    if (!(value == before)) run_.open = 0;
}

void Block::set_plant_parameter(Var v, double value) {
    // The alarm levels keep their order: warning < trip < lower flammability limit.
    if (v == par_alarms_h2_in_o2_warning || v == par_alarms_h2_in_o2_trip || v == par_alarms_lower_flammability_limit) {
        double levels[] = {v_[par_alarms_h2_in_o2_warning], v_[par_alarms_h2_in_o2_trip],
                           v_[par_alarms_lower_flammability_limit]};
        levels[v - par_alarms_h2_in_o2_warning] = value;
        check_alarm_levels(levels[0], levels[1], levels[2]);
    }
    if (v == par_current_density_max && !(value > 0)) value = cell_->envelope().current_density_max;
    if (v == par_rated_current_density && !(value > 0)) value = default_rated_current_density();
    const double before = v_[v];
    v_[v] = value;
    if (v == par_current_density_max || v == par_rated_current_density || v == par_rectifier_rated_power) {
        try {
            rectifier_rated_power_ = rectifier_rating();
        } catch (...) {
            v_[v] = before;
            throw;
        }
    }
}

void Block::set_cell_parameter(std::size_t k, double value) {
    const auto& tech = *design_.technology;
    auto values = std::make_shared<ParameterValues>(*cell_values_);
    const char* key = values->infos()[k].key;
    std::shared_ptr<const Cell> cell;
    try {
        values->set(key, value);
        cell = make_cell(tech, *values);
    } catch (const Error& e) {
        throw Error(e.kind(), fmt::format("param.cell.{}: {}", key, e.what()));
    }
    // The rebuilt cell takes over only once the rating derived from it is known.
    std::swap(cell_, cell);
    try {
        rectifier_rated_power_ = rectifier_rating();
    } catch (const Error& e) {
        std::swap(cell_, cell);
        throw Error(e.kind(), fmt::format("param.cell.{}: {}", key, e.what()));
    }
    cell_values_ = std::move(values);
}

double Block::default_rated_current_density() const {
    // The technology's documented rated value (registry); a technology without one (the custom cell)
    // is rated at its cell's maximum current density.
    const double rated = design_.technology->rated_current_density;
    return rated > 0 ? rated : cell_->envelope().current_density_max;
}

double Block::rectifier_rating() const {
    // Sized to the DC power at the rated current density (within what the plant and cell allow) at the
    // configured operating temperature and pressures, unless a rating is given.
    if (v_[par_rectifier_rated_power] > 0) return v_[par_rectifier_rated_power];
    const auto& op = design_.configured;
    const double t = op[in_temperature], pa = op[in_pressure_anode], pc = op[in_pressure_cathode];
    const double j = std::min(v_[par_rated_current_density], max_current_density(t, pa, pc));
    const auto r = cell_->evaluate({j, t, pa, pc});
    return r.voltage * j * design_.active_area() * design_.cells() * design_.stacks();
}

double Block::get(int32_t index) const {
    const Slot s = slot(index);
    if (s.kind == Kind::table && outputs_current_) return v_[static_cast<std::size_t>(s.id)];
    const auto& info = variable(index);
    if (info.causality == Causality::output && !outputs_current_)
        throw Error(ErrorKind::wrong_state,
                    has_solution_ ? fmt::format("'{}' is stale: inputs changed since the last solve; solve first", info.name)
                                  : fmt::format("'{}' has no value yet: the block has not been solved", info.name));
    switch (s.kind) {
        case Kind::table: return v_[static_cast<std::size_t>(s.id)];
        case Kind::cell_parameter: return cell_values_->values()[static_cast<std::size_t>(s.id)];
        case Kind::own_output: break;
    }
    return v_[kVarCount + static_cast<std::size_t>(s.id)];
}

void Block::set_spec(Spec spec) {
    const auto& drive = variable_info(spec_info(spec).drive);
    if (!technology_has(*design_.technology, drive))
        throw Error(ErrorKind::invalid_argument, fmt::format("spec '{}' reads {}, which the {} technology does not have",
                                                             spec_name(spec), drive.name, design_.technology->name));
    if (spec != spec_) run_.open = 0;
    spec_ = spec;
    outputs_current_ = false;
}

void Block::keep_state_for_rollback() {
    last_good_ = v_;
    last_good_spec_ = spec_;
    last_good_rating_ = rectifier_rated_power_;
    last_good_outputs_current_ = outputs_current_;
    if (last_good_cell_ != cell_) {
        last_good_cell_ = cell_;
        last_good_cell_values_ = cell_values_;
    }
}

SolveOutcome Block::solve() {
    try {
        const double t = v_[in_temperature], pa = v_[in_pressure_anode], pc = v_[in_pressure_cathode];
        const double j_max = max_current_density(t, pa, pc);
        // Current-density and current specs are checked against the envelope and the limiting
        // current by the cell itself.
        const double j = solve_current_density(j_max);
        PointResult pr;
        evaluate_at(j, pr);
        fill_outputs(pr);
        fill_alarms(pr);
        fill_steady_state_outputs();
        last_current_density_ = j;
        commit_good_state();
    } catch (...) {
        roll_back();
        throw;
    }
    SolveOutcome out;
    out.warning = v_[alarm_any] > 0;
    if (out.warning) out.message = alarm_message();
    return out;
}

void Block::roll_back() {
    // Back to the last consistent state: spec, inputs, parameters and outputs of the last good
    // solve (or dynamic reset or step).
    v_ = last_good_;
    spec_ = last_good_spec_;
    cell_ = last_good_cell_;
    cell_values_ = last_good_cell_values_;
    rectifier_rated_power_ = last_good_rating_;
    outputs_current_ = last_good_outputs_current_;
}

void Block::commit_good_state() {
    has_solution_ = true;
    outputs_current_ = true;
    keep_state_for_rollback();
}

void Block::fill_steady_state_outputs() {
    // A steady solve is production at in.temperature with the coolant taking the whole duty.
    v_[stack_temperature] = v_[in_temperature];
    v_[gas_h2_in_o2_stack] = v_[gas_h2_in_o2];
    v_[heat_released] = v_[heat_duty] + v_[heat_loss];
    v_[heat_heater] = 0.0;
    v_[heat_to_coolant] = v_[heat_duty];
    v_[coolant_flow] = kNaN;
    v_[coolant_outlet_temperature] = kNaN;
    v_[state_mode] = static_cast<double>(Mode::production);
    v_[state_hours_operated] = v_[in_hours_operated];
    v_[state_starts] = 0.0;
}

double Block::heat_loss_at(double temperature) const {
    return v_[par_heat_loss_coefficient] * design_.stacks() * (temperature - v_[in_ambient_temperature]);
}

}  // namespace ely
