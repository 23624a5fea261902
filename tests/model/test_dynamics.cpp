// The plant in time (lib/unit/dynamics*.cpp): the heat-transfer laws against their textbook
// forms, the defaults holding every technology at its setpoint at rated load, steady equivalence,
// the energy balance over transients, ramps, modes and their events, purity in the separator,
// save and restore, the life cycle.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <boost/json.hpp>
#include <cmath>
#include <fstream>
#include <sstream>
#include <string>
#include <vector>

#include "base/error.hpp"
#include "config/config.hpp"
#include "support.hpp"
#include "thermo/constants.hpp"
#include "thermo/if97.hpp"
#include "thermo/species.hpp"
#include "unit/block.hpp"
#include "unit/dynamics.hpp"

using namespace ely;
using ely::test::expect_error;
using ely::test::source_path;
using ::testing::HasSubstr;

namespace {

namespace json = boost::json;

/// A plant description from a file of the source tree with `extra` (a JSON object) merged in.
std::string described(const std::string& file, const std::string& extra = "{}") {
    json::object root = json::parse(ely::test::read_file(source_path(file))).as_object();
    ely::test::merge_json(root, json::parse(extra).as_object());
    return json::serialize(root);
}

/// The invented demo plant (examples/demo-plant.json): 10 stacks of 250 PEM cells of 0.2 m².
std::string demo(const std::string& extra = "{}") { return described("examples/demo-plant.json", extra); }

struct Plant {
    Block block;
    explicit Plant(const std::string& json) : block(parse_config(json)) {}
    double get(const char* name) const { return block.get(block.find(name)); }
    void set(const char* name, double v) { block.set(block.find(name), v); }
    /// The run summary's figure `name` (SI).
    double summary(const char* name) const {
        const json::value v = json::parse(block.run_summary_json()).at("figures").at(name).at("value");
        return v.is_null() ? std::nan("") : v.to_number<double>();
    }
};

/// Equal as numbers, NaN equal to NaN.
bool same(double a, double b) { return (std::isnan(a) && std::isnan(b)) || a == b; }

}  // namespace

// --- Laws ----------------------------------------------------------------------------------------

TEST(DynamicsLaws, CoolantHeatIsTheTubeAtUniformWallTemperature) {
    // A coolant stream along a wall at one temperature T: d(T_c)/dA = U (T − T_c)/(ṁ c_p), whose
    // outlet is T − (T − T_in) exp(−UA/(ṁ c_p)) (Incropera & DeWitt, constant surface temperature).
    // Checked here by marching the stream through 20000 slices with the classical Runge–Kutta
    // method, which uses neither the exponential nor the effectiveness.
    struct Case {
        double ua, cp, flow, t_in, t_plant;
    };
    for (const Case& c : {Case{2.4e5, 4181, 200, 298.15, 338.15}, Case{5e3, 1140, 2, 923.15, 1048.15},
                          Case{1e6, 4181, 5, 298.15, 353.15}, Case{1e3, 4181, 100, 298.15, 340}}) {
        // Marched in θ = T − T_c (dθ/da = −k θ over the exchanger's area fraction a), so that a small
        // temperature rise is not lost to round-off.
        const double k = c.ua / (c.flow * c.cp);
        const int n = 20000;
        double theta = c.t_plant - c.t_in;
        const auto slope = [&](double x) { return -k * x; };
        for (int i = 0; i < n; ++i) {
            const double h = 1.0 / n;
            const double k1 = slope(theta), k2 = slope(theta + 0.5 * h * k1), k3 = slope(theta + 0.5 * h * k2),
                         k4 = slope(theta + h * k3);
            theta += h / 6 * (k1 + 2 * k2 + 2 * k3 + k4);
        }
        const CoolantHeat q = coolant_heat(c.ua, c.cp, c.flow, c.t_in, c.t_plant);
        EXPECT_NEAR(q.outlet_temperature, c.t_plant - theta, 1e-9 * c.t_plant);
        EXPECT_NEAR(q.heat, c.flow * c.cp * (c.t_plant - c.t_in - theta), 1e-9 * std::fabs(q.heat));
    }
    EXPECT_EQ(coolant_heat(1e5, 4181, 0, 298.15, 340).heat, 0.0);  // no flow, no heat
    EXPECT_EQ(coolant_heat(0, 4181, 10, 298.15, 340).heat, 0.0);   // no exchanger, no heat
}

