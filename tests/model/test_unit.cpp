// The block (lib/unit): balances over random operating points for every technology, spec
// solves, alarms, rollback. Balances are identities: they must close to round-off.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <cmath>
#include <random>
#include <string>

#include "config/config.hpp"
#include "thermo/constants.hpp"
#include "base/error.hpp"
#include "thermo/species.hpp"
#include "thermo/water.hpp"
#include "unit/block.hpp"

using namespace ely;
using ::testing::HasSubstr;

namespace {

std::string minimal(const char* technology, const std::string& extra = "") {
    return std::string(R"({"technology":")") + technology +
           R"(","stack":{"cells":20,"active_area":0.05,"stacks":3},"operating":{"spec":"current_density"})" + extra + "}";
}

struct Probe {
    Block block;
    explicit Probe(const std::string& json) : block(parse_config(json)) {}
    int32_t idx(const char* name) const { return block.find(name); }
    double get(const char* name) const { return block.get(block.find(name)); }
    void set(const char* name, double v) { block.set(block.find(name), v); }
};

// Molar flows of one stream from its outputs (mass flow and mole fractions).
struct StreamMoles {
    double total, h2, o2, cl2, h2o;
};
StreamMoles stream(const Probe& p, const std::string& side) {
    const auto g = [&](const std::string& q) {
        const std::string name = "stream." + side + "." + q;
        try { return p.get(name.c_str()); } catch (const Error&) { return 0.0; }  // x_cl2 exists for brine only
    };
    StreamMoles s{};
    s.h2 = g("x_h2");
    s.o2 = g("x_o2");
    s.cl2 = side == "anode" ? g("x_cl2") : 0.0;
    s.h2o = g("x_h2o");
    const double molar_mass_mean =
        s.h2 * molar_mass::H2 + s.o2 * molar_mass::O2 + s.cl2 * molar_mass::Cl2 + s.h2o * molar_mass::H2O;
    s.total = molar_mass_mean > 0 ? g("mass_flow") / molar_mass_mean : 0.0;
    s.h2 *= s.total; s.o2 *= s.total; s.cl2 *= s.total; s.h2o *= s.total;
    return s;
}

double rel_err(double a, double b, double scale) { return std::fabs(a - b) / scale; }

}  // namespace

// (technology, extra top-level JSON): the defaults, and the options that move gas between
// the streams (Faraday-efficiency models, shunt currents, recombination, drag not returned).
using BalanceCase = std::pair<const char*, const char*>;
class UnitBalances : public ::testing::TestWithParam<BalanceCase> {};

