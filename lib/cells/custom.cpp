// Custom cell from a table of competing half-reactions (PHYSICS.md, "Competing reactions").
// At each electrode all reactions see one electrode potential Φ; each reaction k has its own
// Nernst potential E_k and kinetics j_k(η_k), and Σ_k j_k(Φ) = j is solved for Φ by a bracketed,
// safeguarded Newton iteration (bisection whenever Newton leaves the bracket or stalls).
#include "cells/custom.hpp"

#include <algorithm>
#include <cmath>
#include <deque>
#include <fmt/format.h>
#include <limits>
#include <memory>
#include <string>

#include "base/check.hpp"
#include "thermo/constants.hpp"
#include "thermo/reaction.hpp"

namespace ely {
namespace {

// Exponent arguments are clamped here: e^600 ≈ 4e260 keeps every current finite (and far above
// any current density the envelope admits) while the sums stay monotone.
constexpr double kExponentClamp = 600.0;
// An exchange current density without activation energy is accepted this close to its reference
// temperature (K): a temperature converted from °C may differ from it in the last digits.
constexpr double kReferenceTemperatureTolerance = 1e-6;
double clamped_exp(double x) { return std::exp(std::clamp(x, -kExponentClamp, kExponentClamp)); }

struct CurrentAndSlope {
    double current;  // A/m²
    double slope;    // dj/dη, A/(m² V)
};

// j = j0 (E_f − E_b)/(1 + r E_f), r = j0/j_lim, E_f = e^{a η}, E_b = e^{−b η}; written so that no
// intermediate overflows: for η >= 0 numerator and denominator are divided by E_f (and the slope
// by E_f²).
CurrentAndSlope limited_bv(double eta, double j0, double a, double b, double r) {
    if (eta >= 0.0) {
        const double emx = clamped_exp(-a * eta);             // 1/E_f
        const double emxy = clamped_exp(-(a + b) * eta);      // E_b/E_f
        const double den = emx + r;
        const double current = j0 * (1.0 - emxy) / den;
        const double slope = j0 * (a * emx + b * emxy * emx + r * (a + b) * emxy) / (den * den);
        return {current, slope};
    }
    const double ef = clamped_exp(a * eta), eb = clamped_exp(-b * eta);
    const double den = 1.0 + r * ef;
    return {j0 * (ef - eb) / den, j0 * (a * ef + b * eb + r * (a + b) * ef * eb) / (den * den)};
}

const char* side_name(bool anode) { return anode ? "anode" : "cathode"; }

struct ElectrodeSolution {
    double potential;  // Φ vs SHE, V
    std::size_t main;  // index (within the electrode) of the reaction carrying the largest current
};

// Per half-reaction (anode first, then cathode) its share of the electrode current and its
// product rate: "reaction.<electrode>_<n>.current_efficiency", "....product_rate". Shared by
// copies of the cell, so the names stay where they are.
struct ReactionOutputs {
    std::deque<std::string> text;
    std::vector<VariableInfo> info;
};

std::shared_ptr<const ReactionOutputs> describe_reactions(const CustomCellSpec& spec) {
    auto out = std::make_shared<ReactionOutputs>();
    const auto keep = [&](std::string text) { return out->text.emplace_back(std::move(text)).c_str(); };
    auto add_for = [&](const std::vector<HalfReaction>& reactions, const char* electrode) {
        for (std::size_t k = 0; k < reactions.size(); ++k) {
            const auto& r = reactions[k];
            const std::string base = fmt::format("reaction.{}_{}.", electrode, k + 1);
            out->info.push_back(describe(keep(base + "current_efficiency"), "1", Causality::output,
                                         keep(fmt::format("share of the {} current carried by '{}' (product {})",
                                                          electrode, r.name, r.product)))
                                    .labelled(keep(fmt::format("{}: share of current", r.name)))
                                    .shown_in(display::percent));
            out->info.push_back(describe(keep(base + "product_rate"), "kg/s", Causality::output,
                                         keep(fmt::format("{} made by '{}', plant total (NaN without its molar mass)",
                                                          r.product, r.name)))
                                    .labelled(keep(fmt::format("{}: {} made", r.name, r.product)))
                                    .scaled(1e-3)
                                    .shown_in(display::kg_per_h));
        }
    };
    add_for(spec.anode, "anode");
    add_for(spec.cathode, "cathode");
    return out;
}

class CustomCell final : public Cell {
public:
    explicit CustomCell(CustomCellSpec spec) : spec_(std::move(spec)), outputs_(describe_reactions(spec_)) {
        has_species_ = true;
        for (const auto* side : {&spec_.anode, &spec_.cathode})
            for (const auto& h : *side) has_species_ = has_species_ && !h.species.empty();
        for (int side = 0; side < 2; ++side) {
            const bool anode = side == 0;
            for (const auto& h : anode ? spec_.anode : spec_.cathode) {
                makes_gas_[side] = makes_gas_[side] || reaction_makes_gas(h, anode);
                auto& kinds = term_components_.emplace_back();
                for (const auto& term : h.species) kinds.push_back(component_of(term.species));
            }
        }
    }
    const Envelope& envelope() const override { return spec_.envelope; }
    std::unique_ptr<Cell> clone() const override { return std::make_unique<CustomCell>(*this); }
    double current_density_limit(const OperatingPoint& p) const override {
        return std::min({spec_.envelope.current_density_max, limit_sum(spec_.anode, p.temperature),
                         limit_sum(spec_.cathode, p.temperature)});
    }
    CellResult evaluate(const OperatingPoint& point) const override;
    const std::vector<VariableInfo>& own_outputs() const override { return outputs_->info; }
    void fill_own_outputs(const CellResult& r, const PlantFlows& flows, double* values) const override;

private:
    static double limit_sum(const std::vector<HalfReaction>& reactions, double t) {
        double s = 0.0;
        for (const auto& r : reactions) s += half_reaction_limiting_current_density(r, t);
        return s;
    }
    // Where a species of a reaction goes in the flux arrays: a product gas, liquid water, or neither (-1:
    // its enthalpy is counted in other_species_enthalpy).
    static int component_of(const SpeciesRecord& species) {
        if (species.phase == Phase::liquid && species.name == "H2O") return kH2O;
        if (species.phase != Phase::gas) return -1;
        if (species.name == "H2") return kH2;
        if (species.name == "O2") return kO2;
        if (species.name == "Cl2") return kCl2;
        return -1;
    }
    // A gas made in the electrolysis direction (a reduction's products at the cathode, its reactants at the
    // anode), or a product named as one of the stream gases.
    static bool reaction_makes_gas(const HalfReaction& h, bool anode) {
        if (h.species.empty()) return h.product == "H2" || h.product == "O2" || h.product == "Cl2";
        for (const auto& term : h.species)
            if (term.species.phase == Phase::gas && (anode ? term.coefficient < 0.0 : term.coefficient > 0.0)) return true;
        return false;
    }
    void fill_fluxes_from_species(CellResult& r, double j, double t) const;
    void fill_fluxes_from_products(CellResult& r, double j) const;
    // Solves Σ j_k = j at one electrode. `u_k` holds the reactions' equilibrium potentials
    // expressed in the electrode's driving variable u (u = Φ at the anode, u = −Φ at the
    // cathode, so that η_k = u − u_k); on return it holds the shares j_k/Σj_k.
    ElectrodeSolution solve_electrode(const std::vector<HalfReaction>& reactions, bool anode, double j, double t,
                                      double* u_k) const;
    CustomCellSpec spec_;
    bool has_species_ = false;  // every reaction has species: E_tn and the fluxes from them
    bool makes_gas_[2] = {false, false};             // anode, cathode: some reaction makes a gas
    std::vector<std::vector<int>> term_components_;  // per reaction (anode first), per species term
    std::shared_ptr<const ReactionOutputs> outputs_;
};

void CustomCell::fill_own_outputs(const CellResult& r, const PlantFlows& flows, double* values) const {
    const std::size_t na = spec_.anode.size();
    for (std::size_t k = 0; k < r.reaction_current_efficiency.size(); ++k) {
        const auto& reaction = k < na ? spec_.anode[k] : spec_.cathode[k - na];
        const double share = r.reaction_current_efficiency[k];
        values[2 * k] = share;
        values[2 * k + 1] = reaction.product_molar_mass > 0
                                ? custom_product_rate(reaction, share, r.current_density) * flows.active_area *
                                      reaction.product_molar_mass
                                : std::numeric_limits<double>::quiet_NaN();
    }
}

ElectrodeSolution CustomCell::solve_electrode(const std::vector<HalfReaction>& reactions, bool anode, double j,
                                              double t, double* u_k) const {
    const std::size_t n = reactions.size();
    const double f = kFaraday / (kGasConstant * t);
    const auto total = [&](double u) {
        CurrentAndSlope sum{0.0, 0.0};
        for (std::size_t k = 0; k < n; ++k) {
            const auto& kin = reactions[k].kinetics;
            const double j0 = half_reaction_exchange_current_density(reactions[k], anode, t);
            const auto c = limited_bv(u - u_k[k], j0, kin.alpha_forward * f, kin.alpha_backward * f,
                                      j0 / half_reaction_limiting_current_density(reactions[k], t));
            sum.current += c.current;
            sum.slope += c.slope;
        }
        return sum;
    };

    // Bracket: at the lowest equilibrium potential every reaction runs at η <= 0, so Σ j_k <= 0 <= j;
    // the upper end widens geometrically until Σ j_k >= j (j is below the sum of the limits).
    double lo = *std::min_element(u_k, u_k + n), hi = *std::max_element(u_k, u_k + n) + 0.05;
    double u = lo;
    double g_lo = total(lo).current - j;
    bool converged = g_lo == 0.0;
    if (!converged) {
        int widen = 0;
        while (total(hi).current - j < 0.0) {
            const double width = hi - lo;
            lo = hi;
            hi += 2.0 * width;
            if (++widen > 200)
                throw Error(ErrorKind::no_convergence,
                            fmt::format("custom cell: no {} potential found that carries {:g} A/m2", side_name(anode), j));
        }
        u = 0.5 * (lo + hi);
        double last_abs_g = std::numeric_limits<double>::infinity();
        bool force_bisection = false;
        for (int iter = 0; iter < 400; ++iter) {
            const auto c = total(u);
            const double g = c.current - j;
            if (g == 0.0) { converged = true; break; }
            if (g > 0.0) hi = u; else lo = u;
            double next = force_bisection || !(c.slope > 0.0) ? 0.5 * (lo + hi) : u - g / c.slope;
            if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
            force_bisection = std::fabs(g) > 0.5 * last_abs_g;  // Newton stalled: bisect next time
            last_abs_g = std::fabs(g);
            const double scale = std::max(1.0, std::fabs(next));
            if (std::fabs(next - u) <= 4e-16 * scale || hi - lo <= 4e-16 * scale) {
                u = next;
                converged = true;
                break;
            }
            u = next;
        }
    }
    if (!converged)
        throw Error(ErrorKind::no_convergence,
                    fmt::format("custom cell: {} potential solve did not converge for {:g} A/m2", side_name(anode), j));

    // Shares: j_k/Σj_k (Σ j_k = j to rounding); at j = 0 the differential shares dj_k/du / Σ dj_k/du,
    // the split of a small added current.
    double sum_current = 0.0, sum_slope = 0.0, largest = -std::numeric_limits<double>::infinity();
    std::size_t main = 0;
    for (std::size_t k = 0; k < n; ++k) {
        const auto& kin = reactions[k].kinetics;
        const double j0 = half_reaction_exchange_current_density(reactions[k], anode, t);
        const auto c = limited_bv(u - u_k[k], j0, kin.alpha_forward * f, kin.alpha_backward * f,
                                  j0 / half_reaction_limiting_current_density(reactions[k], t));
        sum_current += c.current;
        sum_slope += c.slope;
        if (c.current > largest) { largest = c.current; main = k; }
    }
    const bool differential = !(j > 0.0 && sum_current > 0.0);
    for (std::size_t k = 0; k < n; ++k) {
        const auto& kin = reactions[k].kinetics;
        const double j0 = half_reaction_exchange_current_density(reactions[k], anode, t);
        const auto c = limited_bv(u - u_k[k], j0, kin.alpha_forward * f, kin.alpha_backward * f,
                                  j0 / half_reaction_limiting_current_density(reactions[k], t));
        u_k[k] = differential ? c.slope / sum_slope : c.current / sum_current;
    }
    return {anode ? u : -u, main};
}

CellResult CustomCell::evaluate(const OperatingPoint& p) const {
    CellResult r;
    r.warnings = check_envelope(spec_.envelope, p, "custom");
    const double t = p.temperature, j = p.current_density;
    // Wet gases leave saturated over the electrolyte: an electrode that makes gas needs a pressure above
    // the water vapour pressure over it (the water cells' rule; refused, never a negative flow).
    if (spec_.water_activity > 0.0) {
        if (makes_gas_[0]) wet_gas_partial_pressure(p.pressure_anode, t, spec_.water_activity, "custom cell: anode pressure");
        if (makes_gas_[1])
            wet_gas_partial_pressure(p.pressure_cathode, t, spec_.water_activity, "custom cell: cathode pressure");
    }
    for (int side = 0; side < 2; ++side) {
        const bool anode = side == 0;
        const double limit = limit_sum(anode ? spec_.anode : spec_.cathode, t);
        if (j >= limit)
            throw Error(ErrorKind::out_of_range,
                        fmt::format("custom cell: current density {:g} A/m2 is at or above the sum of the limiting "
                                    "current densities of the {} reactions, {:g} A/m2",
                                    j, side_name(anode), limit));
        if (j > 0.95 * limit) r.warnings |= kWarnNearLimitingCurrent;
    }

    const std::size_t na = spec_.anode.size(), nc = spec_.cathode.size();
    auto& shares = r.reaction_current_efficiency;
    shares.assign(na + nc, 0.0);  // used as scratch first
    for (std::size_t k = 0; k < na; ++k) shares[k] = half_reaction_equilibrium_potential(spec_.anode[k], true, t);
    for (std::size_t k = 0; k < nc; ++k)
        shares[na + k] = -half_reaction_equilibrium_potential(spec_.cathode[k], false, t);
    // The solves overwrite the scratch with the shares; the main reactions' potentials are recomputed below.
    const auto anode_solution = solve_electrode(spec_.anode, true, j, t, shares.data());
    const auto cathode_solution = solve_electrode(spec_.cathode, false, j, t, shares.data() + na);
    const auto& anode_main = spec_.anode[anode_solution.main];
    const auto& cathode_main = spec_.cathode[cathode_solution.main];
    const double e_anode = half_reaction_equilibrium_potential(anode_main, true, t);
    const double e_cathode = half_reaction_equilibrium_potential(cathode_main, false, t);

    r.current_density = j;
    r.reversible_voltage = e_anode - e_cathode;
    r.activation_anode = anode_solution.potential - e_anode;
    r.activation_cathode = e_cathode - cathode_solution.potential;
    r.ohmic = j * spec_.area_specific_resistance *
              std::exp(spec_.area_specific_resistance_activation_energy / kGasConstant *
                       (1.0 / t - 1.0 / spec_.area_specific_resistance_reference_temperature));
    r.concentration = 0.0;  // transport limits act inside each reaction's kinetics (activation terms)
    r.voltage = r.reversible_voltage + r.activation_anode + r.activation_cathode + r.ohmic + r.concentration;

    if (std::isfinite(spec_.thermoneutral_voltage)) {
        r.thermoneutral_voltage = spec_.thermoneutral_voltage;
    } else if (has_species_) {
        double enthalpy = 0.0;  // J per mol of electrons through the cell, electrolysis direction
        for (std::size_t k = 0; k < na; ++k)
            enthalpy -= shares[k] * half_reaction_enthalpy_per_electron(spec_.anode[k], t);
        for (std::size_t k = 0; k < nc; ++k)
            enthalpy += shares[na + k] * half_reaction_enthalpy_per_electron(spec_.cathode[k], t);
        r.thermoneutral_voltage = enthalpy / kFaraday;
    } else {
        r.thermoneutral_voltage = thermoneutral_voltage_hhv(t);  // a water-splitting table (make_custom_cell)
    }

    // Efficiencies and fluxes.
    r.faraday_efficiency = shares[na];
    for (std::size_t k = 0; k < nc; ++k)
        if (spec_.cathode[k].product == "H2") { r.faraday_efficiency = shares[na + k]; break; }
    if (has_species_) fill_fluxes_from_species(r, j, t);
    else fill_fluxes_from_products(r, j);
    r.heat_from_thermoneutral_voltage = std::isfinite(spec_.thermoneutral_voltage) && !has_species_ &&
                                        !water_only_table(spec_);
    r.gases_saturated = spec_.water_activity > 0.0;
    r.water_activity_anode = r.water_activity_cathode = spec_.water_activity;
    return r;
}

// Species rates from the shares: reaction k carries share_k·j/F of electrons; written as a reduction
// (ν_i per n electrons), it runs forwards at the cathode and backwards at the anode. The stream gases
// (H2, O2, Cl2) go to the flux arrays, net over the cell, on the side that makes them; liquid water to
// consumed; every other species (ions, metals, melts) only to the enthalpy flow.
void CustomCell::fill_fluxes_from_species(CellResult& r, double j, double t) const {
    const std::size_t na = spec_.anode.size(), nc = spec_.cathode.size();
    Fluxes made[2]{}, used{};
    double other_enthalpy = 0.0;
    for (std::size_t k = 0; k < na + nc; ++k) {
        const bool anode = k < na;
        const auto& h = anode ? spec_.anode[k] : spec_.cathode[k - na];
        const double electrons = r.reaction_current_efficiency[k] * j / kFaraday;
        const double scale = (anode ? -electrons : electrons) / h.electrons;
        const auto& kinds = term_components_[k];
        for (std::size_t i = 0; i < h.species.size(); ++i) {
            const double rate = scale * h.species[i].coefficient;
            const int c = kinds[i];
            if (c < 0) {
                other_enthalpy += rate * species_properties(h.species[i].species, t).enthalpy;
            } else if (rate > 0.0 && c != kH2O) {
                made[anode ? 0 : 1][c] += rate;
            } else {
                used[c] -= rate;  // water formed counts as negative use
            }
        }
    }
    for (int c : {kH2, kO2, kCl2}) {
        const double total = made[0][c] + made[1][c], net = total - used[c];
        if (net >= 0.0) {
            if (total > 0.0) {
                r.anode_out[c] = net * (made[0][c] / total);
                r.cathode_out[c] = net * (made[1][c] / total);
            }
        } else {
            r.consumed[c] = -net;  // a gas the reactions take up more of than they make
        }
    }
    r.consumed[kH2O] = used[kH2O];
    r.other_species_enthalpy = other_enthalpy;
}

// A table without species: the products named H2, O2 and Cl2 fill the flux arrays; an anode making O2 is
// water oxidation in acid form (2 H2O → O2 + 4 H⁺ + 4 e⁻).
void CustomCell::fill_fluxes_from_products(CellResult& r, double j) const {
    const std::size_t na = spec_.anode.size(), nc = spec_.cathode.size();
    for (std::size_t k = 0; k < na + nc; ++k) {
        const bool anode = k < na;
        const auto& reaction = anode ? spec_.anode[k] : spec_.cathode[k - na];
        const double rate = custom_product_rate(reaction, r.reaction_current_efficiency[k], j);
        Fluxes& out = anode ? r.anode_out : r.cathode_out;
        if (reaction.product == "H2") out[kH2] += rate;
        else if (reaction.product == "O2") {
            out[kO2] += rate;
            if (anode) r.consumed[kH2O] += 2.0 * rate;
        } else if (reaction.product == "Cl2") out[kCl2] += rate;
    }
}

void check_reaction(const HalfReaction& h, bool anode, std::size_t index) {
    const auto where = [&](const char* field) {
        return fmt::format("custom cell: {} reaction {} '{}': {}", side_name(anode), index + 1, h.name, field);
    };
    if (h.name.empty()) throw Error(ErrorKind::invalid_argument, where("name is empty"));
    if (h.product.empty()) throw Error(ErrorKind::invalid_argument, where("product is empty"));
    if (h.electrons < 1)
        throw Error(ErrorKind::invalid_argument, where("electrons") + fmt::format(" {} must be at least 1", h.electrons));
    require_finite(h.standard_potential, where("standard potential").c_str());
    require_finite(h.standard_potential_temperature_coefficient, where("standard potential temperature coefficient").c_str());
    require_positive(h.reactant_activity, where("reactant activity").c_str());
    require_positive(h.product_activity, where("product activity").c_str());
    require_positive(h.kinetics.exchange_current_density, where("exchange current density").c_str());
    if (!std::isnan(h.kinetics.activation_energy)) {  // NaN: not given (see HalfReaction)
        require_finite(h.kinetics.activation_energy, where("activation energy").c_str());
        if (h.kinetics.activation_energy < 0.0)
            throw Error(ErrorKind::invalid_argument,
                        where("activation energy") + fmt::format(" {:g} J/mol is negative", h.kinetics.activation_energy));
    }
    require_positive(h.kinetics.reference_temperature, where("kinetics reference temperature").c_str());
    require_positive(h.kinetics.alpha_forward, where("alpha forward").c_str());
    require_positive(h.kinetics.alpha_backward, where("alpha backward").c_str());
    require_finite(h.limiting_current_activation_energy, where("limiting current activation energy").c_str());
    if (!(h.limiting_current_density > 0.0))  // +inf allowed, NaN not
        throw Error(ErrorKind::invalid_argument,
                    where("limiting current density") + fmt::format(" {} must be positive (or inf for none)",
                                                                    h.limiting_current_density));
    if (!h.species.empty()) {
        double charge = 0.0;
        for (const auto& term : h.species) {
            require_finite(term.coefficient, where(("coefficient of " + term.species.name).c_str()).c_str());
            charge += term.coefficient * term.species.charge;
        }
        if (std::fabs(charge + h.electrons) > 1e-9)
            throw Error(ErrorKind::invalid_argument,
                        where("species") + fmt::format(": written as a reduction with {} electrons, the charges must "
                                                       "sum to -{}; they sum to {:g}",
                                                       h.electrons, h.electrons, charge));
    }
    require_finite(h.product_molar_mass, where("product molar mass").c_str());
    if (h.product_molar_mass < 0.0)
        throw Error(ErrorKind::invalid_argument,
                    where("product molar mass") + fmt::format(" {:g} kg/mol is negative", h.product_molar_mass));
}

}  // namespace

double limited_butler_volmer_current(double overpotential, double j0, double alpha_forward, double alpha_backward,
                                     double limiting_current_density, double temperature) {
    require_finite(overpotential, "overpotential");
    require_positive(j0, "exchange current density");
    require_positive(alpha_forward, "forward transfer coefficient");
    require_positive(alpha_backward, "backward transfer coefficient");
    require_positive(temperature, "temperature");
    if (!(limiting_current_density > 0.0))
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("limiting current density {} must be positive (or inf for none)", limiting_current_density));
    const double f = kFaraday / (kGasConstant * temperature);
    return limited_bv(overpotential, j0, alpha_forward * f, alpha_backward * f, j0 / limiting_current_density).current;
}

