// The test client's material object (see material.hpp).
#include "material.hpp"

#include <cmath>

#include "elyblock/elyblock.h"

namespace test {

using elyco::Bstr;
using elyco::from_bstr;

CompoundInfo compound(const std::wstring& formula) {
    // CAS registry numbers (from memory; printed on every safety data sheet); molar masses from
    // the C interface, so that mole balances compare with the model's own.
    struct Row {
        const wchar_t *formula, *id, *cas;
        const char* key;
    };
    static const Row rows[] = {{L"H2O", L"water", L"7732-18-5", "H2O"},        {L"H2", L"hydrogen", L"1333-74-0", "H2"},
                               {L"O2", L"oxygen", L"7782-44-7", "O2"},         {L"N2", L"nitrogen", L"7727-37-9", "N2"},
                               {L"Cl2", L"chlorine", L"7782-50-5", "Cl2"},     {L"NaCl", L"sodium chloride", L"7647-14-5", "NaCl"},
                               {L"NaOH", L"sodium hydroxide", L"1310-73-2", "NaOH"}};
    for (const auto& r : rows)
        if (formula == r.formula) {
            double m = 0;
            ely_molar_mass(r.key, &m);
            return {r.id, r.formula, r.cas, m};
        }
    return {formula, formula, L"", 0.0};
}

namespace {
enum Behaviour { gas, solute, water };
Behaviour behaviour(const CompoundInfo& c) {
    if (c.formula == L"H2O") return water;
    if (c.formula == L"NaCl" || c.formula == L"NaOH") return solute;
    return gas;
}
}  // namespace

Material::Material(std::wstring name, std::vector<CompoundInfo> list)
    : CapeObject(std::move(name), L"test material (ideal gas, ideal liquid)", true), compounds(std::move(list)) {}

STDMETHODIMP Material::QueryInterface(REFIID iid, void** out) {
    if (!out) return E_POINTER;
    *out = nullptr;
    if (iid == IID_IUnknown || iid == IID_IDispatch || iid == __uuidof(ICapeThermoMaterial))
        return elyco::give(static_cast<ICapeThermoMaterial*>(this), out);
    if (iid == __uuidof(ICapeThermoCompounds)) return elyco::give(static_cast<ICapeThermoCompounds*>(this), out);
    if (iid == __uuidof(ICapeThermoPhases)) return elyco::give(static_cast<ICapeThermoPhases*>(this), out);
    if (iid == __uuidof(ICapeThermoEquilibriumRoutine))
        return elyco::give(static_cast<ICapeThermoEquilibriumRoutine*>(this), out);
    return query_base(iid, out) ? S_OK : E_NOINTERFACE;
}

void Material::set_overall(double t, double p, double flow, const std::vector<double>& x) {
    temperature = t;
    pressure = p;
    total_flow = flow;
    fractions = x;
}

#define NOT_HERE(iface, method) \
    return fail(ECapeNoImplHR, iface, method, std::wstring(L"not implemented by the test material"))

STDMETHODIMP Material::ClearAllProps() {
    temperature = pressure = total_flow = 0;
    fractions.assign(compounds.size(), 0.0);
    flashed = false;
    return S_OK;
}
STDMETHODIMP Material::CopyFromMaterial(IDispatch**) { NOT_HERE(L"ICapeThermoMaterial", L"CopyFromMaterial"); }
STDMETHODIMP Material::CreateMaterial(IDispatch**) { NOT_HERE(L"ICapeThermoMaterial", L"CreateMaterial"); }

STDMETHODIMP Material::GetOverallProp(BSTR property, BSTR basis, VARIANT* results) {
    const std::wstring p = from_bstr(property), b = from_bstr(basis);
    if (p == L"temperature") return elyco::make_double_array({temperature}, results);
    if (p == L"pressure") return elyco::make_double_array({pressure}, results);
    if (p == L"totalFlow" && b == L"mole") return elyco::make_double_array({total_flow}, results);
    if (p == L"fraction" && b == L"mole") return elyco::make_double_array(fractions, results);
    if (p == L"flow" && b == L"mole") {
        std::vector<double> n;
        for (double x : fractions) n.push_back(x * total_flow);
        return elyco::make_double_array(n, results);
    }
    return fail(ECapeInvalidArgumentHR, L"ICapeThermoMaterial", L"GetOverallProp", L"no overall " + p + L" on basis " + b);
}

STDMETHODIMP Material::GetOverallTPFraction(double* t, double* p, VARIANT* composition) {
    if (!t || !p) return E_POINTER;
    if (total_flow < 0 || fractions.size() != compounds.size())
        return fail(ECapeInvalidOperationHR, L"ICapeThermoMaterial", L"GetOverallTPFraction", std::wstring(L"no state set"));
    *t = temperature;
    *p = pressure;
    VariantClear(composition);
    return elyco::make_double_array(fractions, composition);
}

STDMETHODIMP Material::GetPresentPhases(VARIANT* labels, VARIANT* status) {
    std::vector<std::wstring> l;
    std::vector<long> s;
    if (flashed) {
        if (vapour_fraction > 0) l.push_back(L"Vapor"), s.push_back(CAPE_ATEQUILIBRIUM);
        if (vapour_fraction < 1) l.push_back(L"Liquid"), s.push_back(CAPE_ATEQUILIBRIUM);
    }
    VariantClear(labels);
    VariantClear(status);
    elyco::make_string_array(l, labels);
    return elyco::make_long_array(s, status);
}

STDMETHODIMP Material::GetSinglePhaseProp(BSTR property, BSTR phase, BSTR basis, VARIANT* results) {
    const std::wstring p = from_bstr(property), ph = from_bstr(phase), b = from_bstr(basis);
    if (!flashed) return fail(ECapeInvalidOperationHR, L"ICapeThermoMaterial", L"GetSinglePhaseProp", std::wstring(L"no flash yet"));
    const bool vapour = ph == L"Vapor";
    VariantClear(results);
    if (p == L"phaseFraction") return elyco::make_double_array({vapour ? vapour_fraction : 1 - vapour_fraction}, results);
    if (p == L"fraction") return elyco::make_double_array(vapour ? vapour_x : liquid_x, results);
    return fail(ECapeInvalidArgumentHR, L"ICapeThermoMaterial", L"GetSinglePhaseProp", L"no " + p + L" on basis " + b);
}

STDMETHODIMP Material::GetTPFraction(BSTR phase, double* t, double* p, VARIANT* composition) {
    if (!t || !p) return E_POINTER;
    *t = temperature;
    *p = pressure;
    VariantClear(composition);
    return elyco::make_double_array(from_bstr(phase) == L"Vapor" ? vapour_x : liquid_x, composition);
}

STDMETHODIMP Material::GetTwoPhaseProp(BSTR, VARIANT, BSTR, VARIANT*) { NOT_HERE(L"ICapeThermoMaterial", L"GetTwoPhaseProp"); }

STDMETHODIMP Material::SetOverallProp(BSTR property, BSTR basis, VARIANT values) {
    const std::wstring p = from_bstr(property), b = from_bstr(basis);
    std::vector<double> v;
    if (!elyco::read_double_array(values, v))
        return fail(ECapeInvalidArgumentHR, L"ICapeThermoMaterial", L"SetOverallProp", L"values of " + p + L" are not numbers");
    flashed = false;
    if (p == L"temperature" && v.size() == 1) temperature = v[0];
    else if (p == L"pressure" && v.size() == 1) pressure = v[0];
    else if (p == L"totalFlow" && b == L"mole" && v.size() == 1) total_flow = v[0];
    else if (p == L"fraction" && b == L"mole" && v.size() == compounds.size()) fractions = v;
    else return fail(ECapeInvalidArgumentHR, L"ICapeThermoMaterial", L"SetOverallProp", L"cannot set overall " + p + L" (" + b + L")");
    return S_OK;
}

STDMETHODIMP Material::SetPresentPhases(VARIANT labels, VARIANT) {
    elyco::read_string_array(labels, present);
    return S_OK;
}

STDMETHODIMP Material::SetSinglePhaseProp(BSTR, BSTR, BSTR, VARIANT) { NOT_HERE(L"ICapeThermoMaterial", L"SetSinglePhaseProp"); }
STDMETHODIMP Material::SetTwoPhaseProp(BSTR, VARIANT, BSTR, VARIANT) { NOT_HERE(L"ICapeThermoMaterial", L"SetTwoPhaseProp"); }

STDMETHODIMP Material::GetCompoundConstant(VARIANT, VARIANT, VARIANT*) { NOT_HERE(L"ICapeThermoCompounds", L"GetCompoundConstant"); }

STDMETHODIMP Material::GetCompoundList(VARIANT* ids, VARIANT* formulae, VARIANT* names, VARIANT* boiling, VARIANT* molwts,
                                       VARIANT* cas) {
    std::vector<std::wstring> i, f, c;
    std::vector<double> b, m;
    for (const auto& k : compounds) {
        i.push_back(k.id);
        f.push_back(k.formula);
        c.push_back(k.cas);
        b.push_back(std::nan(""));
        m.push_back(k.molar_mass * 1e3);  // g/mol in the thermodynamics interfaces
    }
    for (VARIANT* v : {ids, formulae, names, boiling, molwts, cas}) VariantClear(v);
    elyco::make_string_array(i, ids);
    elyco::make_string_array(f, formulae);
    elyco::make_string_array(i, names);
    elyco::make_double_array(b, boiling);
    elyco::make_double_array(m, molwts);
    return elyco::make_string_array(c, cas);
}

STDMETHODIMP Material::GetConstPropList(VARIANT*) { NOT_HERE(L"ICapeThermoCompounds", L"GetConstPropList"); }
STDMETHODIMP Material::GetNumCompounds(long* count) {
    if (!count) return E_POINTER;
    *count = static_cast<long>(compounds.size());
    return S_OK;
}
STDMETHODIMP Material::GetPDependentProperty(VARIANT, double, VARIANT, VARIANT*) { NOT_HERE(L"ICapeThermoCompounds", L"GetPDependentProperty"); }
STDMETHODIMP Material::GetPDependentPropList(VARIANT*) { NOT_HERE(L"ICapeThermoCompounds", L"GetPDependentPropList"); }
STDMETHODIMP Material::GetTDependentProperty(VARIANT, double, VARIANT, VARIANT*) { NOT_HERE(L"ICapeThermoCompounds", L"GetTDependentProperty"); }
STDMETHODIMP Material::GetTDependentPropList(VARIANT*) { NOT_HERE(L"ICapeThermoCompounds", L"GetTDependentPropList"); }

STDMETHODIMP Material::GetNumPhases(long* count) {
    if (!count) return E_POINTER;
    *count = 2;
    return S_OK;
}
STDMETHODIMP Material::GetPhaseInfo(BSTR phase, BSTR attribute, VARIANT* value) {
    if (from_bstr(attribute) != L"StateOfAggregation") NOT_HERE(L"ICapeThermoPhases", L"GetPhaseInfo");
    VariantClear(value);
    value->vt = VT_BSTR;
    value->bstrVal = SysAllocString(from_bstr(phase) == L"Vapor" ? L"Vapor" : L"Liquid");
    return S_OK;
}
STDMETHODIMP Material::GetPhaseList(VARIANT* labels, VARIANT* aggregation, VARIANT* key) {
    for (VARIANT* v : {labels, aggregation, key}) VariantClear(v);
    elyco::make_string_array({L"Vapor", L"Liquid"}, labels);
    elyco::make_string_array({L"Vapor", L"Liquid"}, aggregation);
    return elyco::make_string_array({L"", L""}, key);
}

STDMETHODIMP Material::CalcEquilibrium(VARIANT spec1, VARIANT spec2, BSTR) {
    std::vector<std::wstring> s1, s2;
    elyco::read_string_array(spec1, s1);
    elyco::read_string_array(spec2, s2);
    if (s1.empty() || s2.empty() || s1[0] != L"temperature" || s2[0] != L"pressure")
        return fail(ECapeInvalidArgumentHR, L"ICapeThermoEquilibriumRoutine", L"CalcEquilibrium",
                    std::wstring(L"the test material flashes at given temperature and pressure only"));
    double p_sat = 0;
    if (ely_water_saturation_pressure(temperature, &p_sat) != ELY_OK)
        return fail(ECapeSolvingErrorHR, L"ICapeThermoEquilibriumRoutine", L"CalcEquilibrium", std::string(ely_last_error()));
    // Moles of gases G, solutes S, water W; liquid water L solves
    // (W - L)/(G + W - L) * p = L/(L + S) * p_sat (Raoult, ideal liquid), by bisection.
    double g = 0, s = 0, w = 0;
    for (size_t i = 0; i < compounds.size(); ++i) {
        const double n = fractions[i] * total_flow;
        switch (behaviour(compounds[i])) {
            case gas: g += n; break;
            case solute: s += n; break;
            case water: w += n; break;
        }
    }
    double liquid_water = 0;
    if (w > 0) {
        auto f = [&](double l) { return (w - l) / (g + w - l) * pressure - (l + s > 0 ? l / (l + s) : 0.0) * p_sat; };
        if (g == 0 && s == 0) {
            liquid_water = pressure > p_sat ? w : 0.0;
        } else if (f(0) <= 0) {
            liquid_water = 0;
        } else {
            double lo = 0, hi = w;
            for (int k = 0; k < 200; ++k) {
                const double mid = 0.5 * (lo + hi);
                (f(mid) > 0 ? lo : hi) = mid;
            }
            liquid_water = 0.5 * (lo + hi);
        }
    }
    const double total = g + s + w, liquid = liquid_water + s, vapour = total - liquid;
    vapour_fraction = total > 0 ? vapour / total : 1.0;
    vapour_x.assign(compounds.size(), 0.0);
    liquid_x.assign(compounds.size(), 0.0);
    for (size_t i = 0; i < compounds.size(); ++i) {
        const double n = fractions[i] * total_flow;
        switch (behaviour(compounds[i])) {
            case gas: vapour_x[i] = vapour > 0 ? n / vapour : 0; break;
            case solute: liquid_x[i] = liquid > 0 ? n / liquid : 0; break;
            case water:
                vapour_x[i] = vapour > 0 ? (w - liquid_water) / vapour : 0;
                liquid_x[i] = liquid > 0 ? liquid_water / liquid : 0;
                break;
        }
    }
    flashed = true;
    ++flashes;
    return S_OK;
}

STDMETHODIMP Material::CheckEquilibriumSpec(VARIANT, VARIANT, BSTR, VARIANT_BOOL* ok) {
    if (!ok) return E_POINTER;
    *ok = VARIANT_TRUE;
    return S_OK;
}

}  // namespace test