TEST_P(UnitBalances, ElementAndEnergyBalancesCloseOverRandomPoints) {
    const std::string tech = GetParam().first;
    Probe p(minimal(tech.c_str(), std::string(R"(,"plant":{"thermal":{"heat_loss_coefficient":5}})") + GetParam().second));
    const auto& env = p.block.design().cell->envelope();
    const double drag_coefficient = tech == "pem" ? 2.5 : 0.0;  // PEM default electro-osmotic drag
    std::mt19937_64 rng(20261201);
    std::uniform_real_distribution<double> u(0.0, 1.0);
    const double p_lo = std::max(env.pressure_min, 1.1e5), p_hi = std::min(env.pressure_max, 30e5);
    int solved = 0;
    for (int k = 0; k < 1000; ++k) {
        const double t = env.temperature_fit_min + u(rng) * (env.temperature_fit_max - env.temperature_fit_min);
        const double pc = p_lo + u(rng) * (p_hi - p_lo);
        const double pa = p_lo + u(rng) * (std::min(p_hi, pc) - p_lo);
        const double t_feed = 288.15 + u(rng) * (t - 288.15);
        p.set("in.temperature", t);
        p.set("in.pressure_cathode", pc);
        p.set("in.pressure_anode", pa);
        p.set("in.feed_temperature", t_feed);
        p.set("in.hours_operated", u(rng) * 20000);
        const double j_max = p.block.design().cell->current_density_limit({env.current_density_max, t, pa, pc});
        p.set("in.current_density", (0.05 + 0.9 * u(rng)) * std::min(j_max, p.get("param.current_density_max")));
        p.block.solve();
        ++solved;

        // Voltage breakdown sums exactly.
        const double parts = p.get("cell.reversible_voltage") + p.get("cell.activation_anode") +
                             p.get("cell.activation_cathode") + p.get("cell.ohmic") + p.get("cell.concentration");
        ASSERT_NEAR(parts, p.get("cell.voltage"), 1e-14 * p.get("cell.voltage"));

        // Element balances: feed (water, salt) = cathode stream + anode stream + liquids out.
        const auto c = stream(p, "cathode"), a = stream(p, "anode");
        const double water_in = p.get("feed.water") / molar_mass::H2O;
        const double salt_in = tech == "brine" ? p.get("feed.salt") / molar_mass::NaCl : 0.0;
        const double naoh = tech == "brine" ? p.get("product.caustic") / molar_mass::NaOH : 0.0;
        double liquid_out =  // liquid water leaving: caustic solution water, drained drag water
            tech == "brine" ? (p.get("product.caustic_solution") - p.get("product.caustic")) / molar_mass::H2O : 0.0;
        if (!p.block.design().drag_water_returned)  // PEM drag water leaves as liquid: n_d·j/F per m²
            liquid_out += drag_coefficient * p.get("cell.current_density") / kFaraday * (20 * 3 * 0.05);
        const double h_in = 2 * water_in, o_in = water_in;
        const double h_out = 2 * (c.h2 + a.h2 + c.h2o + a.h2o + liquid_out) + naoh;
        const double o_out = 2 * (c.o2 + a.o2) + c.h2o + a.h2o + liquid_out + naoh;
        const double scale = h_in;
        ASSERT_LT(rel_err(h_in, h_out, scale), 1e-12) << tech << " H, point " << k;
        ASSERT_LT(rel_err(o_in, o_out, scale), 1e-12) << tech << " O, point " << k;
        if (tech == "brine") {
            ASSERT_LT(rel_err(salt_in, naoh, salt_in), 1e-12) << "Na";
            ASSERT_LT(rel_err(salt_in, 2 * a.cl2, salt_in), 1e-12) << "Cl";
            // Brine loop: salt fed with the resaturated brine less salt leaving with the depleted
            // brine is the salt consumed.
            const double fed = p.get("stream.brine_feed.mass_flow") * 0.26;  // default feed strength
            const double left = p.get("stream.depleted_brine.mass_flow") * p.get("stream.depleted_brine.nacl_mass_fraction");
            ASSERT_LT(rel_err(fed - left, p.get("feed.salt"), p.get("feed.salt")), 1e-12) << "brine loop";
            ASSERT_LT(p.get("stream.depleted_brine.nacl_mass_fraction"), 0.26);
        }

        // Energy: P_DC + H_feed = H_products + Q_duty + Q_loss, recomputed from the outputs
        // with the thermodynamic functions directly.
        double feed_h;
        if (tech == "solid_oxide") feed_h = water_in * ideal_gas(Species::water_vapour, t).enthalpy;
        else feed_h = water_in * liquid_water(t_feed, std::max(pa, pc)).enthalpy;
        if (tech == "brine") feed_h += salt_in * aqueous_solute(Solute::sodium_chloride, t_feed).enthalpy;
        double prod_h = (c.h2 + a.h2) * ideal_gas(Species::hydrogen, t).enthalpy +
                        (c.h2o + a.h2o) * ideal_gas(Species::water_vapour, t).enthalpy;
        if (c.o2 + a.o2 > 0) prod_h += (c.o2 + a.o2) * ideal_gas(Species::oxygen, t).enthalpy;
        if (a.cl2 > 0) prod_h += a.cl2 * ideal_gas(Species::chlorine, t).enthalpy;
        if (liquid_out > 0) prod_h += liquid_out * liquid_water(t, std::max(pc, water_saturation_pressure(t))).enthalpy;
        if (tech == "brine") prod_h += naoh * aqueous_solute(Solute::sodium_hydroxide, t).enthalpy;
        const double power = p.get("stack.power");
        const double lhs = power + feed_h, rhs = prod_h + p.get("heat.duty") + p.get("heat.loss");
        ASSERT_LT(std::fabs(lhs - rhs), 1e-9 * power) << tech << " energy, point " << k;

        // Faraday's law: product hydrogen = j·A_total/(2F)·η_F·M_H2.
        const double area_total = 20 * 3 * 0.05;
        const double faraday = p.get("cell.current_density") * area_total / (2 * kFaraday) *
                               p.get("cell.faraday_efficiency") * molar_mass::H2;
        ASSERT_LT(rel_err(p.get("product.hydrogen"), faraday, faraday), 1e-9) << tech;
        ASSERT_LT(rel_err(p.get("perf.specific_energy"), power / p.get("product.hydrogen"), p.get("perf.specific_energy")),
                  1e-14);
        ASSERT_GT(p.get("cell.faraday_efficiency"), 0.0);
        ASSERT_LE(p.get("cell.faraday_efficiency"), 1.0);
        ASSERT_GE(p.get("gas.h2_in_o2"), 0.0);
        ASSERT_LT(p.get("gas.h2_in_o2"), 1.0);
    }
    EXPECT_EQ(solved, 1000);
}