double half_reaction_exchange_current_density(const HalfReaction& h, bool at_anode, double temperature) {
    const auto& k = h.kinetics;
    if (std::isnan(k.activation_energy)) {
        // Known only at the reference temperature: no silent Arrhenius factor of 1 elsewhere.
        if (std::fabs(temperature - k.reference_temperature) > kReferenceTemperatureTolerance)
            throw Error(ErrorKind::out_of_range,
                        fmt::format("custom cell: {} reaction '{}': activation_energy is not given, so its exchange "
                                    "current density is known only at its reference temperature {:g} K; the cell runs "
                                    "at {:g} K: give the activation energy (or a reference temperature equal to the "
                                    "operating one)",
                                    side_name(at_anode), h.name, k.reference_temperature, temperature));
        return k.exchange_current_density;
    }
    return exchange_current_density(k, temperature);
}

double half_reaction_enthalpy_per_electron(const HalfReaction& h, double temperature) {
    if (h.species.empty()) return std::numeric_limits<double>::quiet_NaN();
    return half_reaction_per_electron(h.species, h.electrons, temperature).enthalpy;
}

double half_reaction_equilibrium_potential(const HalfReaction& h, bool at_anode, double temperature) {
    const double e0 = h.species.empty()
                          ? h.standard_potential +
                                h.standard_potential_temperature_coefficient * (temperature - kStandardTemperature)
                          : -half_reaction_per_electron(h.species, h.electrons, temperature).gibbs / kFaraday;
    // a_ox/a_red: the reactant is the oxidized species at the cathode, the reduced one at the anode.
    const double ratio = at_anode ? h.product_activity / h.reactant_activity : h.reactant_activity / h.product_activity;
    return e0 + kGasConstant * temperature / (h.electrons * kFaraday) * std::log(ratio);
}