TEST(DynamicsLaws, ValveControllerAndHeater) {
    // Proportional-integral valve: u = (T − T_set)/band + I between the stops; the integral moves
    // with the error and, at a stop, back towards it (back-calculation, tracking time T_i).
    const ValveControl at_setpoint = valve_control(338.0, 0.5, 338.0, 2.0, 300.0, true);
    EXPECT_EQ(at_setpoint.opening, 0.5);
    EXPECT_EQ(at_setpoint.drive, 0.0);
    EXPECT_EQ(at_setpoint.slope, 1.0);
    const ValveControl warm = valve_control(339.0, 0.2, 338.0, 2.0, 300.0, true);
    EXPECT_DOUBLE_EQ(warm.opening, 0.7);
    EXPECT_DOUBLE_EQ(warm.drive, 1.0 / (2.0 * 300.0));
    const ValveControl stop = valve_control(345.0, 0.5, 338.0, 2.0, 300.0, true);  // unclamped 4: at the stop
    EXPECT_EQ(stop.opening, 1.0);
    EXPECT_DOUBLE_EQ(stop.drive, 7.0 / 600.0 + (1.0 - 4.0) / 300.0);
    EXPECT_EQ(stop.slope, 0.0);
    const ValveControl off = valve_control(330.0, 0.5, 338.0, 2.0, 300.0, false);  // shut; the integral tracks it
    EXPECT_EQ(off.opening, 0.0);
    EXPECT_DOUBLE_EQ(off.drive, -(-4.0 + 0.5) / 300.0);
    // The proportional heater: full power one band below its target, none at it.
    EXPECT_EQ(heater_output(1e5, 336.0, 336.0, 2.0), 0.0);
    EXPECT_EQ(heater_output(1e5, 335.0, 336.0, 2.0), 5e4);
    EXPECT_EQ(heater_output(1e5, 300.0, 336.0, 2.0), 1e5);
    // The exchanger's gain d(heat)/d(flow), against a difference quotient.
    const double q1 = coolant_heat(2.4e5, 4181, 150, 298.15, 338.15).heat, q2 = coolant_heat(2.4e5, 4181, 150.001, 298.15, 338.15).heat;
    EXPECT_NEAR(coolant_heat(2.4e5, 4181, 150.0005, 298.15, 338.15).gain, (q2 - q1) / 0.001, 1e-6 * (q2 - q1) / 0.001);
}

TEST(DynamicsLaws, HermiteInterpolantIsExactForCubics) {
    // The cubic through two points with their slopes is the cubic itself.
    const auto p = [](double t) { return 2.0 - 0.5 * t + 0.25 * t * t - 0.125 * t * t * t; };
    const auto dp = [](double t) { return -0.5 + 0.5 * t - 0.375 * t * t; };
    RunStep s;
    s.t_a = 1.0;
    s.t_b = 3.5;
    s.x_a[0] = p(s.t_a);
    s.f_a[0] = dp(s.t_a);
    s.x_b[0] = p(s.t_b);
    s.f_b[0] = dp(s.t_b);
    for (double t : {1.0, 1.3, 2.0, 2.9, 3.5}) {
        double x = 0;
        hermite_interpolate(s, t, &x, 1);
        EXPECT_NEAR(x, p(t), 1e-14) << t;
    }
}

TEST(DynamicsDefaults, WaterAndAirCoolantHeatCapacities) {
    // Liquid water at 25 °C and 0.1 MPa: c_p = 4.1813 kJ/(kg K) (IAPWS-95 and the NIST Chemistry
    // WebBook, from memory); IF97 region 1 agrees within 1e-4.
    EXPECT_NEAR(if97::region1(298.15, 1e5).cp, 4181.3, 1.0);
    EXPECT_NEAR(technology("pem").dynamics.coolant_heat_capacity, 4181.3, 1.0);
    // Dry air (0.79 N2 + 0.21 O2) at 950 K from the NIST Shomate fits: about 1140 J/(kg K).
    const double cp = 0.79 * ideal_gas(Species::nitrogen, 950).cp + 0.21 * ideal_gas(Species::oxygen, 950).cp;
    const double molar_mass = 0.79 * species_molar_mass(Species::nitrogen) + 0.21 * species_molar_mass(Species::oxygen);
    EXPECT_NEAR(technology("solid_oxide").dynamics.coolant_heat_capacity, cp / molar_mass, 0.01 * cp / molar_mass);
}

// --- Defaults hold every technology at its setpoint at rated load --------------------------------

class DynamicsEveryTechnology : public ::testing::TestWithParam<const TechnologyInfo*> {};

