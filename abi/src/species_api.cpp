// Species data of the C interface: the molar masses the model converts its streams with.
#include <cstring>
#include <string>

#include "elyblock/elyblock.h"
#include "guard.hpp"
#include "thermo/constants.hpp"

namespace {
struct MolarMass {
    const char* formula;
    double kg_per_mol;
};
constexpr MolarMass kMolarMasses[] = {
    {"H2", ely::molar_mass::H2},     {"O2", ely::molar_mass::O2},     {"H2O", ely::molar_mass::H2O},
    {"N2", ely::molar_mass::N2},     {"Cl2", ely::molar_mass::Cl2},   {"NaCl", ely::molar_mass::NaCl},
    {"NaOH", ely::molar_mass::NaOH}, {"KOH", ely::molar_mass::KOH},
};
}  // namespace

extern "C" {

ELY_API int32_t ely_molar_mass(const char* formula, double* kg_per_mol) {
    return ely::capi::guard([&] {
        ely::capi::require_pointer(formula, "formula");
        ely::capi::require_pointer(kg_per_mol, "kg_per_mol");
        std::string known;
        for (const auto& m : kMolarMasses) {
            if (std::strcmp(m.formula, formula) == 0) {
                *kg_per_mol = m.kg_per_mol;
                return ELY_OK;
            }
            known += known.empty() ? m.formula : std::string(", ") + m.formula;
        }
        throw ely::Error(ely::ErrorKind::unknown_name,
                         "no molar mass for '" + std::string(formula) + "'; known formulas: " + known);
    });
}

}  // extern "C"
