#pragma once
// A minimal material object of CAPE-OPEN thermodynamics 1.1 for the test client: a compound
// list, overall temperature, pressure, flow and composition, and a temperature-pressure flash
// with ideal gases (H2, O2, N2, Cl2), non-volatile solutes (NaCl, NaOH) and water split by
// Raoult's law over an ideal liquid (vapour pressure from ely_water_saturation_pressure).
#include <string>
#include <vector>

#include "com_base.hpp"

namespace test {

struct CompoundInfo {
    std::wstring id, formula, cas;
    double molar_mass;  // kg/mol
};

// Compounds by formula: H2O, H2, O2, N2, Cl2, NaCl, NaOH.
CompoundInfo compound(const std::wstring& formula);

class Material : public elyco::CapeObject,
                 public elyco::DispatchOf<ICapeThermoMaterial>,
                 public elyco::DispatchOf<ICapeThermoCompounds>,
                 public elyco::DispatchOf<ICapeThermoPhases>,
                 public elyco::DispatchOf<ICapeThermoEquilibriumRoutine> {
public:
    Material(std::wstring name, std::vector<CompoundInfo> compounds);
    ELYCO_IUNKNOWN
    // ICapeThermoMaterial
    STDMETHODIMP ClearAllProps() override;
    STDMETHODIMP CopyFromMaterial(IDispatch** source) override;
    STDMETHODIMP CreateMaterial(IDispatch** material) override;
    STDMETHODIMP GetOverallProp(BSTR property, BSTR basis, VARIANT* results) override;
    STDMETHODIMP GetOverallTPFraction(double* temperature, double* pressure, VARIANT* composition) override;
    STDMETHODIMP GetPresentPhases(VARIANT* labels, VARIANT* status) override;
    STDMETHODIMP GetSinglePhaseProp(BSTR property, BSTR phase, BSTR basis, VARIANT* results) override;
    STDMETHODIMP GetTPFraction(BSTR phase, double* temperature, double* pressure, VARIANT* composition) override;
    STDMETHODIMP GetTwoPhaseProp(BSTR property, VARIANT phases, BSTR basis, VARIANT* results) override;
    STDMETHODIMP SetOverallProp(BSTR property, BSTR basis, VARIANT values) override;
    STDMETHODIMP SetPresentPhases(VARIANT labels, VARIANT status) override;
    STDMETHODIMP SetSinglePhaseProp(BSTR property, BSTR phase, BSTR basis, VARIANT values) override;
    STDMETHODIMP SetTwoPhaseProp(BSTR property, VARIANT phases, BSTR basis, VARIANT values) override;
    // ICapeThermoCompounds
    STDMETHODIMP GetCompoundConstant(VARIANT props, VARIANT ids, VARIANT* values) override;
    STDMETHODIMP GetCompoundList(VARIANT* ids, VARIANT* formulae, VARIANT* names, VARIANT* boiling, VARIANT* molwts,
                                 VARIANT* cas) override;
    STDMETHODIMP GetConstPropList(VARIANT* props) override;
    STDMETHODIMP GetNumCompounds(long* count) override;
    STDMETHODIMP GetPDependentProperty(VARIANT props, double pressure, VARIANT ids, VARIANT* values) override;
    STDMETHODIMP GetPDependentPropList(VARIANT* props) override;
    STDMETHODIMP GetTDependentProperty(VARIANT props, double temperature, VARIANT ids, VARIANT* values) override;
    STDMETHODIMP GetTDependentPropList(VARIANT* props) override;
    // ICapeThermoPhases
    STDMETHODIMP GetNumPhases(long* count) override;
    STDMETHODIMP GetPhaseInfo(BSTR phase, BSTR attribute, VARIANT* value) override;
    STDMETHODIMP GetPhaseList(VARIANT* labels, VARIANT* aggregation, VARIANT* key) override;
    // ICapeThermoEquilibriumRoutine
    STDMETHODIMP CalcEquilibrium(VARIANT spec1, VARIANT spec2, BSTR solution_type) override;
    STDMETHODIMP CheckEquilibriumSpec(VARIANT spec1, VARIANT spec2, BSTR solution_type, VARIANT_BOOL* ok) override;

    // For the test: set the overall state directly, read results.
    void set_overall(double temperature, double pressure, double total_flow, const std::vector<double>& fractions);
    double temperature = 0, pressure = 0, total_flow = 0;
    std::vector<double> fractions;
    std::vector<CompoundInfo> compounds;
    bool flashed = false;
    int flashes = 0;
    double vapour_fraction = 0;                           // moles of vapour over total, after the flash
    std::vector<double> vapour_x, liquid_x;               // phase compositions after the flash
    std::vector<std::wstring> present;                    // phases the unit allowed before the flash
};

}  // namespace test