TEST_P(DynamicsEveryTechnology, DefaultsHoldTheSetpointAtRatedLoad) {
    // At rated current density the plant's controller holds the setpoint with the valve short of its
    // stop: the sized coolant through the open valve would take 110 % of the heat released there. A
    // plant whose stacks need heat at rated load (a steam-fed stack below its thermoneutral voltage,
    // brine fed cold) has no coolant: it settles below its setpoint where the heat released meets the
    // loss.
    const TechnologyInfo& t = *GetParam();
    Plant p(described(t.example));
    const double setpoint = p.get("param.thermal.temperature_setpoint");
    EXPECT_EQ(setpoint, p.get("in.temperature"));  // the described operating temperature
    p.set("in.current_density", p.get("param.limits.rated_current_density"));
    p.set("in.hours_operated", 0);
    Block steady = p.block;
    steady.solve();
    const bool cooled = steady.get(steady.find("heat.duty")) > 0;
    p.set("in.temperature", setpoint - 3.0);
    p.block.reset(0);
    for (int k = 0; k < 48; ++k) p.block.advance(3600);
    const double released = p.get("heat.released"), power = p.get("stack.power");
    EXPECT_NEAR(released - p.get("heat.to_coolant") - p.get("heat.loss"), 0.0, 1e-9 * power);
    if (cooled) {
        EXPECT_NEAR(p.get("stack.temperature"), setpoint, 1e-9 * setpoint) << t.name;
        const double open = coolant_heat(p.get("param.thermal.exchanger_ua"), p.get("param.thermal.coolant_heat_capacity"),
                                         p.get("in.coolant_flow"), p.get("in.coolant_temperature"), setpoint)
                                .heat;
        EXPECT_NEAR(open, 1.1 * p.get("heat.to_coolant"), 1e-8 * open);
        EXPECT_LT(p.get("coolant.flow"), p.get("in.coolant_flow"));
    } else {
        EXPECT_LT(p.get("stack.temperature"), setpoint) << t.name;
        EXPECT_EQ(p.get("in.coolant_flow"), 0.0);
        EXPECT_EQ(p.get("heat.to_coolant"), 0.0);
        EXPECT_NEAR(released, p.get("heat.loss"), 1e-9 * power);
    }
    // The thermal balance of the whole run closes (the summary's closure figure).
    EXPECT_NEAR(p.summary("thermal_balance"), 0.0, 1e-9 * p.summary("heat_released"));
}

TEST_P(DynamicsEveryTechnology, StartsFromColdAndStopsAgain) {
    // Off at the start temperature, a production request: the start-up sequence, production at the
    // setpoint, a stop; the thermal balance of the run closes.
    const TechnologyInfo& t = *GetParam();
    Plant p(described(t.example));
    p.set("in.mode_request", 0);
    p.set("in.temperature", p.get("param.startup.temperature") + 1.0);
    p.block.reset(0);
    EXPECT_EQ(p.get("state.mode"), 0.0);
    EXPECT_EQ(p.get("stack.current"), 0.0);
    p.set("in.mode_request", 2);
    p.block.advance(1.0);
    EXPECT_EQ(p.get("state.mode"), 3.0);
    p.block.advance(p.get("param.startup.cold_duration") + 600);
    EXPECT_EQ(p.get("state.mode"), 2.0);
    EXPECT_GT(p.get("stack.current"), 0.0);
    p.set("in.mode_request", 0);
    p.block.advance(3600);
    EXPECT_EQ(p.get("state.mode"), 0.0);
    EXPECT_EQ(p.get("stack.current"), 0.0);
    EXPECT_EQ(p.get("state.starts"), 1.0);
    EXPECT_NEAR(p.summary("thermal_balance"), 0.0, 1e-9 * std::max(1.0, p.summary("heat_released")));
}

INSTANTIATE_TEST_SUITE_P(Registry, DynamicsEveryTechnology, ::testing::ValuesIn(ely::test::all_technologies()),
                         ely::test::technology_name);

// --- Steady equivalence, energy, initial slope ---------------------------------------------------

TEST(DynamicsSteady, SettledRunEqualsTheSteadySolveAtItsTemperature) {
    // At constant inputs the run settles where released heat = coolant heat + loss; its outputs
    // then equal a steady solve at the settled temperature, for a current and a power spec.
    for (const char* spec : {"current_density", "power"}) {
        SCOPED_TRACE(spec);
        Plant p(demo(R"({"plant":{"degradation":{"voltage_rate":0}}})"));  // a plant that does not age is constant
        p.block.set_spec(find_spec(spec)->spec);
        p.set("in.power", 14e6);
        p.block.reset(0);
        for (int k = 0; k < 40; ++k) p.block.advance(3600);
        const double released = p.get("heat.released");
        EXPECT_NEAR(released - p.get("heat.to_coolant") - p.get("heat.loss"), 0.0, 1e-9 * released);
        Block steady = p.block;
        steady.set(steady.find("in.temperature"), p.get("stack.temperature"));
        steady.set(steady.find("in.hours_operated"), p.get("state.hours_operated"));
        steady.solve();
        int compared = 0;
        for (int32_t i = 0; i < steady.variable_count(); ++i) {
            const VariableInfo& v = steady.variable(i);
            const std::string name = v.name;
            if (v.causality != Causality::output || name.rfind("coolant.", 0) == 0 || name.rfind("state.", 0) == 0 ||
                name == "heat.to_coolant" || name == "heat.duty")
                continue;
            const double a = p.block.get(i), b = steady.get(i);
            if (std::isnan(b)) {
                EXPECT_TRUE(std::isnan(a)) << name;
                continue;
            }
            EXPECT_NEAR(a, b, 1e-9 * std::max(std::fabs(b), 1e-300) + 1e-300) << name;
            ++compared;
        }
        EXPECT_GT(compared, 50);
        // The duty a steady solve asks of the coolant is what the coolant takes.
        EXPECT_NEAR(steady.get(steady.find("heat.duty")), p.get("heat.to_coolant"), 1e-9 * released);
    }
}

