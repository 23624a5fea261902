// Validation and calculation of the elyblock unit against the host's material objects
// (CAPE-OPEN thermodynamics 1.1: ICapeThermoMaterial, ICapeThermoCompounds, ICapeThermoPhases,
// ICapeThermoEquilibriumRoutine).
//
// The block decides the operating point from its spec; the inlet decides nothing else. The
// net feed the block consumes (water; water and salt for brine) must be in the inlet; what is
// left passes through to the outlet on the feed's side (the anode side for PEM, alkaline and
// brine cells, the steam side for solid oxide cells). Outlets get molar flows, composition,
// temperature and pressure, then the host's own flash at that temperature and pressure.
#include <cmath>
#include <cstring>
#include <cwctype>

#include "unit.hpp"

namespace elyco {

namespace {

// The compounds the unit knows, matched in the host's compound list by CAS registry number
// (from memory; they are printed on every safety data sheet), or by formula.
enum Species { kH2O, kH2, kO2, kCl2, kNaCl, kNaOH, kSpeciesCount };
struct Compound {
    const char* formula;
    const wchar_t* formula_w;
    const wchar_t* name;
    const wchar_t* cas;
};
const Compound kCompounds[kSpeciesCount] = {
    {"H2O", L"H2O", L"water", L"7732-18-5"},         {"H2", L"H2", L"hydrogen", L"1333-74-0"},
    {"O2", L"O2", L"oxygen", L"7782-44-7"},          {"Cl2", L"Cl2", L"chlorine", L"7782-50-5"},
    {"NaCl", L"NaCl", L"sodium chloride", L"7647-14-5"}, {"NaOH", L"NaOH", L"sodium hydroxide", L"1310-73-2"},
};

std::wstring trimmed_lower(const std::wstring& s) {
    std::wstring out;
    for (wchar_t c : s)
        if (!std::iswspace(c)) out += static_cast<wchar_t>(std::towlower(c));
    return out;
}

std::wstring fmt(double v, const char* format = "%.6g") {
    char buf[64];
    std::snprintf(buf, sizeof buf, format, v);
    return to_wide(buf);
}

// The compound list of one material and where our species sit in it (-1: absent).
struct CompoundMap {
    size_t count = 0;
    int index[kSpeciesCount];
    std::wstring error;  // the material gave no compound list
};

CompoundMap map_compounds(ICapeThermoMaterial* material) {
    CompoundMap map;
    for (int& i : map.index) i = -1;
    Ptr<ICapeThermoCompounds> compounds;
    if (FAILED(material->QueryInterface(__uuidof(ICapeThermoCompounds), compounds.out_void()))) {
        map.error = L"the material object offers no compound list (ICapeThermoCompounds)";
        return map;
    }
    Variant ids, formulae, names, boiling, molwts, cas;
    if (FAILED(compounds->GetCompoundList(ids.get(), formulae.get(), names.get(), boiling.get(), molwts.get(), cas.get()))) {
        map.error = L"the material object did not give its compound list";
        return map;
    }
    std::vector<std::wstring> id_list, formula_list, cas_list;
    read_string_array(ids.ref(), id_list);
    read_string_array(formulae.ref(), formula_list);
    read_string_array(cas.ref(), cas_list);
    map.count = id_list.size();
    for (int s = 0; s < kSpeciesCount; ++s) {
        for (size_t i = 0; i < map.count && map.index[s] < 0; ++i)
            if (i < cas_list.size() && trimmed_lower(cas_list[i]) == trimmed_lower(kCompounds[s].cas)) map.index[s] = static_cast<int>(i);
        for (size_t i = 0; i < map.count && map.index[s] < 0; ++i)
            if (i < formula_list.size() && trimmed_lower(formula_list[i]) == trimmed_lower(kCompounds[s].formula_w))
                map.index[s] = static_cast<int>(i);
    }
    return map;
}

std::vector<int> required_species(bool brine) {
    if (brine) return {kH2O, kH2, kO2, kCl2, kNaCl, kNaOH};
    return {kH2O, kH2, kO2};
}

std::wstring missing_compounds(const CompoundMap& map, bool brine) {
    std::wstring missing;
    for (int s : required_species(brine))
        if (map.index[s] < 0)
            missing += (missing.empty() ? L"" : L", ") + std::wstring(kCompounds[s].name) + L" (" + kCompounds[s].formula_w +
                       L", CAS " + kCompounds[s].cas + L")";
    return missing;
}

// The inlet: temperature, pressure and molar flow of each host compound (mol/s).
struct Inlet {
    double temperature = 0, pressure = 0;
    std::vector<double> flows;
    std::wstring error;
};

Inlet read_inlet(ICapeThermoMaterial* m, const CompoundMap& map) {
    Inlet in;
    Variant composition, total;
    Bstr total_flow(L"totalFlow"), mole(L"mole");
    if (FAILED(m->GetOverallTPFraction(&in.temperature, &in.pressure, composition.get()))) {
        in.error = L"the inlet material gave no temperature, pressure and composition";
        return in;
    }
    if (FAILED(m->GetOverallProp(total_flow.get(), mole.get(), total.get()))) {
        in.error = L"the inlet material gave no total flow";
        return in;
    }
    std::vector<double> x, n;
    if (!read_double_array(composition.ref(), x) || x.size() != map.count || !read_double_array(total.ref(), n) || n.size() != 1) {
        in.error = L"the inlet material's composition or total flow has the wrong size";
        return in;
    }
    for (double xi : x) in.flows.push_back(xi * n[0]);
    return in;
}

double molar_mass(const char* formula) {
    double m = 0;
    ely_molar_mass(formula, &m);
    return m;
}

// One outlet: molar flows of our species, temperature, pressure.
struct Outlet {
    double flows[kSpeciesCount] = {};
    double temperature = 0, pressure = 0;
};

HRESULT set_prop(ICapeThermoMaterial* m, const wchar_t* property, const wchar_t* basis, const std::vector<double>& values) {
    Variant v;
    HRESULT hr = make_double_array(values, v.get());
    if (FAILED(hr)) return hr;
    Bstr p(property), b(basis ? basis : L"");
    return m->SetOverallProp(p.get(), basis ? b.get() : nullptr, v.ref());
}

// Writes an outlet into its material and asks the host's thermodynamics for the phases at the
// outlet's temperature and pressure.
std::wstring write_outlet(ICapeThermoMaterial* m, const CompoundMap& map, const Outlet& o, const std::vector<double>& extra,
                          int main_species) {
    std::vector<double> n(map.count, 0.0);
    for (int s = 0; s < kSpeciesCount; ++s)
        if (o.flows[s] != 0.0) n[static_cast<size_t>(map.index[s])] += o.flows[s];
    for (size_t i = 0; i < extra.size() && i < n.size(); ++i) n[i] += extra[i];
    double total = 0;
    for (double v : n) total += v;
    std::vector<double> x(map.count, 0.0);
    if (total > 0) {
        for (size_t i = 0; i < n.size(); ++i) x[i] = n[i] / total;
    } else {
        x[static_cast<size_t>(map.index[main_species])] = 1.0;  // no flow: a valid composition all the same
    }
    if (FAILED(set_prop(m, L"fraction", L"mole", x)) || FAILED(set_prop(m, L"totalFlow", L"mole", {total})) ||
        FAILED(set_prop(m, L"temperature", nullptr, {o.temperature})) || FAILED(set_prop(m, L"pressure", nullptr, {o.pressure})))
        return L"the outlet material did not take flow, composition, temperature and pressure";
    // Every phase the material knows may be present; the flash decides.
    Ptr<ICapeThermoPhases> phases;
    if (SUCCEEDED(m->QueryInterface(__uuidof(ICapeThermoPhases), phases.out_void()))) {
        Variant labels, aggregation, key;
        if (SUCCEEDED(phases->GetPhaseList(labels.get(), aggregation.get(), key.get()))) {
            std::vector<std::wstring> l;
            read_string_array(labels.ref(), l);
            Variant status;
            make_long_array(std::vector<long>(l.size(), CAPE_UNKNOWNPHASESTATUS), status.get());
            m->SetPresentPhases(labels.ref(), status.ref());
        }
    }
    Ptr<ICapeThermoEquilibriumRoutine> flash;
    if (FAILED(m->QueryInterface(__uuidof(ICapeThermoEquilibriumRoutine), flash.out_void())))
        return L"the outlet material cannot flash (no ICapeThermoEquilibriumRoutine)";
    Variant spec1, spec2;
    make_string_array({L"temperature", L"", L"Overall"}, spec1.get());
    make_string_array({L"pressure", L"", L"Overall"}, spec2.get());
    Bstr unspecified(L"Unspecified");
    if (FAILED(flash->CalcEquilibrium(spec1.ref(), spec2.ref(), unspecified.get()))) {
        std::wstring why = L"the host's flash at " + fmt(o.temperature) + L" K and " + fmt(o.pressure) + L" Pa failed";
        Ptr<ECapeUser> error;
        Bstr text;
        if (SUCCEEDED(flash->QueryInterface(__uuidof(ECapeUser), error.out_void())) && SUCCEEDED(error->get_description(text.out())))
            why += L": " + from_bstr(text.get());
        return why;
    }
    return L"";
}

double get(ely_block* b, const char* name) {
    int32_t i = -1;
    double v = std::numeric_limits<double>::quiet_NaN();
    if (ely_block_find(b, name, &i) == ELY_OK) ely_block_get(b, i, &v);
    return v;
}

std::string technology_of(ely_block* b) {
    size_t length = 0;
    if (ely_block_report_json(b, nullptr, 0, &length) != ELY_OK) return "";
    std::string text(length, '\0');
    if (ely_block_report_json(b, text.data(), text.size(), &length) != ELY_OK) return "";
    const std::string key = "{\"technology\":\"";  // the report starts with it
    if (text.compare(0, key.size(), key) != 0) return "";
    return text.substr(key.size(), text.find('"', key.size()) - key.size());
}

}  // namespace

// The net feed and the products of a solved block in mol/s, and where surplus feed goes.
class Calculation {
public:
    explicit Calculation(ely_block* b, bool brine) : brine_(brine) {
        const double m_h2 = molar_mass("H2"), m_o2 = molar_mass("O2"), m_h2o = molar_mass("H2O"), m_cl2 = molar_mass("Cl2");
        technology = technology_of(b);
        // Wet gases: total moles from the mass flow and the mole fractions.
        const double xc[3] = {get(b, "stream.cathode.x_h2"), get(b, "stream.cathode.x_o2"), get(b, "stream.cathode.x_h2o")};
        const double mc = xc[0] * m_h2 + xc[1] * m_o2 + xc[2] * m_h2o;
        const double nc = mc > 0 ? get(b, "stream.cathode.mass_flow") / mc : 0.0;
        hydrogen.flows[kH2] = xc[0] * nc;
        hydrogen.flows[kO2] = xc[1] * nc;
        hydrogen.flows[kH2O] = xc[2] * nc;
        hydrogen.temperature = get(b, "stream.cathode.temperature");
        hydrogen.pressure = get(b, "stream.cathode.pressure");
        const double xa[4] = {get(b, "stream.anode.x_o2"), get(b, "stream.anode.x_h2"),
                              brine ? get(b, "stream.anode.x_cl2") : 0.0, get(b, "stream.anode.x_h2o")};
        const double ma = xa[0] * m_o2 + xa[1] * m_h2 + xa[2] * m_cl2 + xa[3] * m_h2o;
        const double na = ma > 0 ? get(b, "stream.anode.mass_flow") / ma : 0.0;
        anode.flows[kO2] = xa[0] * na;
        anode.flows[kH2] = xa[1] * na;
        anode.flows[kCl2] = xa[2] * na;
        anode.flows[kH2O] = xa[3] * na;
        anode.temperature = get(b, "stream.anode.temperature");
        anode.pressure = get(b, "stream.anode.pressure");
        consumed[kH2O] = get(b, "feed.water") / m_h2o;
        if (brine) {
            consumed[kNaCl] = get(b, "feed.salt") / molar_mass("NaCl");
            const double naoh = get(b, "product.caustic");
            caustic.flows[kNaOH] = naoh / molar_mass("NaOH");
            caustic.flows[kH2O] = (get(b, "product.caustic_solution") - naoh) / m_h2o;
            caustic.temperature = hydrogen.temperature;
            caustic.pressure = hydrogen.pressure;
        }
        // Liquid water leaving the cathode side (PEM drag that is not returned): what the
        // hydrogen balance leaves of the water consumed.
        liquid = consumed[kH2O] - hydrogen.flows[kH2] - anode.flows[kH2] - hydrogen.flows[kH2O] - anode.flows[kH2O] -
                 caustic.flows[kNaOH] / 2 - caustic.flows[kH2O];
        if (liquid < 0 && liquid > -1e-9 * consumed[kH2O]) liquid = 0;  // rounding
        hydrogen.flows[kH2O] += liquid > 0 ? liquid : 0.0;
    }

