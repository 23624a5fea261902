#pragma once
// The PEM plant at a chunk of points, several points per instruction: the operations of the scalar
// solve at the current-density spec (cells/pem/pem.cpp, cells/cell_support.cpp, electrochem/*,
// thermo/reaction.cpp and water.cpp, unit/spec_solve.cpp evaluate_at, unit/streams.cpp, unit/alarms.cpp)
// in the same order per lane, so that every output equals the scalar one up to the rounding of the
// vector exp/log/log1p/asinh (about 1 ulp; test batch.equals_scalar). Branches of the scalar code
// become selects; a point that would take a branch this kernel leaves out (an error, open circuit,
// standby, steam feed) is marked "not taken" and solved by the caller on the scalar path. The IF97 and
// Shomate sums are the very templates the scalar thermodynamics evaluate (thermo/thermo_kernels.hpp).
//
// Included only by kernel_*.cpp, each of which names its lane namespace and SIMD type first.
#include <cstddef>
#include <limits>
#include <type_traits>

#include "batch/lanes_simd.hpp"
#include "batch/pem_kernel_types.hpp"
#include "thermo/constants.hpp"
#include "thermo/thermo_kernels.hpp"
#include "thermo/water.hpp"

ELY_KERNEL_BEGIN
namespace batch_kernel {

// Everything it calls inlined (flatten): the vector exp, log, log1p and the IF97 sums of one vector of points
// are independent chains the processor then overlaps, where calls run them one after the other.
template <class V>
#if defined(__GNUC__)
__attribute__((flatten))
#endif
inline void pem_points(const batch::PemConstants& k, const batch::PemChunk& c) {
    using lanes::exp;
    using lanes::log;
    using lanes::max;
    using lanes::min;
    using lanes::select;
    using M = lanes::mask_t<V>;
    constexpr std::size_t W = static_cast<std::size_t>(lanes::ops<V>::size);
    const V zero(0.0), one(1.0);
    const V nan(std::numeric_limits<double>::quiet_NaN());
    const double F = kFaraday, R = kGasConstant;
    const double M_H2 = molar_mass::H2, M_O2 = molar_mass::O2, M_H2O = molar_mass::H2O;
    const auto& d = k.thermo;
    // Liquid water on the molar reference (water.cpp liquid_water): IAPWS-IF97 region 1.
    const auto liquid_enthalpy = [&](const auto& temperature_part, const V& pressure) {
        return d.liquid_formation_enthalpy +
               M_H2O * (kernel::region1_enthalpy(temperature_part, pressure) - d.region1_h_ref);
    };
    // The feed water's temperature is the batch's: the temperature part of region 1 once.
    const auto feed_part = kernel::region1_temperature(k.feed_temperature, false);
    // The gas coolers' outlet at the batch's value (used where every lane of a vector is at least as warm).
    const auto fixed_cool_part = kernel::region1_temperature(k.gas_cooler_temperature, false);
    const double fixed_cool_p_sat = kernel::saturation_pressure_eq30(k.gas_cooler_temperature);
    const double fixed_cool_h_vapour = kernel::water_vapour_enthalpy_low(d, k.gas_cooler_temperature);
    const double fixed_cool_h_h2 = kernel::shomate_enthalpy(*d.hydrogen, 0.0, k.gas_cooler_temperature / 1000.0);
    const double fixed_cool_h_o2 = kernel::shomate_enthalpy(*d.oxygen, 0.0, k.gas_cooler_temperature / 1000.0);
    const double hhv = -kLiquidWaterFormationEnthalpy / M_H2, lhv = -kWaterVapourFormationEnthalpy / M_H2;
    const double area_total = k.cells * k.stacks * k.area;
    struct Thermal {  // the terms of the stack temperature alone, for the lanes' temperatures ts
        V ts, p_sat, inv_t, h_h2, h_o2, dh, e0, j0a, j0c, sigma, asr, h2_perm, o2_perm;
    } th{};  // once per chunk
    bool have_thermal = false;
    // Divisions by the batch's constants as products with their reciprocals (a vector division costs
    // about ten products; the results move by an ulp or so, as the vector exp/log do).
    const double inv_2F = 1.0 / (2.0 * F), inv_4F = 1.0 / (4.0 * F), inv_F = 1.0 / F, R_2F = R / (2.0 * F);
    const double R_F_alpha_a = R / (F * k.alpha_anode), R_F_alpha_c = R / (F * k.alpha_cathode);
    const double inv_p0 = 1.0 / kStandardPressure, inv_thickness = 1.0 / k.thickness;
    const double inv_jl = 1.0 / k.limiting_current_density;
    // NIST Shomate enthalpy and entropy (thermo_kernels.hpp shomate_enthalpy, shomate_entropy) with the
    // divisions by t, t² and 3 as products with 1/t and 1/3.
    const auto shomate_h = [](const ShomateCoefficients& s, const V& t, const V& t2, const V& t3, const V& t4,
                              const V& inv_t) {
        return 1000.0 * (s.A * t + s.B * t2 * 0.5 + s.C * t3 * (1.0 / 3.0) + s.D * t4 * 0.25 - s.E * inv_t + s.F - s.H);
    };
    const auto shomate_s = [](const ShomateCoefficients& s, const V& t, const V& t2, const V& t3, const V& inv_t2,
                              const V& log_t) {
        return s.A * log_t + s.B * t + s.C * t2 * 0.5 + s.D * t3 * (1.0 / 3.0) - s.E * 0.5 * inv_t2 + s.G;
    };

    for (std::size_t i = 0; i < c.count; i += W) {
        const V j = V::load_unaligned(c.current_density + i);
        const V t = V::load_unaligned(c.temperature + i);
        const V pc = V::load_unaligned(c.pressure_cathode + i);
        const V pa = V::load_unaligned(c.pressure_anode + i);
        // An output asked for is stored; one not asked for is not computed (its expression is a lambda).
        const auto put = [&](Var v, const auto& x) {
            if (double* o = c.out[v]) {
                if constexpr (std::is_invocable_v<decltype(x)>) {
                    const V value = x();
                    value.store_unaligned(o + i);
                } else {
                    x.store_unaligned(o + i);
                }
            }
        };

        // The inputs' limits (Block::set refuses a value outside them, or not finite): the scalar path says so.
        M skip = M(false);
        const V per_point[4] = {c.spec == 0 ? j : V::load_unaligned(c.target + i), t, pc, pa};
        for (int n = 0; n < 4; ++n) {
            const batch::InputLimit& l = c.limits[n];
            if (!l.check) continue;
            const V x = per_point[n];
            skip = skip || !(lanes::abs(x) <= std::numeric_limits<double>::max()) || x > l.max ||
                   (l.min_exclusive ? !(x > l.min) : x < l.min);
        }
        // Envelope (cell.cpp check_envelope): outside it the scalar solve fails; j = 0 is open circuit.
        skip = skip || !(t >= k.t_min && t <= k.t_max && pa >= k.p_min && pa <= k.p_max && pc >= k.p_min && pc <= k.p_max);
        if (c.spec == 0) skip = skip || !(j > zero && j <= k.j_max && j < k.limiting_current_density);
        // Keep the lanes that are not taken finite and inside every range (their results are dropped).
        const V ts = select(skip, V(0.5 * (k.t_min + k.t_max)), t);
        const V pcs = select(skip, V(k.p_max), pc);
        const V pas = select(skip, V(k.p_max), pa);

        // ---- the terms of the stack temperature alone: thermodynamics (reaction.cpp, water.cpp,
        // species.cpp) and the cell's Arrhenius factors (pem.cpp). Once per distinct temperature: kept
        // from the previous vector when every lane has its temperature (a sweep at one temperature, a
        // profile's runs), else computed (one compare when every point has its own).
        if (!(have_thermal && lanes::all_lanes(ts == th.ts))) {
            have_thermal = true;
            th.ts = ts;
            th.p_sat = kernel::saturation_pressure_eq30(ts);
            th.inv_t = 1.0 / ts;
            const V tt = ts * 1e-3, inv_tt = 1000.0 * th.inv_t;
            const V tt2 = tt * tt, tt3 = tt2 * tt, tt4 = tt3 * tt, inv_tt2 = inv_tt * inv_tt;
            const V log_tt = log(tt);
            th.h_h2 = shomate_h(*d.hydrogen, tt, tt2, tt3, tt4, inv_tt);
            th.h_o2 = shomate_h(*d.oxygen, tt, tt2, tt3, tt4, inv_tt);
            const V s_h2 = shomate_s(*d.hydrogen, tt, tt2, tt3, inv_tt2, log_tt);
            const V s_o2 = shomate_s(*d.oxygen, tt, tt2, tt3, inv_tt2, log_tt);
            const auto w = kernel::region1_enthalpy_entropy(kernel::region1_temperature(ts, false),
                                                            max(V(kStandardPressure), th.p_sat));
            const V h_w = d.liquid_formation_enthalpy + M_H2O * (w.enthalpy - d.region1_h_ref);
            const V s_w = d.liquid_entropy_298 + M_H2O * (w.entropy - d.region1_s_ref);
            th.dh = th.h_h2 + 0.5 * th.h_o2 - h_w;
            const V ds = s_h2 + 0.5 * s_o2 - s_w;
            th.e0 = (th.dh - ts * ds) * inv_2F;
            const V x_t = th.inv_t - k.inverse_reference_temperature;
            th.j0a = k.j0_anode * exp(k.ea_anode * x_t);
            th.j0c = k.j0_cathode * exp(k.ea_cathode * x_t);
            th.sigma = k.sigma_303_percent * exp(1268.0 * (1.0 / 303.0 - th.inv_t));
            th.asr = k.thickness / th.sigma + k.contact_resistance;
            th.h2_perm = k.h2_permeability * exp(k.h2_ea * x_t);
            th.o2_perm = k.o2_permeability * exp(k.o2_ea * x_t);
        }
        const V p_sat = th.p_sat, h_h2 = th.h_h2, h_o2 = th.h_o2, dh = th.dh, e0 = th.e0;
        const V j0a = th.j0a, j0c = th.j0c, asr = th.asr, h2_perm = th.h2_perm, o2_perm = th.o2_perm;
        skip = skip || !(pcs > p_sat) || !(pas > p_sat);
        const V p_h2 = pcs - p_sat, p_o2 = pas - p_sat;
        const V q = (p_h2 * inv_p0) * lanes::sqrt(p_o2 * inv_p0);
        const V rt_2f = R_2F * ts;
        const V e_rev = e0 + rt_2f * log(q);
        const auto e_tn = [&] { return V(dh * inv_2F); };

        // ---- cell (pem.cpp evaluate) ----
        const V b_a = R_F_alpha_a * ts, b_c = R_F_alpha_c * ts;  // Tafel slopes RT/(αF)
        // The spec solves (spec_solve.cpp): the current density at which the stack power or the cell
        // voltage meets the drive value, by Newton on the analytic derivative of the voltage, safeguarded
        // by bisection in [0, j_max] per lane; converged to a few ulp (as the scalar path's Brent is). Drive values beyond j_max are infeasible, those below the crossover (standby) or
        // zero go to the scalar path.
        V js;
        if (c.spec == 0) {
            js = select(skip, V(0.5 * k.limiting_current_density), j);
        } else {
            const V target = V::load_unaligned(c.target + i);
            const double kp = k.area * k.stacks * k.cells;
            const V ba = b_a, bc = b_c;
            const V two_j0a = 2.0 * j0a, two_j0c = 2.0 * j0c;
            const V inv_two_j0a = 1.0 / two_j0a, inv_two_j0c = 1.0 / two_j0c;
            const V b_conc = rt_2f;
            const double r_deg = k.degradation_resistance * k.hours, v_deg = k.degradation_voltage * k.hours;
            // asinh(x/a) = ln((x + √(x² + a²))/a) for x >= 0, sharing the root with the derivative; the
            // concentration term as ln((j_lim − x)/j_lim). The iteration converges to the root of this
            // form, which differs from the kernel's own by a few ulp of the voltage.
            const double jl = k.limiting_current_density;
            const auto quantity = [&](const V& x, V& dq) {
                const V sa = lanes::sqrt(x * x + two_j0a * two_j0a), sc = lanes::sqrt(x * x + two_j0c * two_j0c);
                const V v = e_rev + log((x + sa) * inv_two_j0a) * ba + log((x + sc) * inv_two_j0c) * bc + x * asr + v_deg +
                            r_deg * x - b_conc * log((jl - x) * inv_jl);
                // One division for the three: ba/sa + bc/sc + b_conc/(jl − x).
                const V rest = jl - x;
                const V dv = (ba * sc * rest + bc * sa * rest + b_conc * (sa * sc)) / (sa * sc * rest) + asr + r_deg;
                if (c.spec == 1) {
                    dq = kp * (v + x * dv);
                    return kp * x * v;
                }
                dq = dv;
                return v;
            };
            V dq;
            skip = skip || !(target > zero);
            V lo = zero, hi = V(k.j_spec_max);
            V x = select(skip, V(0.5 * k.j_spec_max),
                         min(V(0.5 * k.j_spec_max), c.spec == 1 ? target / (kp * (e_rev + 0.5)) : V(0.5 * k.j_spec_max)));
            M active = !skip;
            for (int iteration = 0; iteration < 100 && lanes::any_lane(active); ++iteration) {
                const V g = quantity(x, dq) - target;
                const M above = g > zero;
                hi = select(above, x, hi);
                lo = select(above, lo, x);
                const V newton = x - g / dq;
                const M inside = (newton >= lo) && (newton <= hi);  // false for NaN too
                V next = select(inside, newton, 0.5 * (lo + hi));
                next = select(g == zero, x, next);
                // Converged: a Newton step below 1e-9 x leaves an error of the order of (1e-9)² x·x q''/q'
                // (quadratic convergence), below the rounding of the drive quantity; stopping at a step of
                // a few ulp instead let rounding noise keep lanes iterating after they had converged (the
                // power batch took four times as long). A bisection step counts only when the bracket has
                // collapsed.
                const M done = (inside && lanes::abs(next - x) <= 1e-9 * next) || (g == zero) ||
                               !(hi - lo > 2e-16 * hi);
                x = select(active, next, x);
                active = active && !done;
            }
            // A drive value above what j_max gives leaves the bracket's top as the answer: infeasible, for
            // the scalar path (which names it).
            skip = skip || !(x < k.j_spec_max * (1.0 - 4e-16));
            js = x;
        }
        const V conc = -rt_2f * lanes::log1p(-js * inv_jl);
        const V act_a = lanes::asinh(js / (2.0 * j0a)) * b_a;
        const V act_c = lanes::asinh(js / (2.0 * j0c)) * b_c;
        const V ohmic_cell = js * asr;
        M extrapolated = (ts < k.t_fit_min) || (ts > k.t_fit_max) || (js > 0.95 * k.limiting_current_density);

        // Crossover (pem.cpp crossover, electrochem/crossover.cpp) and the gases (cell_support.cpp).
        const V h2_x = select(p_h2 <= zero, zero, h2_perm * p_h2 * inv_thickness) +
                       select((pcs - pas) <= zero || p_h2 <= zero, zero, k.darcy * p_h2 * (pcs - pas) * inv_thickness);
        const V o2_x = select(p_o2 <= zero, zero, o2_perm * p_o2 * inv_thickness);
        const V h2_per_j = h2_perm * k.supersaturation * inv_thickness;
        const V h2_made = js * inv_2F, o2_made = js * inv_4F;
        const V h2_crossing = h2_x + h2_per_j * js;
        const V o2_burnt = min(0.5 * k.recombination_anode * h2_crossing, o2_made);
        const V o2_crossing = min(o2_x, o2_made - o2_burnt);
        const V o2_recombined = k.recombination_cathode * o2_crossing;
        const V h2_net = h2_made - h2_crossing - 2.0 * o2_recombined;
        const V c_h2 = h2_net;  // > 0 for the points taken (standby goes to the scalar path)
        const V c_o2 = o2_crossing - o2_recombined;
        const V a_o2 = o2_made - o2_crossing - o2_burnt;
        const V a_h2 = h2_crossing - 2.0 * o2_burnt;
        skip = skip || !(h2_net > zero) || !(a_o2 > zero);
        const V consumed_h2o = c_h2 + a_h2 - 0.0;
        const V h2_in_o2 = select(a_h2 > zero, a_h2 / (a_h2 + a_o2), zero);
        const V water_drag = k.drag * js * inv_F;

        // ---- stack (spec_solve.cpp evaluate_at) ----
        const V degradation = k.degradation_voltage * k.hours + k.degradation_resistance * k.hours * js;
        const V ohmic = ohmic_cell + degradation;
        const V voltage = e_rev + act_a + act_c + ohmic + conc;
        const V cathode_h2 = c_h2 * area_total, cathode_o2 = c_o2 * area_total;
        const V anode_h2 = a_h2 * area_total, anode_o2 = a_o2 * area_total;
        const V consumed_water = consumed_h2o * area_total;
        const V stack_i = js * k.area * k.stacks;
        const V stack_v = voltage * k.cells;
        const V power = stack_i * stack_v;

        // ---- streams (streams.cpp plant_streams) ----
        const V t_cool = min(ts, V(k.gas_cooler_temperature));
        skip = skip || (t_cool < 298.0);  // below the hydrogen fit's range: the scalar solve fails
        const V tcs = select(skip, ts, t_cool);
        // The water vapour of the streams, where an output asked for needs it.
        V dry[2] = {zero, zero}, vapour_stack[2] = {zero, zero}, vapour_out[2] = {zero, zero}, condensate[2] = {zero, zero};
        const V side_p[2] = {pcs, pas};
        const V side_h2[2] = {cathode_h2, anode_h2}, side_o2[2] = {cathode_o2, anode_o2};
        V p_sat_cool = zero;
        if (c.streams || c.energy) {
            p_sat_cool = kernel::saturation_pressure_eq30(tcs);
            for (int s = 0; s < 2; ++s) {
                dry[s] = side_h2[s] + side_o2[s] + 0.0 + 0.0;
                const V pv = 1.0 * p_sat;
                vapour_stack[s] = select(dry[s] > zero, dry[s] * pv / (side_p[s] - pv), zero);
                vapour_out[s] = select(dry[s] > zero && p_sat_cool < side_p[s],
                                       min(vapour_stack[s], dry[s] * p_sat_cool / (side_p[s] - p_sat_cool)), vapour_stack[s]);
                condensate[s] = vapour_stack[s] - vapour_out[s];
            }
        }
        const V drag = water_drag * area_total;
        const V drain = k.drag_returned ? zero : drag;
        const V makeup = consumed_water + vapour_out[0] + vapour_out[1] + drain + 0.0;

        // ---- rectifier and auxiliaries (streams.cpp fill_outputs) ----
        const double rated = k.rectifier_rated_power;
        const auto rect_loss = [&] {
            const V x_load = rated > 0 ? V(power / rated) : zero;
            return V(rated * (k.rectifier_no_load + k.rectifier_linear * x_load + k.rectifier_quadratic * x_load * x_load));
        };
        const auto aux = [&] { return V(k.auxiliaries_fixed + k.auxiliaries_proportional * power); };
        const auto plant_total = [&] { return V(power + rect_loss() + aux()); };

        // ---- energy balance (streams.cpp energy_balance), when an output asked for needs it ----
        const V loss = k.heat_loss_coefficient * k.stacks * (ts - k.ambient_temperature);
        const V condensate_total = condensate[0] + condensate[1];
        V duty = nan, gas_coolers = nan;
        if (c.energy) {
            const V p_liquid = max(pas, pcs);
            skip = skip || !(V(k.feed_saturation_pressure) < p_liquid);  // steam feed: scalar path
            // The gas coolers' outlet is the batch's where no stack is cooler (the usual case): the
            // temperature parts once, the same operations as per lane.
            const bool cool_fixed = !lanes::any_lane(tcs < k.gas_cooler_temperature);
            V h_liquid_cool, h_vapour_cool, h_h2_cool, h_o2_cool;
            if (cool_fixed) {
                h_liquid_cool = liquid_enthalpy(fixed_cool_part, max(p_liquid, V(fixed_cool_p_sat)));
                h_vapour_cool = V(fixed_cool_h_vapour), h_h2_cool = V(fixed_cool_h_h2), h_o2_cool = V(fixed_cool_h_o2);
            } else {
                h_liquid_cool = liquid_enthalpy(kernel::region1_temperature(tcs, false), max(p_liquid, p_sat_cool));
                h_vapour_cool = kernel::water_vapour_enthalpy_low(d, tcs);
                const V tc = tcs / 1000.0;
                h_h2_cool = kernel::shomate_enthalpy(*d.hydrogen, 0.0, tc);
                h_o2_cool = kernel::shomate_enthalpy(*d.oxygen, 0.0, tc);
            }
            const V h_vapour = kernel::water_vapour_enthalpy_low(d, ts);
            const auto dry_gas = [&](const V& n_h2, const V& n_o2, const V& h2, const V& o2) {
                return zero + select(n_h2 > zero, n_h2 * h2, zero) + select(n_o2 > zero, n_o2 * o2, zero);
            };
            const V h_gas_stack[2] = {dry_gas(cathode_h2, cathode_o2, h_h2, h_o2), dry_gas(anode_h2, anode_o2, h_h2, h_o2)};
            const V feed_h = liquid_enthalpy(feed_part, p_liquid);
            const V h_in = zero + (makeup * feed_h + condensate_total * h_liquid_cool);
            V h_out = zero;
            for (int s = 0; s < 2; ++s) h_out = h_out + (h_gas_stack[s] + vapour_stack[s] * h_vapour);
            if (!k.drag_returned) {
                const V h_liquid_stack = liquid_enthalpy(kernel::region1_temperature(ts, false), max(p_liquid, p_sat));
                h_out = h_out + select(drain > zero, drain * h_liquid_stack, zero);
            }
            const V released = power + h_in - h_out;
            duty = released - loss;
            gas_coolers = zero;
            const M cooled = tcs < ts;
            for (int s = 0; s < 2; ++s) {
                const V term = h_gas_stack[s] + vapour_stack[s] * h_vapour -
                               dry_gas(side_h2[s], side_o2[s], h_h2_cool, h_o2_cool) - vapour_out[s] * h_vapour_cool -
                               condensate[s] * h_liquid_cool;
                gas_coolers = gas_coolers + select(cooled && !(dry[s] + vapour_stack[s] <= zero), term, zero);
            }
        }
        // ---- outputs (streams.cpp fill_outputs, alarms.cpp fill_alarms) ----
        put(cell_voltage, voltage);
        put(cell_reversible_voltage, e_rev);
        put(cell_thermoneutral_voltage, e_tn);
        put(cell_activation_anode, act_a);
        put(cell_activation_cathode, act_c);
        put(cell_ohmic, ohmic);
        put(cell_concentration, conc);
        put(cell_degradation, degradation);
        put(cell_current_density, js);
        put(cell_faraday_efficiency, [&] { return V(c_h2 / h2_made); });
        put(cell_caustic_efficiency, one);
        put(cell_chlorine_efficiency, one);
        put(stack_current, stack_i);
        put(stack_voltage, stack_v);
        put(stack_power, power);
        put(plant_rectifier_loss, rect_loss);
        put(plant_rectifier_efficiency, [&] { return V(power / (power + rect_loss())); });
        put(plant_auxiliary_power, aux);
        put(plant_power, plant_total);
        const V h2_kg = cathode_h2 * M_H2;
        const V water_kg = makeup * M_H2O;
        put(product_hydrogen, h2_kg);
        put(product_oxygen, [&] { return anode_o2 * M_O2; });
        put(product_chlorine, zero);
        put(product_caustic, zero);
        put(product_caustic_solution, zero);
        put(feed_water, water_kg);
        put(feed_salt, zero);
        put(feed_hydrogen, zero);
        put(feed_sweep_air, zero);
        const V gas_c = dry[0] + vapour_out[0], gas_a = dry[1] + vapour_out[1];
        const auto frac = [&](const V& n, const V& total) { return select(total > zero, n / total, zero); };
        put(stream_cathode_mass_flow, [&] { return cathode_h2 * M_H2 + cathode_o2 * M_O2 + vapour_out[0] * M_H2O; });
        put(stream_cathode_temperature, tcs);
        put(stream_cathode_pressure, pcs);
        put(stream_cathode_x_h2, [&] { return frac(cathode_h2, gas_c); });
        put(stream_cathode_x_o2, [&] { return frac(cathode_o2, gas_c); });
        put(stream_cathode_x_h2o, [&] { return frac(vapour_out[0], gas_c); });
        put(stream_anode_mass_flow, [&] { return anode_o2 * M_O2 + anode_h2 * M_H2 + 0.0 + 0.0 + vapour_out[1] * M_H2O; });
        put(stream_anode_temperature, tcs);
        put(stream_anode_pressure, pas);
        put(stream_anode_x_o2, [&] { return frac(anode_o2, gas_a); });
        put(stream_anode_x_h2, [&] { return frac(anode_h2, gas_a); });
        put(stream_anode_x_cl2, [&] { return frac(zero, gas_a); });
        put(stream_anode_x_h2o, [&] { return frac(vapour_out[1], gas_a); });
        put(stream_anode_x_n2, [&] { return frac(zero, gas_a); });
        put(stream_condensate_mass_flow, [&] { return condensate_total * M_H2O; });
        put(stream_drain_mass_flow, [&] { return drain * M_H2O; });
        put(stream_dryer_loss_mass_flow, [&] { return vapour_out[0] * M_H2O; });
        put(gas_h2_in_o2, h2_in_o2);
        put(gas_o2_in_h2, [&] { return select(c_o2 > zero, c_o2 / (c_o2 + c_h2), zero); });
        put(gas_o2_in_cl2, zero);
        put(heat_loss, loss);
        put(heat_duty, duty);
        put(heat_gas_coolers, gas_coolers);
        put(heat_feed_heating, zero);
        const V energy_in = power + 0.0 + max(zero, -duty);  // NaN without the energy balance (not stored then)
        put(perf_specific_energy, [&] { return power / h2_kg; });
        put(perf_specific_energy_plant, [&] { return V(plant_total() / h2_kg); });
        put(perf_efficiency_hhv, [&] { return select(energy_in > zero, h2_kg * hhv / energy_in, zero); });
        put(perf_efficiency_lhv, [&] { return select(energy_in > zero, h2_kg * lhv / energy_in, zero); });
        put(perf_water_per_hydrogen, [&] { return water_kg / h2_kg; });
        put(perf_specific_energy_chlorine, nan);
        put(perf_load_fraction, [&] { return js / k.rated_current_density; });
        put(perf_specific_energy_caustic, nan);
        put(perf_salt_per_chlorine, nan);
        put(perf_water_per_chlorine, nan);
        put(perf_salt_per_caustic, nan);
        put(perf_water_per_caustic, nan);
        const M a_warn = h2_in_o2 >= k.h2_in_o2_warning, a_trip = h2_in_o2 >= k.h2_in_o2_trip;
        const M a_temp = M(k.temperature_max > 0) && (ts > k.temperature_max);
        const M a_high = js > k.rated_current_density * (1 + 1e-12);
        const M a_low = js < k.min_load_fraction * k.rated_current_density;
        const M any = a_warn || a_trip || a_temp || a_high || a_low || extrapolated;
        put(alarm_h2_in_o2_warning, select(a_warn, one, zero));
        put(alarm_h2_in_o2_trip, select(a_trip, one, zero));
        put(alarm_temperature_high, select(a_temp, one, zero));
        put(alarm_current_density_high, select(a_high, one, zero));
        put(alarm_load_low, select(a_low, one, zero));
        put(alarm_extrapolated, select(extrapolated, one, zero));
        put(alarm_any, select(any, one, zero));
        // The verdict: 0 solved, 2 not taken, 4 + the alarms raised (bit a for alarm_first + a) otherwise.
        const V bits = select(a_warn, V(1.0), zero) + select(a_trip, V(2.0), zero) + select(a_temp, V(4.0), zero) +
                       select(a_high, V(8.0), zero) + select(a_low, V(16.0), zero) + select(extrapolated, V(32.0), zero);
        select(skip, V(2.0), select(any, 4.0 + bits, zero)).store_unaligned(c.verdict + i);
    }
}

}  // namespace batch_kernel
ELY_KERNEL_END
