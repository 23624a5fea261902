#include "electrochem/electrolyte.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>

#include "electrochem/conduction.hpp"
#include "electrochem/kinetics.hpp"
#include "base/check.hpp"
#include "thermo/constants.hpp"

namespace ely {
namespace {

// Pitzer's universal constants for the single-salt equations (Pitzer 1991; Pitzer & Mayorga 1973).
constexpr double kPitzerB = 1.2;       // kg^½/mol^½
constexpr double kPitzerAlpha1 = 2.0;  // kg^½/mol^½ (1-1 salts)

// Temperature function of Møller (1988), eq. 13:
// P(T) = a1 + a2 T + a3/T + a4 ln T + a5/(T − 263) + a6 T² + a7/(680 − T) + a8/(T − 227).
// Coefficients as transcribed in the public Pytzer code (Humphreys et al.), checked here
// against the 25 °C values of Pitzer & Mayorga (1973) (tests).
double moller_1988(double t, const double (&a)[8]) {
    return a[0] + a[1] * t + a[2] / t + a[3] * std::log(t) + a[4] / (t - 263.0) + a[5] * t * t + a[6] / (680.0 - t) +
           a[7] / (t - 227.0);
}
constexpr double kMollerAphi[8] = {3.36901532e-1, -6.32100430e-4, 9.14252359e00, -1.35143986e-2,
                                   2.26089488e-3, 1.92118597e-6,  4.52586464e+1, 0.0};
constexpr double kMollerNaClBeta0[8] = {1.43783204e+1, 5.60767406e-3, -4.22185236e+2, -2.51226677e00,
                                        0.0,           -2.61718135e-6, 4.43854508e00, -1.70502337e00};
constexpr double kMollerNaClBeta1[8] = {-4.83060685e-1, 1.40677479e-3, 1.19311989e+2, 0.0, 0.0, 0.0, 0.0,
                                        -4.23433299e00};
constexpr double kMollerNaClCphi[8] = {-1.00588714e-1, -1.80529413e-5, 8.61185543e00, 1.24880954e-2,
                                       0.0,            3.41172108e-8,  6.83040995e-2, 2.93922611e-1};
constexpr double kMollerTmin = 273.15, kMollerTmax = 573.15;

// Pabalan & Pitzer (1987), NaOH(aq), with pressure P in bar:
// P(T,p) = q1 + q2 p + q3/T + q4 p/T + q5 ln T + q6 T + q7 T p + q8 T² + q9 T² p
//          + q10/(T − 227) + q11/(647 − T) + q12 p/(647 − T).
// Coefficients as transcribed in the public Pytzer code (the corrected set: β0(298.15 K)
// = 0.0864, β1 = 0.2530, C^φ = 0.0041, against Pitzer & Mayorga's 0.0864, 0.253, 0.0044).
// Evaluated at p = 1.01325 bar; the pressure terms change β0 by < 1e-6 per bar here.
double pabalan_pitzer_1987(double t, double p, const double (&q)[12]) {
    return q[0] + q[1] * p + q[2] / t + q[3] * p / t + q[4] * std::log(t) + q[5] * t + q[6] * t * p + q[7] * t * t +
           q[8] * t * t * p + q[9] / (t - 227.0) + q[10] / (647.0 - t) + q[11] * p / (647.0 - t);
}
constexpr double kPPNaOHBeta0[12] = {2.7682478e+2,  -2.8131778e-3, -7.3755443e+3, 3.7012540e-1,
                                     -4.9359970e+1, 1.0945106e-1,  7.1788733e-6,  -4.0218506e-5,
                                     -5.8847404e-9, 1.1931122e+1,  2.4824963e00,  -4.8217410e-3};
constexpr double kPPNaOHBeta1[12] = {4.6286977e+2, 0.0, -1.0294181e+4, 0.0, -8.5960581e+1, 2.3905969e-1,
                                     0.0,          -1.0795894e-4, 0.0,  0.0, 0.0,           0.0};
constexpr double kPPNaOHCphi[12] = {-1.6686897e+01, 4.0534778e-04,  4.5364961e+02, -5.1714017e-02,
                                    2.9680772e000,  -6.5161667e-03, -1.0553037e-06, 2.3765786e-06,
                                    8.9893405e-10,  -6.8923899e-01, -8.1156286e-02, 0.0};
constexpr double kPPTmin = 298.15, kPPTmax = 523.15;
constexpr double kPPPressureBar = 1.01325;

}  // namespace

const char* aqueous_salt_name(AqueousSalt salt) {
    return salt == AqueousSalt::sodium_chloride ? "NaCl" : "NaOH";
}

double aqueous_salt_molar_mass(AqueousSalt salt) {
    return salt == AqueousSalt::sodium_chloride ? molar_mass::NaCl : molar_mass::NaOH;
}

PitzerSaltParameters pitzer_parameters_25c(AqueousSalt salt) {
    if (salt == AqueousSalt::sodium_chloride) return {0.0765, 0.2664, 0.00127};
    return {0.0864, 0.253, 0.0044};
}

double debye_huckel_osmotic_slope(double temperature) {
    require_within(temperature, kMollerTmin, kMollerTmax, "Debye-Hueckel slope: temperature", "K");
    return moller_1988(temperature, kMollerAphi);
}

PitzerSaltParameters pitzer_parameters(AqueousSalt salt, double temperature) {
    if (salt == AqueousSalt::sodium_chloride) {
        require_within(temperature, kMollerTmin, kMollerTmax, "NaCl Pitzer parameters: temperature", "K");
        return {moller_1988(temperature, kMollerNaClBeta0), moller_1988(temperature, kMollerNaClBeta1),
                moller_1988(temperature, kMollerNaClCphi)};
    }
    require_within(temperature, kPPTmin, kPPTmax, "NaOH Pitzer parameters: temperature", "K");
    return {pabalan_pitzer_1987(temperature, kPPPressureBar, kPPNaOHBeta0),
            pabalan_pitzer_1987(temperature, kPPPressureBar, kPPNaOHBeta1),
            pabalan_pitzer_1987(temperature, kPPPressureBar, kPPNaOHCphi)};
}

double aqueous_salt_molality_max(AqueousSalt salt) { return salt == AqueousSalt::sodium_chloride ? 6.7 : 16.0; }

ElectrolyteActivity pitzer_activity(const PitzerSaltParameters& p, double osmotic_slope, double molality) {
    require_finite(p.beta0, "Pitzer beta0");
    require_finite(p.beta1, "Pitzer beta1");
    require_finite(p.c_phi, "Pitzer C_phi");
    require_positive(osmotic_slope, "Debye-Hueckel slope");
    require_finite(molality, "molality");
    if (molality < 0.0)
        throw Error(ErrorKind::invalid_argument, fmt::format("molality {:g} mol/kg is negative", molality));
    if (molality == 0.0) return {1.0, 1.0, 1.0, 0.0};

    const double m = molality, sqrt_i = std::sqrt(m);  // I = m for a 1-1 salt
    const double bi = kPitzerB * sqrt_i, x = kPitzerAlpha1 * sqrt_i, ex = std::exp(-x);
    const double f_gamma = -osmotic_slope * (sqrt_i / (1.0 + bi) + (2.0 / kPitzerB) * std::log1p(bi));
    const double b_gamma = 2.0 * p.beta0 + 2.0 * p.beta1 / (x * x) * (1.0 - (1.0 + x - 0.5 * x * x) * ex);
    const double ln_gamma = f_gamma + m * b_gamma + 1.5 * m * m * p.c_phi;
    const double phi = 1.0 - osmotic_slope * sqrt_i / (1.0 + bi) + m * (p.beta0 + p.beta1 * ex) + m * m * p.c_phi;
    const double gamma = std::exp(ln_gamma);
    const double mg = m * gamma;  // m° = 1 mol/kg
    return {gamma, phi, std::exp(-2.0 * m * molar_mass::H2O * phi), mg * mg};
}

ElectrolyteActivity aqueous_salt_activity(AqueousSalt salt, double molality, double temperature) {
    const double m_max = aqueous_salt_molality_max(salt);
    require_finite(molality, "molality");
    if (molality < 0.0 || molality > m_max)
        throw Error(ErrorKind::out_of_range,
                    fmt::format("{} molality {:g} mol/kg is outside the range 0..{:g} mol/kg of the activity model",
                                aqueous_salt_name(salt), molality, m_max));
    return pitzer_activity(pitzer_parameters(salt, temperature), debye_huckel_osmotic_slope(temperature), molality);
}

double RelativeEnthalpies::apparent(double molality) const {
    return molality > 0.0 ? solute + water / (molality * molar_mass::H2O) : 0.0;
}

RelativeEnthalpies aqueous_salt_relative_enthalpies(AqueousSalt salt, double molality, double temperature) {
    const auto at = [&](double t) { return aqueous_salt_activity(salt, molality, t); };
    const double t_lo = salt == AqueousSalt::sodium_chloride ? kMollerTmin : kPPTmin;
    const double t_hi = salt == AqueousSalt::sodium_chloride ? kMollerTmax : kPPTmax;
    require_within(temperature, t_lo, t_hi, "relative enthalpies: temperature", "K");
    constexpr double h = 0.01;  // K
    const double lo = std::max(t_lo, temperature - h), hi = std::min(t_hi, temperature + h);
    const auto a = at(lo), b = at(hi);
    const double dln_gamma = (std::log(b.mean_activity_coefficient) - std::log(a.mean_activity_coefficient)) / (hi - lo);
    const double dln_aw = (std::log(b.water_activity) - std::log(a.water_activity)) / (hi - lo);
    const double rt2 = kGasConstant * temperature * temperature;
    return {-2.0 * rt2 * dln_gamma, -rt2 * dln_aw};
}

ReactionProperties brine_electrolysis_at(double temperature, double nacl_molality, double naoh_molality) {
    const auto standard = brine_electrolysis(temperature);
    const auto nacl = aqueous_salt_activity(AqueousSalt::sodium_chloride, nacl_molality, temperature);
    const auto naoh = aqueous_salt_activity(AqueousSalt::sodium_hydroxide, naoh_molality, temperature);
    const auto l_nacl = aqueous_salt_relative_enthalpies(AqueousSalt::sodium_chloride, nacl_molality, temperature);
    const auto l_naoh = aqueous_salt_relative_enthalpies(AqueousSalt::sodium_hydroxide, naoh_molality, temperature);
    const double dh = standard.enthalpy + 2.0 * l_naoh.solute - 2.0 * l_nacl.solute - 2.0 * l_naoh.water;
    const double dg = standard.gibbs + kGasConstant * temperature *
                                           (std::log(naoh.electrolyte_activity) * 2.0 -
                                            std::log(nacl.electrolyte_activity) * 2.0 - 2.0 * std::log(naoh.water_activity));
    return {dh, (dh - dg) / temperature, dg, 2};
}

double molality_from_mass_fraction(double mass_fraction, double molar_mass) {
    require_positive(molar_mass, "molar mass");
    require_finite(mass_fraction, "mass fraction");
    if (!(mass_fraction >= 0.0 && mass_fraction < 1.0))
        throw Error(ErrorKind::out_of_range,
                    fmt::format("mass fraction {:g} is outside [0, 1) for a solution in water", mass_fraction));
    return mass_fraction / ((1.0 - mass_fraction) * molar_mass);
}

double mass_fraction_from_molality(double molality, double molar_mass) {
    require_positive(molar_mass, "molar mass");
    require_finite(molality, "molality");
    if (molality < 0.0)
        throw Error(ErrorKind::invalid_argument, fmt::format("molality {:g} mol/kg is negative", molality));
    const double mm = molality * molar_mass;
    return mm / (1.0 + mm);
}

double arrhenius_conductivity(const ArrheniusConductivity& c, double temperature) {
    require_positive(temperature, "temperature");
    return c.reference_conductivity * arrhenius_factor(c.activation_energy, c.reference_temperature, temperature);
}

double bubbly_gap_resistance(double gap, double conductivity, double void_fraction) {
    require_finite(gap, "electrolyte gap");
    if (gap < 0.0) throw Error(ErrorKind::invalid_argument, fmt::format("electrolyte gap {:g} m is negative", gap));
    require_positive(conductivity, "electrolyte conductivity");
    // A bubbly gap stays a liquid with bubbles up to a void fraction of about 0.9 (the cap of
    // the alkaline bubble model's parameter, typical value, from memory); beyond it the
    // Bruggeman dispersion picture does not hold.
    require_within(void_fraction, 0.0, 0.9, "gas void fraction", "");
    return gap / bruggeman_conductivity(conductivity, void_fraction);
}

}  // namespace ely