TEST(DynamicsEnergy, HeatCapacityTimesTemperatureChangeIsTheIntegralOfTheHeatFlows) {
    // A load step from a cool plant: C·ΔT against the integral of (released − to coolant − loss)
    // taken by Simpson's rule from the outputs at every half second, to the tolerance. The current
    // ramps for 5 s: the right-hand side depends on time itself there.
    Plant p(demo(R"({"operating":{"current_density":"1 A/cm2"},"plant":{"dynamics":{"tolerance":1e-8}}})"));
    p.set("in.temperature", 323.15);  // 50 °C, below the setpoint's 65 °C: the valve stays shut
    p.block.reset(0);
    const double c = p.get("param.heat_capacity"), t0 = p.get("stack.temperature");
    const auto net = [&] { return p.get("heat.released") - p.get("heat.to_coolant") - p.get("heat.loss"); };
    std::vector<double> f{net()};
    p.set("in.current_density", 22500);  // a ramp of 5 s at 10 %/s of 2.5 A/cm2: its ends fall on Simpson's panels
    const double h = 0.5;
    for (int k = 0; k < 240; ++k) {  // two minutes of ramp and warming
        p.block.advance(h);
        f.push_back(net());
    }
    double integral = 0;
    for (std::size_t k = 0; k + 2 < f.size(); k += 2) integral += h / 3 * (f[k] + 4 * f[k + 1] + f[k + 2]);
    const double stored = c * (p.get("stack.temperature") - t0);
    EXPECT_GT(stored, 3e8);  // it did warm up
    EXPECT_LT(p.get("stack.temperature"), p.get("param.thermal.temperature_setpoint") - p.get("param.thermal.control_band"));
    // The integrator keeps the temperature to its tolerance (relative, param.dynamics.tolerance):
    // C·ΔT is right to C × tolerance × T, a few hundred joules here out of 440 MJ.
    const double tolerance = p.get("param.dynamics.tolerance");
    EXPECT_NEAR(stored, integral, 2 * c * tolerance * p.get("stack.temperature"));
    EXPECT_LT(2 * c * tolerance * p.get("stack.temperature"), 1e-6 * stored);
}

TEST(DynamicsEnergy, InitialSlopeFromRestIsTheHeatBalanceOverTheHeatCapacity) {
    // A plant at rest at 30 °C, no coolant, ambient at its temperature (no loss): at the start of
    // production dT/dt = released heat / C, where the released heat is a steady solve's duty at
    // that temperature — and about N·I·(V − E_tn) with the feed at stack temperature.
    Plant p(demo(R"({"operating":{"temperature":"30 degC","coolant_flow":0},
                     "plant":{"thermal":{"ambient_temperature":"30 degC","feed_temperature":"30 degC"}}})"));
    p.block.reset(0);
    const double t0 = p.get("stack.temperature");
    Block steady = p.block;
    steady.solve();
    const double released = steady.get(steady.find("heat.duty")) + steady.get(steady.find("heat.loss"));
    const double shortcut = p.get("stack.current") * p.get("param.cells") *
                            (p.get("cell.voltage") - p.get("cell.thermoneutral_voltage"));
    EXPECT_NEAR(released, shortcut, 0.02 * shortcut);
    const double c = p.get("param.heat_capacity"), dt = 1e-3;
    p.block.advance(dt);
    EXPECT_NEAR((p.get("stack.temperature") - t0) / dt, released / c, 1e-6 * released / c);
}

// --- Ramps, modes, events ------------------------------------------------------------------------