INSTANTIATE_TEST_SUITE_P(
    AllTechnologies, UnitBalances,
    ::testing::Values(BalanceCase{"pem", ""}, BalanceCase{"alkaline", ""}, BalanceCase{"solid_oxide", ""},
                      BalanceCase{"brine", ""},
                      BalanceCase{"pem", R"(,"cell":{"o2_recombination_fraction":0.3})"},
                      BalanceCase{"alkaline", R"(,"cell":{"faraday_model":1})"},
                      BalanceCase{"alkaline", R"(,"cell":{"shunt_model":1,"shunt_current_fraction":0.02})"},
                      BalanceCase{"alkaline", R"(,"cell":{"shunt_model":2})"},
                      BalanceCase{"brine", R"(,"cell":{"voltage_model":1})"}),
    [](const ::testing::TestParamInfo<BalanceCase>& info) {
        return std::string(info.param.first) + (*info.param.second ? "_option_" + std::to_string(info.index) : "");
    });

TEST(UnitBalances, DragWaterNotReturnedIsMakeUpWater) {
    // PEM: water dragged to the cathode and drained adds n_d·j/F per m² to the make-up water.
    Probe kept(minimal("pem")), drained(minimal("pem", R"(,"plant":{"drag_water_returned":false})"));
    kept.block.solve();
    drained.block.solve();
    const double j = kept.get("cell.current_density");
    const double extra = 2.5 * j / kFaraday * (20 * 3 * 0.05) * molar_mass::H2O;  // default n_d = 2.5
    EXPECT_NEAR(drained.get("feed.water") - kept.get("feed.water"), extra, 1e-12 * extra);
    EXPECT_LT(drained.get("heat.duty"), kept.get("heat.duty"));  // liquid leaves hot, fed cold
}

class UnitSpecs : public ::testing::TestWithParam<const char*> {};

TEST_P(UnitSpecs, PowerHydrogenAndVoltageSpecsMeetTheirSetpoints) {
    Probe p(minimal(GetParam()));
    p.block.solve();
    const double j0 = p.get("cell.current_density");
    const double power = p.get("stack.power"), h2 = p.get("product.hydrogen"), v = p.get("cell.voltage");
    for (double f : {0.3, 0.77, 1.0}) {
        p.block.set_spec(Spec::power);
        p.set("in.power", f * power);
        p.block.solve();
        EXPECT_LT(std::fabs(p.get("stack.power") / (f * power) - 1.0), 1e-9) << f;
        p.block.set_spec(Spec::hydrogen_rate);
        p.set("in.hydrogen_rate", f * h2);
        p.block.solve();
        EXPECT_LT(std::fabs(p.get("product.hydrogen") / (f * h2) - 1.0), 1e-9) << f;
    }
    p.block.set_spec(Spec::voltage);
    p.set("in.voltage", v);
    p.block.solve();
    EXPECT_NEAR(p.get("cell.current_density"), j0, 1e-6 * j0);
}

TEST_P(UnitSpecs, InfeasiblePowerNamesTheLimitAndKeepsTheLastState) {
    Probe p(minimal(GetParam()));
    p.block.solve();
    const double v_before = p.get("cell.voltage"), t_before = p.get("in.temperature");
    p.block.set_spec(Spec::power);
    p.set("in.power", 1e12);
    try {
        p.block.solve();
        FAIL() << "an infeasible power was accepted";
    } catch (const Error& e) {
        EXPECT_EQ(e.kind(), ErrorKind::infeasible);
        EXPECT_THAT(e.what(), HasSubstr("maximum current density"));
        EXPECT_THAT(e.what(), HasSubstr("in.power"));
    }
    EXPECT_TRUE(p.block.solved());
    EXPECT_EQ(p.get("cell.voltage"), v_before);
    EXPECT_EQ(p.get("in.temperature"), t_before);
}

