#include "electrochem/conduction.hpp"

#include <algorithm>
#include <cmath>
#include <fmt/format.h>

#include "electrochem/kinetics.hpp"
#include "base/check.hpp"
#include "thermo/constants.hpp"

namespace ely {

double membrane_conductivity_springer(double water_content, double temperature) {
    require_positive(temperature, "membrane temperature");
    require_finite(water_content, "membrane water content");
    // Springer et al. 1991, eq. (25): S/cm.
    const double sigma_303 = 0.005139 * water_content - 0.00326;
    if (!(sigma_303 > 0.0))
        throw Error(ErrorKind::out_of_range,
                    fmt::format("membrane water content {:g} is at or below {:g} mol H2O/mol SO3H, where the "
                                "Springer conductivity correlation gives no conduction",
                                water_content, 0.00326 / 0.005139));
    return 100.0 * sigma_303 * std::exp(1268.0 * (1.0 / 303.0 - 1.0 / temperature));
}

double koh_density(double mass_fraction, double temperature) {
    require_within(mass_fraction, 0.0, 0.5, "KOH mass fraction", "kg/kg");
    require_within(temperature, 273.15, 373.15, "KOH solution temperature", "K");
    const double t = temperature - kZeroCelsius;
    // Haug et al. 2017: water-like polynomial in °C times exp(0.86 w).
    const double base = 1001.53053 + t * (-0.08343 + t * (-0.00401 + t * (5.51232e-6 + t * (-8.20994e-10))));
    return base * std::exp(0.86 * mass_fraction);
}

double koh_molarity(double mass_fraction, double temperature) {
    // mol/m³ → mol/L
    return mass_fraction * koh_density(mass_fraction, temperature) / molar_mass::KOH * 1e-3;
}

double koh_conductivity_gilliam(double molarity, double temperature) {
    require_within(molarity, 0.0, 12.0, "KOH molarity", "mol/L");
    require_within(temperature, 273.15, 373.15, "KOH solution temperature", "K");
    const double m = molarity, t = temperature;
    // Gilliam et al. 2007, S/cm.
    const double sigma = -2.041 * m - 0.0028 * m * m + 0.005332 * m * t + 207.2 * m / t + 0.001043 * m * m * m -
                         3.0e-7 * m * m * t * t;
    return 100.0 * sigma;
}

double koh_water_activity_balej(double molality, double temperature) {
    require_within(molality, 0.0, 18.0, "KOH molality", "mol/kg");
    require_within(temperature, 273.15, 474.0, "KOH solution temperature", "K");
    const double m = molality;
    const double log10_aw = -0.02255 * m + 0.001434 * m * m + (1.38 * m - 0.9254 * m * m) / temperature;
    return std::pow(10.0, log10_aw);
}

double bruggeman_conductivity(double conductivity, double void_fraction) {
    require_finite(conductivity, "electrolyte conductivity");
    require_finite(void_fraction, "void fraction");
    require_within(void_fraction, 0.0, 1.0, "non-conducting volume fraction", "");
    const double liquid = 1.0 - void_fraction;
    return conductivity * liquid * std::sqrt(liquid);
}

double bubble_void_fraction(const BubbleVoidModel& model, double current_density) {
    require_finite(current_density, "current density");
    if (current_density <= 0.0 || model.coefficient <= 0.0) return 0.0;
    return std::min(model.coefficient * std::pow(current_density, model.exponent), model.maximum);
}

double arrhenius_area_specific_resistance(double asr_reference, double activation_energy,
                                          double reference_temperature, double temperature) {
    require_positive(temperature, "temperature");
    require_positive(reference_temperature, "reference temperature");
    return asr_reference * arrhenius_factor(-activation_energy, reference_temperature, temperature);
}

}  // namespace ely