TEST(DynamicsRamps, TheCurrentFollowsASetpointStepAtTheRampRate) {
    Plant p(demo(R"({"plant":{"ramp_rate":0.01},"operating":{"current_density":10000}})"));
    p.block.reset(0);
    const double rate = 0.01 * p.get("param.limits.rated_current_density");  // A/m² per s: 1 % of rated per second
    p.set("in.current_density", 20000);
    p.block.advance(10);
    EXPECT_NEAR(p.get("cell.current_density"), 10000 + 10 * rate, 1e-9 * 10000);
    p.block.advance(15.5);
    EXPECT_NEAR(p.get("cell.current_density"), 10000 + 25.5 * rate, 1e-9 * 10000);
    p.block.advance(60);  // reaches 20000 at 40 s, inside this step
    EXPECT_EQ(p.get("cell.current_density"), 20000.0);
    // Down, to a setpoint below the minimum load: held at the minimum, counted as such.
    p.set("in.current_density", 100);
    p.block.advance(10);
    EXPECT_NEAR(p.get("cell.current_density"), 20000 - 10 * rate, 1e-9 * 20000);
    p.block.advance(100);
    const double minimum = p.get("param.limits.min_load_fraction") * p.get("param.limits.rated_current_density");
    EXPECT_EQ(p.get("cell.current_density"), minimum);
    EXPECT_EQ(p.get("alarm.load_low"), 1.0);
    // 20000 → 2500 A/m² at 250 A/m² per s: 70 s of ramp, then at the minimum from t = 85.5 + 70.
    EXPECT_NEAR(p.summary("hours_at_minimum_load") * 3600, 195.5 - (85.5 + (20000 - minimum) / rate), 1e-6);
}

TEST(DynamicsRamps, APowerSetpointIsReachedByTheRampThenFollowed) {
    Plant p(demo(R"({"plant":{"ramp_rate":0.01},"operating":{"spec":"power","power":"8 MW"}})"));
    p.block.reset(0);
    EXPECT_NEAR(p.get("stack.power"), 8e6, 1e-9 * 8e6);
    const double j0 = p.get("cell.current_density"), rate = 0.01 * p.get("param.limits.rated_current_density");
    p.set("in.power", 16e6);
    p.block.advance(5);
    EXPECT_NEAR(p.get("cell.current_density"), j0 + 5 * rate, 1e-9 * j0);  // ramping at the limit
    EXPECT_LT(p.get("stack.power"), 16e6);
    p.block.advance(600);
    EXPECT_NEAR(p.get("stack.power"), 16e6, 1e-9 * 16e6);  // reached, then followed as the plant warms
    const double j = p.get("cell.current_density");
    p.block.advance(1800);
    EXPECT_NEAR(p.get("stack.power"), 16e6, 1e-9 * 16e6);
    EXPECT_NE(p.get("cell.current_density"), j);  // the temperature moved the current that gives it
}

TEST(DynamicsModes, AStartFromHotStandbyEndsInsideAStep) {
    // Standby by minimum current (10 % of rated), a production request, a warm start of 90 s: the
    // current leaves the standby value at t = 90 s exactly and ramps at 1 %/s.
    Plant p(demo(R"({"plant":{"ramp_rate":0.01,"standby":{"method":1,"current_fraction":0.1},
                               "startup":{"warm_duration":90}},"operating":{"mode_request":1}})"));
    p.block.reset(0);
    const double j_rated = p.get("param.limits.rated_current_density");
    EXPECT_EQ(p.get("state.mode"), 1.0);
    EXPECT_EQ(p.get("cell.current_density"), 0.1 * j_rated);
    p.set("in.mode_request", 2);
    p.block.advance(60);
    EXPECT_EQ(p.get("state.mode"), 4.0);
    EXPECT_EQ(p.get("cell.current_density"), 0.1 * j_rated);
    p.block.advance(60);
    EXPECT_EQ(p.get("state.mode"), 2.0);
    EXPECT_NEAR(p.get("cell.current_density"), 0.1 * j_rated + 30 * 0.01 * j_rated, 1e-9 * j_rated);
    EXPECT_NEAR(p.summary("hours_starting_warm") * 3600, 90.0, 1e-9);
    EXPECT_EQ(p.summary("starts_warm"), 1.0);
}

TEST(DynamicsModes, AStartFromColdWaitsForTheStartTemperature) {
    // Off at 25 °C in a 20 °C ambient, a start temperature of 40 °C, the heater at full power to 63 °C: with no coolant
    // and a heat loss UA (T − T_a), C dT/dt = P − UA (T − T_a), so the start temperature is reached at
    // t* = −(C/UA) ln[(T_a + P/UA − T*)/(T_a + P/UA − T_0)], when production begins.
    Plant p(demo(R"({"plant":{"startup":{"temperature":"40 degC","cold_duration":60},"dynamics":{"tolerance":1e-8},
                               "standby":{"heater_power":"2 MW"},
                               "thermal":{"ambient_temperature":"20 degC"}},
                     "operating":{"mode_request":0,"temperature":"25 degC"}})"));
    p.block.reset(0);
    p.set("in.mode_request", 2);
    const double c = p.get("param.heat_capacity"), ua = p.get("param.thermal.heat_loss_coefficient") * p.get("param.stacks");
    const double power = 2e6, ta = 293.15, t0 = 298.15, t_start = 313.15;
    const double expected = -(c / ua) * std::log((ta + power / ua - t_start) / (ta + power / ua - t0));
    p.block.advance(expected - 1.0);
    EXPECT_EQ(p.get("state.mode"), 3.0);
    EXPECT_NEAR(p.get("heat.heater"), power, 1e-9 * power);
    p.block.advance(2.0);
    EXPECT_EQ(p.get("state.mode"), 2.0);
    EXPECT_NEAR(p.summary("hours_starting_cold") * 3600, expected, 1e-3);
    EXPECT_EQ(p.summary("starts_cold"), 1.0);
}