TEST_P(UnitSpecs, HeatDutyFollowsTheThermoneutralVoltage) {
    // With feed at stack temperature, the duty is the electrical power above what the net
    // hydrogen product's reaction enthalpy absorbs (N·I·E_tn per unit of Faraday efficiency),
    // less the latent heat of the vapour leaving with the gases (PHYSICS.md, "Thermoneutral
    // operation"). Side reactions (crossover, caustic back-migration) make that estimate
    // approximate: it must agree in sign wherever it exceeds 5 % of the power.
    const std::string tech = GetParam();
    Probe p(minimal(tech.c_str()));
    p.block.solve();
    const double t = p.get("in.temperature");
    p.set("in.feed_temperature", t);
    const double j_max = p.get("param.current_density_max");
    const double latent =
        tech == "solid_oxide" ? 0.0 : ideal_gas(Species::water_vapour, t).enthalpy - liquid_water_standard(t).enthalpy;
    int above = 0, below = 0;
    for (double f = 0.02; f <= 0.95; f += 0.01) {
        p.set("in.current_density", f * j_max);
        p.block.solve();
        const double power = p.get("stack.power");
        const double h2_moles = p.get("product.hydrogen") / molar_mass::H2;
        double vapour = stream(p, "anode").h2o;
        if (tech != "solid_oxide") vapour += stream(p, "cathode").h2o;  // SOEC steam is fed as steam
        const double estimate = power - h2_moles * 2 * kFaraday * p.get("cell.thermoneutral_voltage") - vapour * latent;
        if (estimate > 0.05 * power) { EXPECT_GT(p.get("heat.duty"), 0.0) << f; ++above; }
        if (estimate < -0.05 * power) { EXPECT_LT(p.get("heat.duty"), 0.0) << f; ++below; }
        if (p.get("cell.voltage") > p.get("cell.thermoneutral_voltage") + 0.05 && vapour == 0.0) {
            EXPECT_GT(p.get("heat.duty"), 0.0) << "above thermoneutral without vapour";
        }
    }
    EXPECT_GT(above + below, 10);
}

INSTANTIATE_TEST_SUITE_P(AllTechnologies, UnitSpecs, ::testing::Values("pem", "alkaline", "solid_oxide", "brine"));

TEST(UnitPlant, RectifierAndAuxiliariesFollowTheirLossModel) {
    // P_loss = P_rated·(a0 + a1·x + a2·x²), x = P_DC/P_rated; auxiliaries fixed + k·P_DC; the
    // AC power is their sum with the DC power (defaults: 0.5 %, 1 %, 1.5 %; 3 %).
    Probe p(minimal("pem", R"(,"plant":{"rectifier":{"rated_power":"200 kW"},"auxiliaries":{"fixed":"5 kW"}})"));
    for (double j : {2000.0, 10000.0, 20000.0}) {
        p.set("in.current_density", j);
        p.block.solve();
        const double dc = p.get("stack.power"), x = dc / 200e3;
        const double loss = 200e3 * (0.005 + 0.010 * x + 0.015 * x * x);
        EXPECT_NEAR(p.get("plant.rectifier_loss"), loss, 1e-9 * loss);
        EXPECT_NEAR(p.get("plant.auxiliary_power"), 5e3 + 0.03 * dc, 1e-9 * dc);
        EXPECT_NEAR(p.get("plant.power"), dc + loss + 5e3 + 0.03 * dc, 1e-9 * dc);
        EXPECT_NEAR(p.get("plant.rectifier_efficiency"), dc / (dc + loss), 1e-12);
        EXPECT_NEAR(p.get("perf.specific_energy_plant"), p.get("plant.power") / p.get("product.hydrogen"),
                    1e-9 * p.get("perf.specific_energy_plant"));
    }
}

TEST(UnitAlarms, LowLoadRaisesHydrogenInOxygenWarning) {
    Probe p(minimal("alkaline"));
    p.block.solve();
    const double j_max = p.get("param.current_density_max");
    p.set("in.current_density", 0.5 * j_max);
    EXPECT_FALSE(p.block.solve().warning);
    double previous = p.get("gas.h2_in_o2");
    bool warned = false;
    for (double f = 0.4; f > 0.004; f *= 0.7) {
        p.set("in.current_density", f * j_max);
        const auto outcome = p.block.solve();
        EXPECT_GT(p.get("gas.h2_in_o2"), previous);  // purity worsens as load falls
        previous = p.get("gas.h2_in_o2");
        if (p.get("alarm.h2_in_o2_warning") > 0) {
            warned = true;
            EXPECT_TRUE(outcome.warning);
            EXPECT_THAT(outcome.message, HasSubstr("hydrogen in the anode gas"));
        }
    }
    EXPECT_TRUE(warned);
}

