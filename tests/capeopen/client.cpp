// A CAPE-OPEN host of our own for the elyblock unit operation, run under Wine after
// `regsvr32 elyblock-capeopen.dll`: creates the unit by ProgID, reads its identification,
// lists ports and parameters through the vtable and through IDispatch::Invoke, connects
// materials of its own (material.hpp), sets parameters, validates, calculates, and checks the
// outlets against the C interface (1e-12 relative) and the element balances across the ports
// (1e-12); then persistence, a brine plant, and misuse that must fail with the standard's
// errors and a message. Prints "N passed, M failed" and exits non-zero on any failure.
#include <cmath>
#include <cstdio>
#include <functional>
#include <map>
#include <string>
#include <vector>

#include "com_base.hpp"
#include "elyblock/elyblock.h"
#include "material.hpp"

using elyco::Bstr;
using elyco::from_bstr;
using elyco::Ptr;
using elyco::Variant;

namespace {

int g_passed = 0, g_failed = 0;

void check(bool ok, const std::string& what) {
    if (ok) {
        ++g_passed;
        std::printf("ok: %s\n", what.c_str());
    } else {
        ++g_failed;
        std::printf("FAILED: %s\n", what.c_str());
    }
}

std::string u8(const std::wstring& w) { return elyco::to_utf8(w); }

bool close(double a, double b, double rel = 1e-12) {
    return a == b || std::fabs(a - b) <= rel * std::max(std::fabs(a), std::fabs(b));
}

std::string num(double v) {
    char buf[40];
    std::snprintf(buf, sizeof buf, "%.17g", v);
    return buf;
}

// The type library for our materials' IDispatch: the one built with the unit, beside this program.
ITypeLib* g_library = nullptr;

template <class I>
Ptr<I> query(IUnknown* object) {
    Ptr<I> p;
    if (object) object->QueryInterface(__uuidof(I), p.out_void());
    return p;
}

std::wstring name_of(IUnknown* object) {
    Ptr<ICapeIdentification> id = query<ICapeIdentification>(object);
    Bstr name;
    if (id) id->get_ComponentName(name.out());
    return from_bstr(name.get());
}

std::wstring error_of(IUnknown* object) {
    Ptr<ECapeUser> e = query<ECapeUser>(object);
    Bstr text;
    if (e) e->get_description(text.out());
    return from_bstr(text.get());
}

std::wstring error_name_of(IUnknown* object) {
    Ptr<ECapeRoot> e = query<ECapeRoot>(object);
    Bstr text;
    if (e) e->get_name(text.out());
    return from_bstr(text.get());
}

bool contains(const std::wstring& text, const std::wstring& part) { return text.find(part) != std::wstring::npos; }

// IDispatch::Invoke with positional arguments (given in natural order).
HRESULT invoke(IDispatch* d, DISPID id, WORD flags, std::vector<VARIANT> args, VARIANT* result, EXCEPINFO* info = nullptr) {
    std::vector<VARIANT> reversed(args.rbegin(), args.rend());
    DISPID put = DISPID_PROPERTYPUT;
    DISPPARAMS params = {reversed.data(), nullptr, static_cast<UINT>(reversed.size()), 0};
    if (flags & (DISPATCH_PROPERTYPUT | DISPATCH_PROPERTYPUTREF)) {
        params.rgdispidNamedArgs = &put;
        params.cNamedArgs = 1;
    }
    EXCEPINFO local = {};
    const HRESULT hr = d->Invoke(id, IID_NULL, LOCALE_USER_DEFAULT, flags, &params, result, info ? info : &local, nullptr);
    if (!info) {
        SysFreeString(local.bstrDescription);
        SysFreeString(local.bstrSource);
        SysFreeString(local.bstrHelpFile);
    }
    return hr;
}

VARIANT v_i4(long l) {
    VARIANT v;
    v.vt = VT_I4;
    v.lVal = l;
    return v;
}
VARIANT v_r8(double d) {
    VARIANT v;
    v.vt = VT_R8;
    v.dblVal = d;
    return v;
}

// The unit's objects, through the vtable.
Ptr<ICapeCollection> collection(ICapeUnit* unit, bool ports) {
    Ptr<IDispatch> d;
    if (ports) {
        unit->get_ports(d.out());
    } else {
        Ptr<ICapeUtilities> u = query<ICapeUtilities>(unit);
        u->get_parameters(d.out());
    }
    return query<ICapeCollection>(d.get());
}

Ptr<IDispatch> item(ICapeCollection* c, const std::wstring& name) {
    Ptr<IDispatch> d;
    VARIANT id;
    id.vt = VT_BSTR;
    id.bstrVal = SysAllocString(name.c_str());
    c->Item(id, d.out());
    SysFreeString(id.bstrVal);
    return d;
}

Ptr<ICapeParameter> parameter(ICapeUnit* unit, const std::wstring& name) {
    Ptr<ICapeCollection> c = collection(unit, false);
    Ptr<IDispatch> d = item(c.get(), name);
    return query<ICapeParameter>(d.get());
}

HRESULT set_number(ICapeUnit* unit, const std::wstring& name, double value) {
    Ptr<ICapeParameter> p = parameter(unit, name);
    if (!p) return E_FAIL;
    return p->put_value(v_r8(value));
}

HRESULT set_text(ICapeUnit* unit, const std::wstring& name, const std::wstring& text) {
    Ptr<ICapeParameter> p = parameter(unit, name);
    if (!p) return E_FAIL;
    VARIANT v;
    v.vt = VT_BSTR;
    v.bstrVal = SysAllocString(text.c_str());
    const HRESULT hr = p->put_value(v);
    SysFreeString(v.bstrVal);
    return hr;
}

double get_number(ICapeUnit* unit, const std::wstring& name) {
    Ptr<ICapeParameter> p = parameter(unit, name);
    Variant v;
    if (!p || FAILED(p->get_value(v.get()))) return std::nan("");
    Variant d;
    if (FAILED(VariantChangeType(d.get(), v.get(), 0, VT_R8))) return std::nan("");
    return d.ref().dblVal;
}

Ptr<ICapeUnit> create_unit() {
    CLSID clsid;
    Ptr<ICapeUnit> unit;
    if (FAILED(CLSIDFromProgID(L"elyblock.Electrolyzer", &clsid))) return unit;
    CoCreateInstance(clsid, nullptr, CLSCTX_INPROC_SERVER, __uuidof(ICapeUnit), unit.out_void());
    if (unit) query<ICapeUtilities>(unit.get())->Initialize();
    return unit;
}

HRESULT connect(ICapeUnit* unit, const std::wstring& port, test::Material* m) {
    Ptr<ICapeCollection> ports = collection(unit, true);
    Ptr<ICapeUnitPort> p = query<ICapeUnitPort>(item(ports.get(), port).get());
    if (!p) return E_FAIL;
    return p->Connect(static_cast<ICapeThermoMaterial*>(m));
}

bool validate(ICapeUnit* unit, std::wstring& message) {
    Bstr m;
    VARIANT_BOOL ok = VARIANT_FALSE;
    unit->Validate(m.out(), &ok);
    message = from_bstr(m.get());
    return ok == VARIANT_TRUE;
}

std::vector<test::CompoundInfo> compounds(std::initializer_list<const wchar_t*> formulae) {
    std::vector<test::CompoundInfo> out;
    for (const wchar_t* f : formulae) out.push_back(test::compound(f));
    return out;
}

// A simulation context offering LogMessage (ICapeDiagnostic) by name through IDispatch.
class Context final : public IDispatch {
public:
    std::vector<std::wstring> messages;
    STDMETHODIMP QueryInterface(REFIID iid, void** out) override {
        if (!out) return E_POINTER;
        *out = nullptr;
        if (iid != IID_IUnknown && iid != IID_IDispatch) return E_NOINTERFACE;
        *out = static_cast<IDispatch*>(this);
        AddRef();
        return S_OK;
    }
    STDMETHODIMP_(ULONG) AddRef() override { return ++refs_; }
    STDMETHODIMP_(ULONG) Release() override {
        const ULONG n = --refs_;
        if (n == 0) delete this;
        return n;
    }
    STDMETHODIMP GetTypeInfoCount(UINT* n) override {
        *n = 0;
        return S_OK;
    }
    STDMETHODIMP GetTypeInfo(UINT, LCID, ITypeInfo**) override { return E_NOTIMPL; }
    STDMETHODIMP GetIDsOfNames(REFIID, LPOLESTR* names, UINT count, LCID, DISPID* ids) override {
        if (count != 1 || _wcsicmp(names[0], L"LogMessage") != 0) return DISP_E_UNKNOWNNAME;
        ids[0] = 2;
        return S_OK;
    }
    STDMETHODIMP Invoke(DISPID id, REFIID, LCID, WORD, DISPPARAMS* params, VARIANT*, EXCEPINFO*, UINT*) override {
        if (id != 2 || !params || params->cArgs != 1 || params->rgvarg[0].vt != VT_BSTR) return DISP_E_MEMBERNOTFOUND;
        messages.push_back(from_bstr(params->rgvarg[0].bstrVal));
        return S_OK;
    }

private:
    ULONG refs_ = 1;
};

// ---- the C interface: what the unit should give -------------------------------------------

struct Reference {
    ely_block* b = nullptr;
    double get(const char* name) const {
        int32_t i = -1;
        double v = std::nan("");
        if (ely_block_find(b, name, &i) == ELY_OK) ely_block_get(b, i, &v);
        return v;
    }
    ~Reference() { ely_block_destroy(b); }
};

bool solve_reference(Reference& r, const char* plant, const char* spec, const std::map<std::string, double>& inputs) {
    if (ely_block_create(plant, &r.b) != ELY_OK || ely_block_set_spec(r.b, spec) != ELY_OK) return false;
    for (const auto& in : inputs) {
        int32_t i = -1;
        if (ely_block_find(r.b, in.first.c_str(), &i) != ELY_OK || ely_block_set(r.b, i, in.second) != ELY_OK) return false;
    }
    return ely_block_solve(r.b) >= 0;
}

double mm(const char* formula) {
    double m = 0;
    ely_molar_mass(formula, &m);
    return m;
}

// Molar flow of one compound in a material after the calculation.
double flow(const test::Material* m, const wchar_t* formula) {
    for (size_t i = 0; i < m->compounds.size(); ++i)
        if (m->compounds[i].formula == formula) return m->fractions[i] * m->total_flow;
    return 0.0;
}

// Moles of an element carried by a material (per second).
double element(const test::Material* m, const wchar_t* e) {
    const std::map<std::wstring, std::map<std::wstring, int>> atoms = {
        {L"H2O", {{L"H", 2}, {L"O", 1}}}, {L"H2", {{L"H", 2}}},  {L"O2", {{L"O", 2}}},
        {L"N2", {{L"N", 2}}},             {L"Cl2", {{L"Cl", 2}}}, {L"NaCl", {{L"Na", 1}, {L"Cl", 1}}},
        {L"NaOH", {{L"Na", 1}, {L"O", 1}, {L"H", 1}}}};
    double n = 0;
    for (size_t i = 0; i < m->compounds.size(); ++i) {
        const auto& a = atoms.at(m->compounds[i].formula);
        const auto it = a.find(e);
        if (it != a.end()) n += it->second * m->fractions[i] * m->total_flow;
    }
    return n;
}

void check_balance(const std::vector<test::Material*>& in, const std::vector<test::Material*>& out,
                   std::initializer_list<const wchar_t*> elements, const std::string& what) {
    for (const wchar_t* e : elements) {
        double a = 0, b = 0;
        for (auto* m : in) a += element(m, e);
        for (auto* m : out) b += element(m, e);
        check(a > 0 && close(a, b), what + ": element " + u8(e) + " in " + num(a) + " mol/s, out " + num(b) + " mol/s");
    }
}

// ---- the tests --------------------------------------------------------------------------------

const char* const kPemPlant =
    "{\"technology\":\"pem\",\"stack\":{\"cells\":120,\"active_area\":0.25,\"stacks\":2},"
    "\"plant\":{\"drag_water_returned\":false},\"operating\":{\"spec\":\"current_density\"}}";

void identification_and_lists(ICapeUnit* unit) {
    check(name_of(unit) == L"elyblock electrolyzer", "unit name through ICapeIdentification (vtable)");
    Ptr<ICapeIdentification> id = query<ICapeIdentification>(unit);
    Bstr description;
    id->get_ComponentDescription(description.out());
    check(contains(from_bstr(description.get()), L"Electrolyzer"), "unit description");
    // The same through IDispatch: name (DISPID 1, by GetIDsOfNames too), ports and their directions.
    DISPID dispid = 0;
    LPOLESTR member = const_cast<LPOLESTR>(L"ComponentName");
    check(SUCCEEDED(id->GetIDsOfNames(IID_NULL, &member, 1, LOCALE_USER_DEFAULT, &dispid)) && dispid == 1,
          "GetIDsOfNames(ComponentName) = 1");
    Variant name;
    check(SUCCEEDED(invoke(id.get(), 1, DISPATCH_PROPERTYGET, {}, name.get())) && name.ref().vt == VT_BSTR &&
              from_bstr(name.ref().bstrVal) == L"elyblock electrolyzer",
          "unit name through IDispatch::Invoke");

    // Ports, vtable.
    Ptr<ICapeCollection> ports = collection(unit, true);
    long count = 0;
    ports->Count(&count);
    check(count == 3, "3 ports for a water electrolyzer, got " + std::to_string(count));
    const wchar_t* expected[] = {L"feed", L"hydrogen", L"oxygen"};
    for (long k = 1; k <= count && k <= 3; ++k) {
        Ptr<IDispatch> d;
        ports->Item(v_i4(k), d.out());
        Ptr<ICapeUnitPort> p = query<ICapeUnitPort>(d.get());
        CapePortDirection dir = CAPE_INLET_OUTLET;
        CapePortType type = CAPE_ANY;
        p->get_direction(&dir);
        p->get_portType(&type);
        check(name_of(p.get()) == expected[k - 1], "port " + std::to_string(k) + " is " + u8(expected[k - 1]));
        check(dir == (k == 1 ? CAPE_INLET : CAPE_OUTLET) && type == CAPE_MATERIAL, "port direction and type (vtable)");
    }
    // Ports, IDispatch only: ICapeUnit.ports (1), ICapeCollection.Count (2) and Item (1), ICapeUnitPort.direction (2).
    Variant ports_d;
    check(SUCCEEDED(invoke(unit, 1, DISPATCH_PROPERTYGET, {}, ports_d.get())) && ports_d.ref().vt == VT_DISPATCH,
          "ports through IDispatch");
    Variant n;
    invoke(ports_d.ref().pdispVal, 2, DISPATCH_METHOD, {}, n.get());
    check(n.ref().vt == VT_I4 && n.ref().lVal == 3, "port count through IDispatch");
    Variant port3, direction;
    invoke(ports_d.ref().pdispVal, 1, DISPATCH_METHOD, {v_i4(3)}, port3.get());
    check(port3.ref().vt == VT_DISPATCH && SUCCEEDED(invoke(port3.ref().pdispVal, 2, DISPATCH_PROPERTYGET, {}, direction.get())) &&
              direction.ref().lVal == CAPE_OUTLET,
          "port 3 is an outlet, through IDispatch");

    // Parameters: every variable of the table but the feed temperature, plus plant and spec.
    ely_block* b = nullptr;
    ely_block_create(kPemPlant, &b);
    int32_t variables = 0;
    ely_block_variable_count(b, &variables);
    Ptr<ICapeCollection> params = collection(unit, false);
    params->Count(&count);
    check(count == variables + 1, "parameters = variables - in.feed_temperature + plant + spec: " + std::to_string(count) +
                                      " vs " + std::to_string(variables + 1));
    int inputs = 0, outputs = 0, matched = 0;
    for (long k = 1; k <= count; ++k) {
        Ptr<IDispatch> d;
        params->Item(v_i4(k), d.out());
        Ptr<ICapeParameter> p = query<ICapeParameter>(d.get());
        CapeParamMode mode = CAPE_INPUT_OUTPUT;
        p->get_Mode(&mode);
        (mode == CAPE_INPUT ? inputs : outputs)++;
        int32_t index = -1;
        if (ely_block_find(b, u8(name_of(p.get())).c_str(), &index) == ELY_OK) ++matched;
    }
    check(matched == variables - 1, "each parameter but plant and spec is a variable of the table");
    check(inputs >= 10 && outputs > 40, "input and result parameters: " + std::to_string(inputs) + ", " + std::to_string(outputs));
    // The same count and one parameter's specification through IDispatch.
    Ptr<ICapeUtilities> utilities = query<ICapeUtilities>(unit);
    Variant params_d, pcount, temp, spec, lower, dims;
    invoke(utilities.get(), 1, DISPATCH_PROPERTYGET, {}, params_d.get());
    invoke(params_d.ref().pdispVal, 2, DISPATCH_METHOD, {}, pcount.get());
    check(pcount.ref().lVal == count, "parameter count through IDispatch");
    VARIANT key;
    key.vt = VT_BSTR;
    key.bstrVal = SysAllocString(L"in.temperature");
    invoke(params_d.ref().pdispVal, 1, DISPATCH_METHOD, {key}, temp.get());
    SysFreeString(key.bstrVal);
    check(temp.ref().vt == VT_DISPATCH && SUCCEEDED(invoke(temp.ref().pdispVal, 1, DISPATCH_PROPERTYGET, {}, spec.get())),
          "in.temperature specification through IDispatch");
    Ptr<ICapeRealParameterSpec> real = query<ICapeRealParameterSpec>(spec.ref().pdispVal);
    double lo = -1;
    if (real) real->get_LowerBound(&lo);
    Ptr<ICapeParameterSpec> ps = query<ICapeParameterSpec>(spec.ref().pdispVal);
    std::vector<double> dim;
    if (ps) ps->get_Dimensionality(dims.get());
    elyco::read_double_array(dims.ref(), dim);
    check(real && lo == 0.0 && dim.size() == 5 && dim[4] == 1.0, "in.temperature: real, lower bound 0, dimension K");
    Ptr<ICapeOptionParameterSpec> options = query<ICapeOptionParameterSpec>(parameter(unit, L"spec").get());
    Variant list;
    std::vector<std::wstring> names;
    if (options) options->get_OptionList(list.get());
    elyco::read_string_array(list.ref(), names);
    check(names.size() == 5 && names[2] == L"power", "spec is an option parameter: current_density ... voltage");
    ely_block_destroy(b);
}

// PEM plant at a power set point: the outlets against the C interface, element balances, results.
void water_calculation(ICapeUnit* unit) {
    check(SUCCEEDED(set_text(unit, L"plant", elyco::to_wide(kPemPlant))), "plant as JSON text");
    // The spec through IDispatch (ICapeParameter.value = DISPID 2, property put), the rest through the vtable.
    Ptr<ICapeParameter> spec = parameter(unit, L"spec");
    VARIANT power;
    power.vt = VT_BSTR;
    power.bstrVal = SysAllocString(L"power");
    check(SUCCEEDED(invoke(spec.get(), 2, DISPATCH_PROPERTYPUT, {power}, nullptr)), "spec = power through IDispatch");
    SysFreeString(power.bstrVal);
    auto* context = new Context;
    Ptr<ICapeUtilities> utilities = query<ICapeUtilities>(unit);
    check(SUCCEEDED(utilities->put_simulationContext(context)), "simulation context");
    const double p_dc = 120e3, t = 338.15, pc = 20e5, pa = 2e5, t_feed = 293.15;
    check(SUCCEEDED(set_number(unit, L"in.power", p_dc)), "in.power");
    check(SUCCEEDED(set_number(unit, L"in.temperature", t)), "in.temperature");
    check(SUCCEEDED(set_number(unit, L"in.pressure_cathode", pc)), "in.pressure_cathode");
    check(SUCCEEDED(set_number(unit, L"in.pressure_anode", pa)), "in.pressure_anode");

    Reference ref;
    check(solve_reference(ref, kPemPlant, "power",
                          {{"in.power", p_dc}, {"in.temperature", t}, {"in.pressure_cathode", pc},
                           {"in.pressure_anode", pa}, {"in.feed_temperature", t_feed}}),
          "the C interface solves the same point");
    const double water_needed = ref.get("feed.water") / mm("H2O");  // mol/s
    // Feed: 1.6 times the water needed, with a little nitrogen that must pass through.
    const auto list = compounds({L"H2O", L"H2", L"O2", L"N2"});
    auto* feed = new test::Material(L"feed", list);
    auto* h2 = new test::Material(L"hydrogen product", list);
    auto* o2 = new test::Material(L"oxygen product", list);
    const double n_feed = 1.6 * water_needed / 0.999;
    feed->set_overall(t_feed, 3e5, n_feed, {0.999, 0, 0, 0.001});
    check(SUCCEEDED(connect(unit, L"feed", feed)) && SUCCEEDED(connect(unit, L"hydrogen", h2)) &&
              SUCCEEDED(connect(unit, L"oxygen", o2)),
          "connect the materials");
    std::wstring message;
    const bool valid = validate(unit, message);
    check(valid, "validate: " + u8(message));
    CapeValidationStatus status = CAPE_NOT_VALIDATED;
    unit->get_ValStatus(&status);
    check(status == CAPE_VALID, "ValStatus is valid");
    const HRESULT hr = unit->Calculate();
    check(SUCCEEDED(hr), "calculate" + (FAILED(hr) ? ": " + u8(error_of(unit)) : std::string()));
    if (FAILED(hr)) return;

    // Outlets against the C interface: molar flows from its mass flows and mole fractions.
    const double xc[3] = {ref.get("stream.cathode.x_h2"), ref.get("stream.cathode.x_o2"), ref.get("stream.cathode.x_h2o")};
    const double nc = ref.get("stream.cathode.mass_flow") / (xc[0] * mm("H2") + xc[1] * mm("O2") + xc[2] * mm("H2O"));
    const double xa[3] = {ref.get("stream.anode.x_o2"), ref.get("stream.anode.x_h2"), ref.get("stream.anode.x_h2o")};
    const double na = ref.get("stream.anode.mass_flow") / (xa[0] * mm("O2") + xa[1] * mm("H2") + xa[2] * mm("H2O"));
    check(close(flow(h2, L"H2") * mm("H2"), ref.get("product.hydrogen")), "hydrogen outlet H2 = product.hydrogen: " +
                                                                               num(flow(h2, L"H2") * mm("H2")) + " vs " +
                                                                               num(ref.get("product.hydrogen")));
    check(close(flow(h2, L"H2"), xc[0] * nc), "hydrogen outlet H2 vs the cathode stream");
    check(close(flow(o2, L"O2"), xa[0] * na) && close(flow(o2, L"O2") * mm("O2"), ref.get("product.oxygen")),
          "oxygen outlet O2 = product.oxygen");
    check(close(flow(o2, L"H2"), xa[1] * na), "hydrogen crossing to the oxygen outlet");
    check(flow(h2, L"H2O") > xc[2] * nc * (1 + 1e-9), "drag water that is not returned leaves with the hydrogen");
    check(close(flow(o2, L"H2O"), xa[2] * na + (feed->fractions[0] * feed->total_flow - water_needed)),
          "oxygen outlet water = vapour + surplus feed water");
    check(close(flow(o2, L"N2"), 0.001 * n_feed), "nitrogen passes through to the oxygen outlet");
    check(h2->temperature == ref.get("stream.cathode.temperature") && h2->pressure == pc && o2->pressure == pa,
          "outlet temperature and pressures");
    check(h2->flashed && o2->flashed && h2->present.size() == 2, "outlets flashed at T and p by the material's thermodynamics");
    check(o2->vapour_fraction > 0 && o2->vapour_fraction < 1, "the oxygen outlet has liquid surplus water after the flash");
    check_balance({feed}, {h2, o2}, {L"H", L"O", L"N"}, "PEM");
    // This point is below the plant's minimum load: the solver's alarm reaches the host's log.
    check(ref.get("alarm.load_low") == 1.0 && context->messages.size() == 1 && contains(context->messages[0], L"load"),
          "the alarm is logged through the simulation context: " + (context->messages.empty() ? std::string() : u8(context->messages[0])));
    utilities->put_simulationContext(nullptr);
    context->Release();
    // Results as output parameters equal the C interface.
    for (const char* name : {"cell.voltage", "stack.power", "heat.duty", "cell.faraday_efficiency", "gas.h2_in_o2",
                             "alarm.any"})
        check(get_number(unit, elyco::to_wide(name)) == ref.get(name), std::string("result ") + name);

    // Persistence: save, load into a new unit, same parameters and results.
    Ptr<IPersistStreamInit> persist = query<IPersistStreamInit>(unit);
    Ptr<IStream> stream;
    CreateStreamOnHGlobal(nullptr, TRUE, stream.out());
    check(persist && SUCCEEDED(persist->Save(stream.get(), TRUE)), "save to a stream");
    check(persist->IsDirty() == S_FALSE, "not dirty after save");
    LARGE_INTEGER zero = {};
    stream->Seek(zero, STREAM_SEEK_SET, nullptr);
    Ptr<ICapeUnit> copy = create_unit();
    Ptr<IPersistStream> persist2 = query<IPersistStream>(copy.get());  // the IPersistStream face of the same object
    check(persist2 && SUCCEEDED(persist2->Load(stream.get())), "load into a new unit");
    Ptr<ICapeParameter> copy_spec = parameter(copy.get(), L"spec");
    Variant spec_value;
    copy_spec->get_value(spec_value.get());
    check(spec_value.ref().vt == VT_BSTR && from_bstr(spec_value.ref().bstrVal) == L"power", "restored spec");
    check(get_number(copy.get(), L"in.power") == p_dc && get_number(copy.get(), L"in.pressure_cathode") == pc,
          "restored inputs");
    auto* f2 = new test::Material(L"feed", list);
    auto* h2b = new test::Material(L"h2", list);
    auto* o2b = new test::Material(L"o2", list);
    f2->set_overall(t_feed, 3e5, n_feed, {0.999, 0, 0, 0.001});
    connect(copy.get(), L"feed", f2);
    connect(copy.get(), L"hydrogen", h2b);
    connect(copy.get(), L"oxygen", o2b);
    check(SUCCEEDED(copy->Calculate()) && flow(h2b, L"H2") == flow(h2, L"H2"), "the restored unit calculates the same");
    query<ICapeUtilities>(copy.get())->Terminate();
    for (auto* m : {feed, h2, o2, f2, h2b, o2b}) m->Release();
}

void brine_calculation(ICapeUnit* unit) {
    const char* plant = "{\"technology\":\"brine\",\"stack\":{\"cells\":50,\"active_area\":2.7},"
                        "\"operating\":{\"spec\":\"current_density\"}}";
    check(SUCCEEDED(set_text(unit, L"plant", elyco::to_wide(plant))), "brine plant");
    Ptr<ICapeCollection> ports = collection(unit, true);
    long count = 0;
    ports->Count(&count);
    check(count == 4 && item(ports.get(), L"brine") && item(ports.get(), L"chlorine") && item(ports.get(), L"caustic"),
          "brine ports: brine, chlorine, hydrogen, caustic");
    check(SUCCEEDED(set_text(unit, L"spec", L"current_density")) && SUCCEEDED(set_number(unit, L"in.current_density", 4000)),
          "brine operating point");
    Reference ref;
    const double t_feed = 333.15;
    check(solve_reference(ref, plant, "current_density", {{"in.current_density", 4000}, {"in.feed_temperature", t_feed},
                                                          {"in.temperature", get_number(unit, L"in.temperature")}}),
          "brine through the C interface");
    const auto list = compounds({L"H2O", L"H2", L"O2", L"Cl2", L"NaCl", L"NaOH"});
    auto* feed = new test::Material(L"brine", list);
    std::vector<test::Material*> out;
    for (const wchar_t* n : {L"chlorine", L"hydrogen", L"caustic"}) out.push_back(new test::Material(n, list));
    // Brine of 26 % NaCl by mass, twice the water the cell consumes (surplus leaves with the chlorine).
    const double w = 2 * ref.get("feed.water") / mm("H2O");
    const double s = w * mm("H2O") * 0.26 / 0.74 / mm("NaCl");
    check(s > ref.get("feed.salt") / mm("NaCl"), "the test brine carries enough salt");
    feed->set_overall(t_feed, 3e5, w + s, {w / (w + s), 0, 0, 0, s / (w + s), 0});
    connect(unit, L"brine", feed);
    connect(unit, L"chlorine", out[0]);
    connect(unit, L"hydrogen", out[1]);
    connect(unit, L"caustic", out[2]);
    std::wstring message;
    const bool valid = validate(unit, message);
    check(valid, "brine validates " + u8(message));
    const HRESULT hr = unit->Calculate();
    check(SUCCEEDED(hr), "brine calculates " + (FAILED(hr) ? u8(error_of(unit)) : std::string()));
    check(close(flow(out[0], L"Cl2") * mm("Cl2"), ref.get("product.chlorine")), "chlorine outlet = product.chlorine");
    check(close(flow(out[2], L"NaOH") * mm("NaOH"), ref.get("product.caustic")), "caustic outlet = product.caustic");
    check(close(flow(out[2], L"NaOH") * mm("NaOH") + flow(out[2], L"H2O") * mm("H2O"), ref.get("product.caustic_solution")),
          "caustic solution strength");
    check(close(flow(out[1], L"H2") * mm("H2"), ref.get("product.hydrogen")), "hydrogen outlet = product.hydrogen");
    check_balance({feed}, out, {L"H", L"O", L"Na", L"Cl"}, "brine");
    query<ICapeUtilities>(unit)->Terminate();
    feed->Release();
    for (auto* m : out) m->Release();
}

void misuse() {
    // Calculate before connecting: ECapeBadInvOrder with a message naming the port.
    Ptr<ICapeUnit> unit = create_unit();
    HRESULT hr = unit->Calculate();
    check(hr == ECapeBadInvOrderHR && contains(error_of(unit.get()), L"not connected") &&
              error_name_of(unit.get()) == L"ECapeBadInvOrder",
          "calculate before connecting: " + u8(error_of(unit.get())));
    EXCEPINFO info = {};
    Variant ignored;
    hr = invoke(unit.get(), 3, DISPATCH_METHOD, {}, ignored.get(), &info);
    check(hr == DISP_E_EXCEPTION && info.scode == ECapeBadInvOrderHR && contains(from_bstr(info.bstrDescription), L"not connected"),
          "the same through IDispatch: DISP_E_EXCEPTION carrying the error and its message");
    SysFreeString(info.bstrDescription);
    SysFreeString(info.bstrSource);
    SysFreeString(info.bstrHelpFile);

    // A flowsheet without oxygen: validation names the missing compound.
    const auto no_oxygen = compounds({L"H2O", L"H2", L"N2"});
    auto* feed = new test::Material(L"feed", no_oxygen);
    auto* a = new test::Material(L"a", no_oxygen);
    auto* b = new test::Material(L"b", no_oxygen);
    feed->set_overall(300, 3e5, 10, {1, 0, 0});
    connect(unit.get(), L"feed", feed);
    connect(unit.get(), L"hydrogen", a);
    connect(unit.get(), L"oxygen", b);
    std::wstring message;
    bool valid = validate(unit.get(), message);
    check(!valid && contains(message, L"oxygen") && contains(message, L"7782-44-7"), "missing compound named: " + u8(message));
    check(unit->Calculate() == ECapeBadInvOrderHR && contains(error_of(unit.get()), L"oxygen"), "calculate refuses it too");
    query<ICapeUtilities>(unit.get())->Terminate();
    for (auto* m : {feed, a, b}) m->Release();

    // Too little water: validation names the shortfall.
    const auto list = compounds({L"H2O", L"H2", L"O2"});
    feed = new test::Material(L"feed", list);
    a = new test::Material(L"a", list);
    b = new test::Material(L"b", list);
    feed->set_overall(300, 3e5, 1e-4, {1, 0, 0});
    connect(unit.get(), L"feed", feed);
    connect(unit.get(), L"hydrogen", a);
    connect(unit.get(), L"oxygen", b);
    valid = validate(unit.get(), message);
    check(!valid && contains(message, L"short") && contains(message, L"water"), "water shortfall named: " + u8(message));
    check(FAILED(unit->Calculate()) && a->flashes == 0, "no outlet is written when the feed is short");
    query<ICapeUtilities>(unit.get())->Terminate();
    for (auto* m : {feed, a, b}) m->Release();

    // Bad parameter values: out of bounds, not in the list, a result, not a number.
    const double before = get_number(unit.get(), L"in.temperature");
    hr = set_number(unit.get(), L"in.temperature", -5);
    check(hr == ECapeOutOfBoundsHR && contains(error_of(parameter(unit.get(), L"in.temperature").get()), L"lower bound") &&
              get_number(unit.get(), L"in.temperature") == before,
          "negative temperature refused, value kept");
    hr = set_text(unit.get(), L"spec", L"banana");
    check(hr == ECapeInvalidArgumentHR && contains(error_of(parameter(unit.get(), L"spec").get()), L"hydrogen_rate"),
          "unknown spec refused with the list");
    check(set_number(unit.get(), L"cell.voltage", 2.0) == ECapeInvalidOperationHR, "a result cannot be set");
    check(set_text(unit.get(), L"in.power", L"lots") == ECapeInvalidArgumentHR, "a number parameter refuses text");
    check(set_number(unit.get(), L"in.power", std::nan("")) == ECapeInvalidArgumentHR, "NaN refused");

    // A plant file that does not exist: the library's message.
    hr = set_text(unit.get(), L"plant", L"Z:\\no\\such\\plant.json");
    const std::wstring why = error_of(parameter(unit.get(), L"plant").get());
    check(hr == ECapeInvalidArgumentHR && contains(why, L"cannot read config file"), "missing plant file: " + u8(why));
    // A plant that does not validate: the JSON path of the problem.
    hr = set_text(unit.get(), L"plant", L"{\"technology\":\"pem\",\"stack\":{\"cells\":-3,\"active_area\":0.1}}");
    check(hr == ECapeInvalidArgumentHR && contains(error_of(parameter(unit.get(), L"plant").get()), L"$.stack.cells"),
          "invalid plant: " + u8(error_of(parameter(unit.get(), L"plant").get())));

    // Edit: not implemented, said the standard's way.
    Ptr<ICapeUtilities> u = query<ICapeUtilities>(unit.get());
    check(u->Edit() == ECapeNoImplHR && query<ECapeNoImpl>(unit.get()), "Edit answers ECapeNoImpl");
    // A port refuses an object that is no material.
    Ptr<ICapeCollection> ports = collection(unit.get(), true);
    Ptr<ICapeUnitPort> port = query<ICapeUnitPort>(item(ports.get(), L"feed").get());
    check(port->Connect(ports.get()) == ECapeInvalidArgumentHR, "a port refuses a non-material");
    Ptr<IDispatch> none;
    check(ports->Item(v_i4(7), none.out()) == ECapeInvalidArgumentHR && !none && contains(error_of(ports.get()), L"1..3"),
          "item 7 of 3 ports refused");
    check(!item(ports.get(), L"nowhere") && contains(error_of(ports.get()), L"feed, hydrogen, oxygen"),
          "an unknown port name refused, naming the ports");
}

}  // namespace