TEST(DynamicsModes, HotStandbyByHeaterHoldsItsTemperature) {
    // The proportional heater settles where it covers the heat loss:
    // P (T_sb − T)/B = UA (T − T_a), T = (P T_sb/B + UA T_a)/(P/B + UA); the coolant valve is shut.
    Plant p(demo(R"({"operating":{"mode_request":1}})"));
    p.block.reset(0);
    EXPECT_EQ(p.get("state.mode"), 1.0);
    for (int k = 0; k < 72; ++k) p.block.advance(3600);
    const double rating = p.get("param.standby.heater_power"), band = p.get("param.thermal.control_band");
    const double t_sb = p.get("param.standby.temperature"), ta = p.get("in.ambient_temperature");
    const double ua = p.get("param.thermal.heat_loss_coefficient") * p.get("param.stacks");
    const double expected = (rating * t_sb / band + ua * ta) / (rating / band + ua);
    EXPECT_NEAR(p.get("stack.temperature"), expected, 1e-6);
    EXPECT_NEAR(p.get("heat.heater"), p.get("heat.loss"), 1e-6 * p.get("heat.loss"));
    EXPECT_EQ(p.get("coolant.flow"), 0.0);
    EXPECT_EQ(p.get("stack.current"), 0.0);
    EXPECT_NEAR(p.get("plant.power"), p.get("param.auxiliaries.fixed") + p.get("heat.heater"), 1e-6);
    EXPECT_NEAR(p.summary("hours_standby"), 72.0, 1e-12);
}

TEST(DynamicsModes, AutomaticRequestStandsByBelowTheMinimumLoad) {
    Plant p(demo(R"({"operating":{"spec":"power","power":"10 MW","mode_request":3}})"));
    p.block.reset(0);
    EXPECT_EQ(p.get("state.mode"), 2.0);
    p.set("in.power", 0.5e6);  // below what the minimum load draws
    p.block.advance(600);
    EXPECT_EQ(p.get("state.mode"), 1.0);
    p.set("in.power", 10e6);
    p.block.advance(600);
    EXPECT_EQ(p.get("state.mode"), 2.0);
    EXPECT_EQ(p.get("state.starts"), 1.0);
}

// --- Purity in time ------------------------------------------------------------------------------

TEST(DynamicsPurity, ADropToLowLoadRaisesHydrogenInOxygenOverTheHoldUpTime) {
    // From 2 A/cm² to 0.1 A/cm² (4 % of rated, minimum load 2 %), the plant's temperature held (a
    // huge heat capacity): the stacks' anode gas carries about 2.6 % H2 at once; the separator's
    // gas, well mixed, follows dx/dt = (x_stack − x)/τ with τ = hold-up × (anode gas at rated
    // current, O2 by Faraday's law j A/(4F)) / (anode gas now, O2 / (1 − x_stack)), and trips at
    // 2 % at t = τ ln[(x_stack − x_0)/(x_stack − 0.02)].
    Plant p(demo(R"({"plant":{"limits":{"min_load_fraction":0.02},"heat_capacity":1e15,"dynamics":{"tolerance":1e-8}}})"));
    p.block.reset(0);
    p.block.advance(600);
    const double x_full = p.get("gas.h2_in_o2");
    p.set("in.current_density", 1000);
    p.block.advance(10);  // the ramp down takes 7.6 s at 10 %/s
    const double t0 = p.block.time(), x0 = p.get("gas.h2_in_o2");
    const double x_stack = p.get("gas.h2_in_o2_stack");
    EXPECT_GT(x_stack, 0.02);
    EXPECT_GT(x0, x_full);
    EXPECT_LT(x0 - x_full, 0.01 * (x_stack - x_full));  // far from mixed after seconds
    EXPECT_EQ(p.get("alarm.h2_in_o2_trip"), 0.0);
    const double area = p.get("param.cells") * p.get("param.stacks") * p.get("param.active_area");
    const double rated_anode_gas = p.get("param.limits.rated_current_density") * area / (4 * kFaraday);
    const double anode_gas = p.get("product.oxygen") / molar_mass::O2 / (1 - x_stack);
    const double tau = p.get("param.separator.holdup_time") * rated_anode_gas / anode_gas;
    const double trip = p.get("param.alarms.h2_in_o2_trip");
    const double expected = tau * std::log((x_stack - x0) / (x_stack - trip));
    double previous = x0;
    for (int k = 0; k < 120; ++k) {
        p.block.advance(60);
        EXPECT_EQ(p.block.time(), t0 + 60.0 * (k + 1));  // an event inside the step does not move the time
        const double x = p.get("gas.h2_in_o2");
        EXPECT_GE(x, previous);
        EXPECT_NEAR(x, x_stack - (x_stack - x0) * std::exp(-(p.block.time() - t0) / tau), 1e-6 * x_stack);
        EXPECT_EQ(p.get("alarm.h2_in_o2_trip"), x >= trip ? 1.0 : 0.0);
        previous = x;
    }
    EXPECT_EQ(p.get("alarm.h2_in_o2_trip"), 1.0);
    EXPECT_NEAR(p.summary("first_trip_time") - t0, expected, 1e-4 * expected);
    // The alarm's hours run from the located crossing to the end.
    EXPECT_NEAR(p.summary("hours_h2_in_o2_trip") * 3600, p.block.time() - p.summary("first_trip_time"), 1e-6);
    EXPECT_EQ(p.summary("alarms_h2_in_o2_trip"), 1.0);
}