TEST(UnitLifeCycle, OutputsAreStaleAfterASetAndInputsAreChecked) {
    Probe p(minimal("pem"));
    EXPECT_THROW(p.get("cell.voltage"), Error);
    p.block.solve();
    const double v = p.get("cell.voltage");
    p.set("in.temperature", 340.0);
    try {
        p.get("cell.voltage");
        FAIL();
    } catch (const Error& e) {
        EXPECT_EQ(e.kind(), ErrorKind::wrong_state);
    }
    // An input the spec does not read is stored (a co-simulation master sets every input at
    // every step); the spec decides what the solve reads.
    p.set("in.power", 1e6);
    EXPECT_EQ(p.get("in.power"), 1e6);
    EXPECT_THROW(p.set("cell.voltage", 2.0), Error);
    EXPECT_THROW(p.set("in.temperature", std::nan("")), Error);
    EXPECT_THROW(p.set("in.pressure_anode", -1.0), Error);
    EXPECT_EQ(p.get("in.temperature"), 340.0);  // failed sets changed nothing
    p.block.solve();
    EXPECT_NE(p.get("cell.voltage"), v);  // colder: a different voltage
    EXPECT_EQ(p.get("in.power"), 1e6);    // stored, not read, not overwritten
    EXPECT_NE(p.get("stack.power"), 1e6);
}

TEST(UnitSpecs, TargetsBelowTheSmallestCurrentDensityAreInfeasible) {
    // At 30 bar the membrane passes enough hydrogen that a PEM cell needs a minimum current
    // to make net gas; a power or hydrogen target under it cannot be met.
    Probe p(R"({"technology":"pem","stack":{"cells":20,"active_area":0.05,"stacks":3},
                "operating":{"spec":"power","power":1000,"pressure_cathode":"30 bar"}})");
    p.set("in.power", 1.0);
    try {
        p.block.solve();
        FAIL() << "1 W accepted";
    } catch (const Error& e) {
        EXPECT_EQ(e.kind(), ErrorKind::infeasible);
        EXPECT_THAT(e.what(), HasSubstr("smallest current density"));
    }
    const double j_min = p.block.design().cell->current_density_minimum({1e4, p.get("in.temperature"), 101325, 30e5});
    EXPECT_GT(j_min, 0.0);
    // Just above the minimum the power spec solves, and lands above it.
    p.set("in.power", 20 * 3 * 0.05 * 1.5 * 3 * j_min);
    p.block.solve();
    EXPECT_GT(p.get("cell.current_density"), j_min);
    EXPECT_GT(p.get("product.hydrogen"), 0.0);
}

TEST(UnitExamples, EveryBundledConfigurationSolves) {
    const char* files[] = {"examples/demo-plant.json",       "examples/zinc-electrowinning.json",
                           "examples/minimal/pem.json",      "examples/minimal/alkaline.json",
                           "examples/minimal/solid_oxide.json", "examples/minimal/brine.json",
                           "examples/minimal/custom.json"};
    for (const char* f : files) {
        Block b(load_config_file(std::string(ELY_SOURCE_DIR) + "/" + f));
        EXPECT_NO_THROW(b.solve()) << f;
        EXPECT_TRUE(b.solved()) << f;
    }
}

TEST(UnitCustom, ReactionSharesAndProductRatesThroughTheBlock) {
    // Zinc deposition competing with hydrogen evolution (the invented demo cell): shares at
    // each electrode sum to 1; each product rate is Faraday's law on its share; hydrogen's
    // share grows as the zinc-ion limiting current is approached.
    Block b(load_config_file(std::string(ELY_SOURCE_DIR) + "/examples/zinc-electrowinning.json"));
    const auto get = [&](const char* n) { return b.get(b.find(n)); };
    double previous_h2_share = -1;
    for (double j : {200.0, 500.0, 900.0, 1200.0}) {
        b.set(b.find("in.current_density"), j);
        b.solve();
        const double zn = get("reaction.cathode_1.current_efficiency"), h2 = get("reaction.cathode_2.current_efficiency");
        EXPECT_NEAR(zn + h2, 1.0, 1e-12);
        EXPECT_NEAR(get("reaction.anode_1.current_efficiency"), 1.0, 1e-12);
        const double current = j * 1.6 * 40;  // A, all cells
        EXPECT_NEAR(get("reaction.cathode_1.product_rate"), zn * current / (2 * kFaraday) * 65.38e-3, 1e-12);
        EXPECT_NEAR(get("product.hydrogen"), h2 * current / (2 * kFaraday) * molar_mass::H2, 1e-12);
        EXPECT_EQ(get("cell.faraday_efficiency"), h2);  // hydrogen basis
        EXPECT_GT(h2, previous_h2_share);
        previous_h2_share = h2;
    }
    EXPECT_THROW(b.find("product.chlorine"), Error);
}