    bool surplus_to_cathode() const { return technology == "solid_oxide"; }

    bool brine_;
    std::string technology;
    Outlet hydrogen, anode, caustic;
    double consumed[kSpeciesCount] = {};
    double liquid = 0;
};

bool is_drive_input(const std::string& variable) {
    for (const char* d : {"current_density", "current", "power", "hydrogen_rate", "voltage"})
        if (variable == std::string("in.") + d) return true;
    return false;
}

std::string Unit::apply_inputs(ely_block* b, double feed_temperature) {
    Parameter* spec = parameter("spec");
    const std::string spec_name = to_utf8(spec->text());
    if (ely_block_set_spec(b, spec_name.c_str()) != ELY_OK) return std::string("spec: ") + ely_last_error();
    for (Parameter* p : parameter_list_) {
        const auto& s = p->spec();
        if (s.mode != CAPE_INPUT || s.variable.empty()) continue;
        // Only the drive input of the current spec is read; the others stay as they are.
        if (is_drive_input(s.variable) && s.variable != "in." + spec_name) continue;
        int32_t i = -1;
        if (ely_block_find(b, s.variable.c_str(), &i) != ELY_OK || ely_block_set(b, i, p->number() / s.scale) != ELY_OK)
            return s.variable + ": " + ely_last_error();
    }
    if (!std::isnan(feed_temperature)) {
        int32_t i = -1;
        if (ely_block_find(b, "in.feed_temperature", &i) != ELY_OK || ely_block_set(b, i, feed_temperature) != ELY_OK)
            return std::string("in.feed_temperature (the inlet's temperature): ") + ely_last_error();
    }
    return "";
}

namespace {
// Shortfall of the inlet against the net feed; "" when the inlet brings enough.
std::wstring shortfall(const Calculation& c, const std::vector<double>& inlet, const CompoundMap& map) {
    std::wstring out;
    for (int s : {kH2O, kNaCl}) {
        const double need = c.consumed[s];
        if (!(need > 0)) continue;
        const double have = inlet[static_cast<size_t>(map.index[s])];
        if (have < need * (1 - 1e-12)) {
            const double m = molar_mass(kCompounds[s].formula);
            out += (out.empty() ? L"" : L"; ") + std::wstring(L"the inlet brings ") + fmt(have * m) + L" kg/s of " +
                   kCompounds[s].name + L" (" + fmt(have) + L" mol/s) but the electrolyzer consumes " + fmt(need * m) +
                   L" kg/s at this operating point: " + fmt((need - have) * m) + L" kg/s short";
        }
    }
    return out;
}
}  // namespace

bool Unit::check(std::wstring& why) {
    why.clear();
    if (!block_) {
        why = L"no plant description: set the parameter 'plant'";
        return false;
    }
    const std::string spec_name = to_utf8(parameter("spec")->text());
    for (Parameter* p : parameter_list_) {
        if (p->spec().mode != CAPE_INPUT) continue;
        if (is_drive_input(p->spec().variable) && p->spec().variable != "in." + spec_name && std::isnan(p->number()))
            continue;  // the drive input of another spec may stay unset
        const std::wstring w = p->spec().kind == ParamKind::option ? p->check_text(p->text()) : p->check_number(p->number());
        if (!w.empty()) {
            why = w;
            return false;
        }
    }
    for (Port* p : port_list_)
        if (!p->material()) {
            why = L"port '" + p->name() + L"' is not connected";
            return false;
        }
    CompoundMap inlet_map;
    for (Port* p : port_list_) {
        const CompoundMap map = map_compounds(p->material());
        if (!map.error.empty()) {
            why = L"port '" + p->name() + L"': " + map.error;
            return false;
        }
        const std::wstring missing = missing_compounds(map, brine_);
        if (!missing.empty()) {
            why = L"the compound list of the material on port '" + p->name() + L"' lacks " + missing +
                  (brine_ ? L"; a brine electrolyzer needs water, hydrogen, oxygen, chlorine, sodium chloride and sodium hydroxide"
                          : L"; the electrolyzer needs water, hydrogen and oxygen");
            return false;
        }
        if (p->role() == PortRole::feed) inlet_map = map;
    }
    // A trial solve on a copy: the spec must be feasible with these parameters.
    Port* feed = port(PortRole::feed);
    const Inlet inlet = read_inlet(feed->material(), inlet_map);  // may not be ready yet: then T from the plant
    ely_block* trial = nullptr;
    if (ely_block_clone(block_, &trial) != ELY_OK) {
        why = to_wide(std::string("plant: ") + ely_last_error());
        return false;
    }
    std::string error = apply_inputs(trial, inlet.error.empty() ? inlet.temperature : std::nan(""));
    if (error.empty() && ely_block_solve(trial) < 0) error = ely_last_error();
    if (error.empty()) {
        const Calculation c(trial, brine_);
        if (c.technology == "custom") error = "the CAPE-OPEN unit takes water or brine electrolyzers; a custom cell's products have no ports";
        else if (inlet.error.empty()) why = shortfall(c, inlet.flows, inlet_map);
    }
    ely_block_destroy(trial);
    if (!error.empty()) why = to_wide(error);
    return why.empty();
}

STDMETHODIMP Unit::Calculate() {
    ELYCO_TRY
    if (status_ != CAPE_VALID) {
        std::wstring why;
        status_ = check(why) ? CAPE_VALID : CAPE_INVALID;
        validation_message_ = why;
        if (status_ != CAPE_VALID)
            return fail(ECapeBadInvOrderHR, L"ICapeUnit", L"Calculate", L"the unit is not valid: " + why);
    }
    Port* feed = port(PortRole::feed);
    const CompoundMap inlet_map = map_compounds(feed->material());
    const Inlet inlet = read_inlet(feed->material(), inlet_map);
    if (!inlet.error.empty()) return fail(ECapeComputationHR, L"ICapeUnit", L"Calculate", inlet.error);
    for (Parameter* p : parameter_list_)
        if (p->spec().mode == CAPE_OUTPUT && p->spec().variable.rfind("param.", 0) != 0) p->clear_value();
    const std::string error = apply_inputs(block_, inlet.temperature);
    if (!error.empty()) return fail(ECapeInvalidArgumentHR, L"ICapeUnit", L"Calculate", error);
    const int32_t status = ely_block_solve(block_);
    if (status < 0) return fail(ECapeSolvingErrorHR, L"ICapeUnit", L"Calculate", std::string(ely_last_error()));
    if (status > 0) log(to_wide(ely_last_error()));
    const Calculation c(block_, brine_);
    if (c.liquid < 0)
        return fail(ECapeComputationHR, L"ICapeUnit", L"Calculate",
                    L"internal: the streams of the block do not close the hydrogen balance (" + fmt(c.liquid) + L" mol/s)");
    const std::wstring short_of = shortfall(c, inlet.flows, inlet_map);
    if (!short_of.empty()) return fail(ECapeComputationHR, L"ICapeUnit", L"Calculate", short_of);

    // Surplus feed (everything the block does not consume), in the inlet's compound order.
    std::vector<double> surplus = inlet.flows;
    for (int s : {kH2O, kNaCl})
        if (inlet_map.index[s] >= 0) surplus[static_cast<size_t>(inlet_map.index[s])] -= c.consumed[s];
    for (double& v : surplus)
        if (v < 0) v = 0;  // within rounding of the shortfall check
    const PortRole surplus_role = c.surplus_to_cathode() ? PortRole::hydrogen : brine_ ? PortRole::chlorine : PortRole::oxygen;

    for (Port* p : port_list_) {
        if (p->role() == PortRole::feed) continue;
        const CompoundMap map = map_compounds(p->material());
        // The surplus is in the inlet's compound order; outlets share the flowsheet's list, but map it by species anyway.
        std::vector<double> extra(map.count, 0.0);
        if (p->role() == surplus_role) {
            for (size_t i = 0; i < surplus.size(); ++i) {
                int species = -1;
                for (int s = 0; s < kSpeciesCount; ++s)
                    if (inlet_map.index[s] == static_cast<int>(i)) species = s;
                if (species >= 0) extra[static_cast<size_t>(map.index[species])] += surplus[i];
                else if (map.count == inlet_map.count) extra[i] += surplus[i];  // a compound the unit does not know
            }
        }
        const Outlet& o = p->role() == PortRole::hydrogen ? c.hydrogen : p->role() == PortRole::caustic ? c.caustic : c.anode;
        const int main = p->role() == PortRole::hydrogen ? kH2 : p->role() == PortRole::caustic ? kNaOH
                         : p->role() == PortRole::chlorine ? kCl2 : kO2;
        const std::wstring why = write_outlet(p->material(), map, o, extra, main);
        if (!why.empty()) return fail(ECapeComputationHR, L"ICapeUnit", L"Calculate", L"port '" + p->name() + L"': " + why);
    }
    // Results.
    for (Parameter* p : parameter_list_) {
        const auto& s = p->spec();
        if (s.mode != CAPE_OUTPUT || s.variable.empty()) continue;
        const double v = get(block_, s.variable.c_str());
        if (!std::isnan(v)) p->set_number(v * s.scale);
    }
    return S_OK;
    ELYCO_CATCH(L"ICapeUnit", L"Calculate")
}

}  // namespace elyco