// --- Save and restore ----------------------------------------------------------------------------

namespace {
/// A profile with ramps, a power spec, mode changes and a purity transient.
void drive(Plant& p, int from, int to) {
    for (int k = from; k < to; ++k) {
        if (k == 3) p.set("in.current_density", 5000);
        if (k == 7) p.set("in.mode_request", 1);
        if (k == 9) p.set("in.mode_request", 2);
        if (k == 12) {
            p.block.set_spec(Spec::power);
            p.set("in.power", 12e6);
        }
        if (k == 15) p.set("in.coolant_temperature", 303.15);
        p.block.advance(k % 2 ? 37.5 : 300);
    }
}
constexpr const char* kProducer = "test producer 1";
}  // namespace

TEST(DynamicsState, ARestoredBlockContinuesBitForBit) {
    Plant a(demo());
    a.block.reset(100);
    drive(a, 0, 10);
    const std::string saved = a.block.save_state(kProducer);
    const double t_saved = a.block.time();
    drive(a, 10, 20);

    Plant b(demo());
    b.set("in.temperature", 300);  // whatever it held before is replaced
    b.set("param.ramp_rate", 0.5);
    b.block.restore_state(saved, kProducer);
    EXPECT_EQ(b.block.time(), t_saved);
    drive(b, 10, 20);
    EXPECT_EQ(b.block.time(), a.block.time());
    for (int32_t i = 0; i < a.block.variable_count(); ++i)
        EXPECT_PRED2(same, a.block.get(i), b.block.get(i)) << a.block.variable(i).name;
    EXPECT_EQ(a.block.run_summary_json(), b.block.run_summary_json());
    EXPECT_EQ(a.block.save_state(kProducer), b.block.save_state(kProducer));
}

TEST(DynamicsState, ACopyContinuesBitForBit) {
    Plant a(demo());
    a.block.reset(0);
    drive(a, 0, 8);
    Block copy = a.block;
    drive(a, 8, 16);
    Plant b(demo());
    b.block = copy;
    drive(b, 8, 16);
    for (int32_t i = 0; i < a.block.variable_count(); ++i)
        EXPECT_PRED2(same, a.block.get(i), b.block.get(i)) << a.block.variable(i).name;
}

TEST(DynamicsState, ForeignStatesAreRefusedAndChangeNothing) {
    Plant a(demo());
    a.block.reset(0);
    a.block.advance(60);
    const std::string saved = a.block.save_state(kProducer);
    Plant other(demo(R"({"stack":{"cells":249}})"));
    other.block.reset(0);
    const double t = other.block.time(), temperature = other.get("stack.temperature");
    expect_error([&] { other.block.restore_state(saved, kProducer); }, ErrorKind::invalid_argument,
                 "another plant description");
    expect_error([&] { a.block.restore_state(saved, "another producer 2"); }, ErrorKind::invalid_argument, "saved by");
    expect_error([&] { a.block.restore_state(saved.substr(0, saved.size() / 2), kProducer); },
                 ErrorKind::invalid_argument, "refused");
    std::string flipped = saved;
    flipped[flipped.size() / 2] ^= 0x10;
    expect_error([&] { a.block.restore_state(flipped, kProducer); }, ErrorKind::invalid_argument, "check sum");
    expect_error([&] { a.block.restore_state("not a state at all", kProducer); }, ErrorKind::invalid_argument,
                 "not an elyblock state");
    EXPECT_EQ(other.block.time(), t);
    EXPECT_EQ(other.get("stack.temperature"), temperature);
    // The same description written differently is the same plant.
    Plant same_plant(demo(R"({"stack":{"active_area":0.2}})"));
    EXPECT_NO_THROW(same_plant.block.restore_state(saved, kProducer));
    EXPECT_EQ(same_plant.block.time(), 60.0);
}