double half_reaction_limiting_current_density(const HalfReaction& h, double temperature) {
    if (!(h.limiting_current_activation_energy != 0.0) || std::isinf(h.limiting_current_density))
        return h.limiting_current_density;
    return h.limiting_current_density * std::exp(-h.limiting_current_activation_energy / kGasConstant *
                                                 (1.0 / temperature - 1.0 / h.kinetics.reference_temperature));
}

double custom_product_rate(const HalfReaction& h, double share, double current_density) {
    return share * current_density / (h.electrons * kFaraday);
}

std::vector<double> custom_product_rates(const CustomCellSpec& spec, const CellResult& result) {
    const std::size_t na = spec.anode.size(), nc = spec.cathode.size();
    if (result.reaction_current_efficiency.size() != na + nc)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("custom product rates: the result has {} reaction shares, the spec {} reactions",
                                result.reaction_current_efficiency.size(), na + nc));
    std::vector<double> rates(na + nc);
    for (std::size_t k = 0; k < na + nc; ++k)
        rates[k] = custom_product_rate(k < na ? spec.anode[k] : spec.cathode[k - na], result.reaction_current_efficiency[k],
                                       result.current_density);
    return rates;
}

CustomCellSpec complete_custom_spec(const CustomCellSpec& spec) {
    if (spec.anode.empty()) throw Error(ErrorKind::invalid_argument, "custom cell: the anode has no reactions");
    if (spec.cathode.empty()) throw Error(ErrorKind::invalid_argument, "custom cell: the cathode has no reactions");
    if (spec.anode.size() > kMaxReactions || spec.cathode.size() > kMaxReactions)
        throw Error(ErrorKind::invalid_argument, fmt::format("custom cell: at most {} reactions per electrode", kMaxReactions));
    for (std::size_t k = 0; k < spec.anode.size(); ++k) check_reaction(spec.anode[k], true, k);
    for (std::size_t k = 0; k < spec.cathode.size(); ++k) check_reaction(spec.cathode[k], false, k);
    require_finite(spec.area_specific_resistance, "custom cell: area-specific resistance");
    require_finite(spec.area_specific_resistance_activation_energy, "custom cell: activation energy of the resistance");
    require_positive(spec.area_specific_resistance_reference_temperature,
                     "custom cell: reference temperature of the resistance");
    if (spec.area_specific_resistance < 0.0)
        throw Error(ErrorKind::invalid_argument,
                    fmt::format("custom cell: area-specific resistance {:g} ohm m2 is negative", spec.area_specific_resistance));
    const Envelope& e = spec.envelope;
    require_positive(e.temperature_min, "custom cell envelope: minimum temperature");
    require_positive(e.pressure_min, "custom cell envelope: minimum pressure");
    require_positive(e.current_density_max, "custom cell envelope: maximum current density");
    require_finite(e.temperature_max, "custom cell envelope: maximum temperature");
    require_finite(e.pressure_max, "custom cell envelope: maximum pressure");
    require_finite(e.temperature_fit_min, "custom cell envelope: fit minimum temperature");
    require_finite(e.temperature_fit_max, "custom cell envelope: fit maximum temperature");
    if (e.temperature_min > e.temperature_max || e.pressure_min > e.pressure_max ||
        e.temperature_fit_min > e.temperature_fit_max)
        throw Error(ErrorKind::invalid_argument, "custom cell envelope: a minimum is above its maximum");
    if (!std::isnan(spec.thermoneutral_voltage)) require_finite(spec.thermoneutral_voltage, "custom cell: thermoneutral voltage");
    // Species data must cover the envelope's temperatures; without species the heat of the cell is
    // unknown unless the table is water splitting or a thermoneutral voltage is given.
    bool all_species = true, water_only = true;
    for (const auto* side : {&spec.anode, &spec.cathode})
        for (const auto& h : *side) {
            all_species = all_species && !h.species.empty();
            water_only = water_only && h.species.empty() && (h.product == "H2" || h.product == "O2");
            for (const auto& term : h.species)
                if (term.species.temperature_min > e.temperature_min || term.species.temperature_max < e.temperature_max)
                    throw Error(ErrorKind::invalid_argument,
                                fmt::format("custom cell: reaction '{}': the data of species {} ({}) cover "
                                            "{:g}..{:g} K, not the cell's {:g}..{:g} K",
                                            h.name, term.species.name, phase_name(term.species.phase),
                                            term.species.temperature_min, term.species.temperature_max,
                                            e.temperature_min, e.temperature_max));
        }
    if (std::isnan(spec.thermoneutral_voltage) && !all_species && !water_only)
        throw Error(ErrorKind::invalid_argument,
                    "custom cell: the reactions have no enthalpy data (species) and the table is not water splitting: "
                    "give every reaction its species, or the thermoneutral voltage");
    if (!std::isnan(spec.thermoneutral_voltage) && all_species)
        throw Error(ErrorKind::invalid_argument,
                    "custom cell: every reaction gives its species, so the thermoneutral voltage follows from their "
                    "enthalpies; do not give it as well");
    // The water activity of the electrolyte: given, or 1 for an aqueous table and 0 for a dry one (a melt).
    CustomCellSpec built = spec;
    if (std::isnan(built.water_activity)) {
        bool aqueous = !all_species;
        for (const auto* side : {&spec.anode, &spec.cathode})
            for (const auto& h : *side)
                for (const auto& term : h.species)
                    aqueous = aqueous || term.species.phase == Phase::aqueous ||
                              (term.species.phase == Phase::liquid && term.species.name == "H2O");
        built.water_activity = aqueous ? 1.0 : 0.0;
    }
    require_within(built.water_activity, 0.0, 1.0, "custom cell: water activity", "");
    // A product's molar mass, when not given, from the reaction's species of that name, or for a stream gas.
    for (auto* side : {&built.anode, &built.cathode})
        for (auto& h : *side) {
            if (!(h.product_molar_mass > 0.0))
                for (const auto& term : h.species)
                    if (term.species.name == h.product) h.product_molar_mass = term.species.molar_mass;
            for (const Species gas : {Species::hydrogen, Species::oxygen, Species::chlorine})
                if (!(h.product_molar_mass > 0.0) && h.product == species_name(gas))
                    h.product_molar_mass = species_molar_mass(gas);
        }
    return built;
}

std::unique_ptr<Cell> make_custom_cell(const CustomCellSpec& spec) {
    return std::make_unique<CustomCell>(complete_custom_spec(spec));
}

bool water_only_table(const CustomCellSpec& spec) {
    for (const auto* side : {&spec.anode, &spec.cathode})
        for (const auto& h : *side)
            if (!h.species.empty() || (h.product != "H2" && h.product != "O2")) return false;
    return true;
}

}  // namespace ely
