#pragma once
// Anion-exchange-membrane (AEM) water electrolysis: the membrane's hydroxide conductivity,
// beside the factory the technology registry names (aem_parameters(), make_aem_cell()).
// Equations, defaults and their sources: docs/cells-aem.md.
namespace ely {

/// The hydrated membrane, in the terms of its maker's data sheet.
struct HydroxideMembrane {
    double ion_exchange_capacity;  // mol of fixed cations per kg of dry polymer (mmol/g)
    double water_content;          // λ, mol H2O per fixed cation
    double dry_density;            // kg/m³ of dry polymer
};

/// Volume fraction of water in the swollen membrane: V_w/(V_w + V_p), V_w = λ·IEC·M_w/ρ_w per kg
/// of dry polymer (ρ_w = 997 kg/m³), V_p = 1/ρ_dry.
double membrane_water_volume_fraction(const HydroxideMembrane& membrane);

/// Hydroxide conductivity of the swollen membrane, S/m, by Nernst–Einstein:
/// σ = F²·c·D_eff/(R·T) with c the fixed-charge (= hydroxide) concentration of the swollen
/// membrane, IEC·ρ_dry/(1 + λ·IEC·M_w·ρ_dry/ρ_w), and D_eff the hydroxide diffusivity in water,
/// Arrhenius in T from D_ref at 298.15 K, times the Bruggeman tortuosity φ_w^1.5 of the water
/// network. Hydration enters through c and φ_w, temperature through D.
double hydroxide_membrane_conductivity(const HydroxideMembrane& membrane, double diffusivity_298,
                                       double diffusivity_activation_energy, double temperature);

}  // namespace ely