// --- Life cycle ----------------------------------------------------------------------------------

TEST(DynamicsLifeCycle, CallsOutOfOrderAndBadStepsAreRefused) {
    Plant p(demo());
    expect_error([&] { p.block.advance(1); }, ErrorKind::wrong_state, "reset");
    expect_error([&] { p.block.time(); }, ErrorKind::wrong_state, "reset");
    expect_error([&] { p.block.run_summary_json(); }, ErrorKind::wrong_state, "reset");
    expect_error([&] { p.block.reset(std::nan("")); }, ErrorKind::invalid_argument, "start_time");
    p.block.reset(0);
    expect_error([&] { p.block.advance(-1); }, ErrorKind::invalid_argument, "negative");
    expect_error([&] { p.block.advance(INFINITY); }, ErrorKind::invalid_argument, "step");
    expect_error([&] { p.set("in.mode_request", 1.5); }, ErrorKind::invalid_argument, "whole number");
    expect_error([&] { p.set("in.mode_request", 4); }, ErrorKind::invalid_argument, "above");
    EXPECT_EQ(p.block.time(), 0.0);
    p.block.advance(0);  // applies the inputs at the current time
    EXPECT_EQ(p.block.time(), 0.0);
}

TEST(DynamicsLifeCycle, AFailedStepLeavesTheBlockAsItWas) {
    // The host drives the coolant itself: ice-cold coolant at full flow and no current cool the
    // stacks below the cell model's lowest temperature while a minimum current still flows.
    Plant p(demo(R"({"plant":{"thermal":{"temperature_control":0},"standby":{"method":1}}})"));
    p.block.reset(0);
    p.block.advance(60);
    const double t = p.block.time(), temperature = p.get("stack.temperature"), h2 = p.summary("hydrogen");
    p.set("in.coolant_temperature", 274.0);
    p.set("in.coolant_flow", 5000.0);
    p.set("in.mode_request", 1);
    expect_error([&] { p.block.advance(7200); }, ErrorKind::out_of_range, "at t =");
    EXPECT_EQ(p.block.time(), t);
    EXPECT_EQ(p.get("stack.temperature"), temperature);
    EXPECT_EQ(p.summary("hydrogen"), h2);
    EXPECT_EQ(p.get("in.coolant_flow"), p.block.start(p.block.find("in.coolant_flow")));  // the sets since are undone
}

TEST(DynamicsParameters, AutomaticValuesFollowTheParametersUntilSet) {
    // The coolant is sized at rated load: a larger rated current density sizes a larger flow, as
    // configuring it would; a flow the host sets stays.
    Plant set(demo());
    Plant configured(demo(R"({"plant":{"limits":{"rated_current_density":"2.2 A/cm2"}}})"));
    set.set("param.limits.rated_current_density", 22000);
    EXPECT_EQ(set.get("in.coolant_flow"), configured.get("in.coolant_flow"));
    EXPECT_EQ(set.get("param.thermal.exchanger_ua"), configured.get("param.thermal.exchanger_ua"));
    set.set("in.coolant_flow", 150);
    set.set("param.limits.rated_current_density", 25000);
    EXPECT_EQ(set.get("in.coolant_flow"), 150.0);
    EXPECT_NE(set.get("param.thermal.exchanger_ua"), configured.get("param.thermal.exchanger_ua"));
}

TEST(DynamicsParameters, AConductanceTooSmallToCoolIsAnErrorThatChangesNothing) {
    // Found by fuzzing: the search for the coolant flow of a set UA never ended when UA·(T − T_in)
    // underflowed (UA = 5e-324 W/K). A set that no flow can meet is refused and undone.
    Plant p(demo());
    const double ua = p.get("param.thermal.exchanger_ua"), flow = p.get("in.coolant_flow");
    for (double tiny : {5e-324, 1e-322}) {
        expect_error([&] { p.set("param.thermal.exchanger_ua", tiny); }, ErrorKind::infeasible, "exchanger_ua");
        EXPECT_EQ(p.get("param.thermal.exchanger_ua"), ua);
        EXPECT_EQ(p.get("in.coolant_flow"), flow);
    }
}