namespace elyco {
HRESULT type_info(REFIID iid, ITypeInfo** out) {
    if (!g_library) return TYPE_E_CANTLOADLIBRARY;
    return g_library->GetTypeInfoOfGuid(iid, out);
}
}  // namespace elyco

int main(int argc, char** argv) {
    if (argc != 2) {
        std::printf("usage: capeopen_client <capeopen.tlb>\n");
        return 2;
    }
    CoInitializeEx(nullptr, COINIT_APARTMENTTHREADED);
    if (FAILED(LoadTypeLibEx(elyco::to_wide(argv[1]).c_str(), REGKIND_NONE, &g_library))) {
        std::printf("cannot load the type library %s\n", argv[1]);
        return 2;
    }
    {
        Ptr<ICapeUnit> unit = create_unit();
        check(static_cast<bool>(unit), "create the unit by ProgID elyblock.Electrolyzer");
        if (unit) {
            identification_and_lists(unit.get());
            water_calculation(unit.get());
            brine_calculation(unit.get());
            misuse();
            query<ICapeUtilities>(unit.get())->Terminate();
        }
    }
    g_library->Release();
    CoUninitialize();
    std::printf("%d passed, %d failed\n", g_passed, g_failed);
    return g_failed == 0 ? 0 : 1;
}
