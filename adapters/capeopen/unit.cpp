// The elyblock unit operation: collections, ports, parameters, the unit's life cycle and its
// persistence. Validation and calculation against the host's materials: calculate.cpp.
#include "unit.hpp"

#include <algorithm>
#include <cmath>
#include <cstring>
#include <cwctype>

namespace elyco {

const wchar_t* const kProgId = L"elyblock.Electrolyzer.1";
const wchar_t* const kVersionIndependentProgId = L"elyblock.Electrolyzer";
const wchar_t* const kUnitName = L"elyblock electrolyzer";
const wchar_t* const kUnitDescription =
    L"Electrolyzer unit operation (PEM, alkaline, solid oxide, chlor-alkali brine) over the elyblock C interface";

namespace {

// A new unit works at once: the minimal PEM plant (examples/minimal/pem.json).
const wchar_t* const kDefaultPlant =
    L"{ \"technology\": \"pem\", \"stack\": { \"cells\": 100, \"active_area\": 0.1 }, "
    L"\"operating\": { \"spec\": \"current_density\" } }";

// The drive inputs, one per spec ("in." + spec).
const char* const kSpecs[] = {"current_density", "current", "power", "hydrogen_rate", "voltage"};

bool same_name(const std::wstring& a, const std::wstring& b) {
    if (a.size() != b.size()) return false;
    for (size_t i = 0; i < a.size(); ++i)
        if (std::towlower(a[i]) != std::towlower(b[i])) return false;
    return true;
}

std::wstring number_text(double v) {
    char buf[64];
    std::snprintf(buf, sizeof buf, "%.17g", v);
    return to_wide(buf);
}

// SI dimensionality (m, kg, s, A, K, mol, cd, rad) and the factor to SI of a unit of the
// variable table ("A/m2", "kg/s", "J/kg", "mol/mol", "h", "1", ...). False if a symbol is unknown.
bool si_unit(const std::string& unit, std::vector<double>& dims, double& scale) {
    struct Symbol {
        const char* name;
        double dims[8];
        double scale;
    };
    static const Symbol symbols[] = {
        {"m", {1, 0, 0, 0, 0, 0, 0, 0}, 1},     {"kg", {0, 1, 0, 0, 0, 0, 0, 0}, 1},
        {"g", {0, 1, 0, 0, 0, 0, 0, 0}, 1e-3},  {"s", {0, 0, 1, 0, 0, 0, 0, 0}, 1},
        {"h", {0, 0, 1, 0, 0, 0, 0, 0}, 3600},  {"A", {0, 0, 0, 1, 0, 0, 0, 0}, 1},
        {"K", {0, 0, 0, 0, 1, 0, 0, 0}, 1},     {"mol", {0, 0, 0, 0, 0, 1, 0, 0}, 1},
        {"cd", {0, 0, 0, 0, 0, 0, 1, 0}, 1},    {"rad", {0, 0, 0, 0, 0, 0, 0, 1}, 1},
        {"N", {1, 1, -2, 0, 0, 0, 0, 0}, 1},    {"Pa", {-1, 1, -2, 0, 0, 0, 0, 0}, 1},
        {"J", {2, 1, -2, 0, 0, 0, 0, 0}, 1},    {"W", {2, 1, -3, 0, 0, 0, 0, 0}, 1},
        {"V", {2, 1, -3, -1, 0, 0, 0, 0}, 1},   {"C", {0, 0, 1, 1, 0, 0, 0, 0}, 1},
        {"ohm", {2, 1, -3, -2, 0, 0, 0, 0}, 1}, {"1", {0, 0, 0, 0, 0, 0, 0, 0}, 1},
    };
    dims.assign(8, 0.0);
    scale = 1.0;
    int sign = 1;
    size_t i = 0;
    while (i < unit.size()) {
        const char c = unit[i];
        if (c == '/') {
            sign = -1;
            ++i;
            continue;
        }
        if (c == '.' || c == '*' || c == ' ') {
            ++i;
            continue;
        }
        size_t j = i;
        while (j < unit.size() && (std::isalpha(static_cast<unsigned char>(unit[j])) || (j == i && unit[j] == '1'))) ++j;
        const std::string symbol = unit.substr(i, j - i);
        size_t k = j;
        if (k < unit.size() && (unit[k] == '-' || std::isdigit(static_cast<unsigned char>(unit[k])))) ++k;
        while (k < unit.size() && std::isdigit(static_cast<unsigned char>(unit[k]))) ++k;
        const int exponent = (k > j && symbol != "1") ? std::atoi(unit.substr(j, k - j).c_str()) : 1;
        const Symbol* s = nullptr;
        for (const auto& candidate : symbols)
            if (symbol == candidate.name) s = &candidate;
        if (!s) return false;
        for (int d = 0; d < 8; ++d) dims[static_cast<size_t>(d)] += sign * exponent * s->dims[d];
        scale *= std::pow(s->scale, sign * exponent);
        i = (k > j && symbol != "1") ? k : j;
    }
    while (!dims.empty() && dims.back() == 0.0) dims.pop_back();  // trailing zeros may be left out
    return true;
}

// What the second version of ely_variable_info adds (variability, limits, start value, display
// label), when the header this is built against has it and the library filled it (an older
// library leaves `label` NULL). With the first version, `present` stays false.
struct Metadata {
    bool present = false, tunable = false, discrete = false, min_exclusive = false;
    double min = std::numeric_limits<double>::quiet_NaN(), max = std::numeric_limits<double>::quiet_NaN();
    double start = std::numeric_limits<double>::quiet_NaN();
    std::string label;
};

Metadata metadata(const ely_variable_info& info) {
    Metadata m;
#ifdef ELY_VARIABILITY_TUNABLE
    if (info.struct_size < sizeof info || info.label == nullptr) return m;
    m.present = true;
    m.tunable = info.variability == ELY_VARIABILITY_TUNABLE;
    m.discrete = info.variability == ELY_VARIABILITY_DISCRETE;
    m.min_exclusive = (info.flags & ELY_VARIABLE_MIN_EXCLUSIVE) != 0;
    if (std::isfinite(info.min)) m.min = info.min;  // CAPE-OPEN: NaN for "no bound"
    if (std::isfinite(info.max)) m.max = info.max;
    m.start = info.start;
    m.label = info.label;
#else
    (void)info;
#endif
    return m;
}

}  // namespace

// ---- Collection ---------------------------------------------------------------------------

STDMETHODIMP Collection::QueryInterface(REFIID iid, void** out) {
    if (!out) return E_POINTER;
    *out = nullptr;
    if (iid == IID_IUnknown || iid == IID_IDispatch || iid == __uuidof(ICapeCollection))
        return give(static_cast<ICapeCollection*>(this), out);
    return query_base(iid, out) ? S_OK : E_NOINTERFACE;
}

void Collection::add(CapeObject* item, IDispatch* as_dispatch) {
    as_dispatch->AddRef();
    items_.emplace_back(item, as_dispatch);
}

void Collection::clear() {
    for (auto& item : items_) item.second->Release();
    items_.clear();
}

STDMETHODIMP Collection::Item(VARIANT id, IDispatch** item) {
    ELYCO_TRY
    if (!item) return E_POINTER;
    *item = nullptr;
    const VARIANT* v = (id.vt == (VT_BYREF | VT_VARIANT) && id.pvarVal) ? id.pvarVal : &id;
    if (v->vt == VT_BSTR || v->vt == (VT_BYREF | VT_BSTR)) {
        const std::wstring wanted = from_bstr(v->vt == VT_BSTR ? v->bstrVal : *v->pbstrVal);
        for (auto& i : items_)
            if (same_name(i.first->name(), wanted)) return give(i.second, reinterpret_cast<void**>(item));
        std::wstring known;
        for (auto& i : items_) known += (known.empty() ? L"" : L", ") + i.first->name();
        return fail(ECapeInvalidArgumentHR, L"ICapeCollection", L"Item",
                    L"no item named '" + wanted + L"' in " + name_ + L"; items: " + known);
    }
    Variant index;
    if (FAILED(VariantChangeType(index.get(), const_cast<VARIANT*>(v), 0, VT_I4)))
        return fail(ECapeInvalidArgumentHR, L"ICapeCollection", L"Item",
                    std::wstring(L"an item is asked for by name (a string) or by index (1 to Count)"));
    const long k = index.ref().lVal;
    if (k < 1 || k > static_cast<long>(items_.size()))
        return fail(ECapeInvalidArgumentHR, L"ICapeCollection", L"Item",
                    L"index " + std::to_wstring(k) + L" is outside 1.." + std::to_wstring(items_.size()));
    return give(items_[static_cast<size_t>(k - 1)].second, reinterpret_cast<void**>(item));
    ELYCO_CATCH(L"ICapeCollection", L"Item")
}

STDMETHODIMP Collection::Count(long* count) {
    if (!count) return E_POINTER;
    *count = static_cast<long>(items_.size());
    return S_OK;
}

// ---- Port ---------------------------------------------------------------------------------

STDMETHODIMP Port::QueryInterface(REFIID iid, void** out) {
    if (!out) return E_POINTER;
    *out = nullptr;
    if (iid == IID_IUnknown || iid == IID_IDispatch || iid == __uuidof(ICapeUnitPort))
        return give(static_cast<ICapeUnitPort*>(this), out);
    return query_base(iid, out) ? S_OK : E_NOINTERFACE;
}

STDMETHODIMP Port::get_portType(CapePortType* type) {
    if (!type) return E_POINTER;
    *type = CAPE_MATERIAL;
    return S_OK;
}

STDMETHODIMP Port::get_direction(CapePortDirection* direction) {
    if (!direction) return E_POINTER;
    *direction = direction_;
    return S_OK;
}

STDMETHODIMP Port::get_connectedObject(IDispatch** object) {
    if (!object) return E_POINTER;
    *object = connected_;
    if (connected_) connected_->AddRef();
    return S_OK;
}

STDMETHODIMP Port::Connect(IDispatch* object) {
    ELYCO_TRY
    if (!object)
        return fail(ECapeInvalidArgumentHR, L"ICapeUnitPort", L"Connect",
                    L"nothing to connect to port '" + name_ + L"': use Disconnect to free it");
    ICapeThermoMaterial* material = nullptr;
    if (FAILED(object->QueryInterface(__uuidof(ICapeThermoMaterial), reinterpret_cast<void**>(&material))))
        return fail(ECapeInvalidArgumentHR, L"ICapeUnitPort", L"Connect",
                    L"port '" + name_ + L"' takes a material object of CAPE-OPEN thermodynamics 1.1 (ICapeThermoMaterial)");
    Disconnect();
    connected_ = object;
    connected_->AddRef();
    material_ = material;
    if (unit_) unit_->invalidate();
    return S_OK;
    ELYCO_CATCH(L"ICapeUnitPort", L"Connect")
}

STDMETHODIMP Port::Disconnect() {
    if (material_) material_->Release();
    if (connected_) connected_->Release();
    const bool was_connected = connected_ != nullptr;
    material_ = nullptr;
    connected_ = nullptr;
    if (was_connected && unit_) unit_->invalidate();
    return S_OK;
}

// ---- Parameter ----------------------------------------------------------------------------

Parameter::Parameter(Unit* unit, std::wstring name, std::wstring description, Spec spec)
    : CapeObject(std::move(name), std::move(description), false), unit_(unit), spec_(std::move(spec)) {
    if (spec_.mode == CAPE_INPUT) {
        if (spec_.kind == ParamKind::option) set_text(spec_.default_text);
        else set_number(spec_.default_number);
    }
}

STDMETHODIMP Parameter::QueryInterface(REFIID iid, void** out) {
    if (!out) return E_POINTER;
    *out = nullptr;
    if (iid == IID_IUnknown || iid == IID_IDispatch || iid == __uuidof(ICapeParameter))
        return give(static_cast<ICapeParameter*>(this), out);
    if (iid == __uuidof(ICapeParameterSpec)) return give(static_cast<ICapeParameterSpec*>(this), out);
    if (iid == __uuidof(ICapeRealParameterSpec) && spec_.kind == ParamKind::real)
        return give(static_cast<ICapeRealParameterSpec*>(this), out);
    if (iid == __uuidof(ICapeIntegerParameterSpec) && spec_.kind == ParamKind::integer)
        return give(static_cast<ICapeIntegerParameterSpec*>(this), out);
    if (iid == __uuidof(ICapeOptionParameterSpec) && spec_.kind == ParamKind::option)
        return give(static_cast<ICapeOptionParameterSpec*>(this), out);
    return query_base(iid, out) ? S_OK : E_NOINTERFACE;
}

STDMETHODIMP Parameter::get_Specification(IDispatch** spec) {
    if (!spec) return E_POINTER;
    return give(static_cast<ICapeParameterSpec*>(this), reinterpret_cast<void**>(spec));
}

STDMETHODIMP Parameter::get_value(VARIANT* value) {
    if (!value) return E_POINTER;
    VariantInit(value);
    if (!has_value_) return S_OK;  // VT_EMPTY: no value yet (a result before the first calculation)
    switch (spec_.kind) {
        case ParamKind::real:
            value->vt = VT_R8;
            value->dblVal = number_;
            break;
        case ParamKind::integer:
            value->vt = VT_I4;
            value->lVal = static_cast<LONG>(std::lround(number_));
            break;
        case ParamKind::option:
            value->vt = VT_BSTR;
            value->bstrVal = SysAllocStringLen(text_.data(), static_cast<UINT>(text_.size()));
            break;
    }
    return S_OK;
}

std::wstring Parameter::check_number(double v) const {
    if (std::isnan(v)) return L"'" + name_ + L"' needs a value (not NaN)";
    if (std::isinf(v)) return L"'" + name_ + L"' must be finite";
    if (spec_.kind == ParamKind::integer && v != std::floor(v)) return L"'" + name_ + L"' takes whole numbers";
    if (!std::isnan(spec_.lower) && (v < spec_.lower || (spec_.lower_exclusive && v == spec_.lower)))
        return L"'" + name_ + L"' = " + number_text(v) + L" is " + (spec_.lower_exclusive ? L"not above" : L"below") +
               L" its lower bound " + number_text(spec_.lower);
    if (!std::isnan(spec_.upper) && v > spec_.upper)
        return L"'" + name_ + L"' = " + number_text(v) + L" is above its upper bound " + number_text(spec_.upper);
    return L"";
}

std::wstring Parameter::check_text(const std::wstring& t) const {
    if (!spec_.restricted) return t.empty() ? L"'" + name_ + L"' cannot be empty" : L"";
    for (const auto& o : spec_.options)
        if (o == t) return L"";
    std::wstring list;
    for (const auto& o : spec_.options) list += (list.empty() ? L"" : L", ") + o;
    return L"'" + name_ + L"' cannot be '" + t + L"'; it is one of: " + list;
}

STDMETHODIMP Parameter::put_value(VARIANT value) {
    ELYCO_TRY
    if (spec_.mode == CAPE_OUTPUT)
        return fail(ECapeInvalidOperationHR, L"ICapeParameter", L"put_value",
                    L"'" + name_ + L"' is a result of the calculation and cannot be set");
    if (!unit_)
        return fail(ECapeInvalidOperationHR, L"ICapeParameter", L"put_value",
                    L"'" + name_ + L"' belongs to a plant description that was replaced; get the parameters again");
    const VARIANT* v = (value.vt == (VT_BYREF | VT_VARIANT) && value.pvarVal) ? value.pvarVal : &value;
    Variant converted;
    if (spec_.kind == ParamKind::option) {
        if (FAILED(VariantChangeType(converted.get(), const_cast<VARIANT*>(v), 0, VT_BSTR)))
            return fail(ECapeInvalidArgumentHR, L"ICapeParameter", L"put_value", L"'" + name_ + L"' takes a string");
        const std::wstring t = from_bstr(converted.ref().bstrVal);
        std::wstring why = check_text(t);
        if (why.empty()) why = unit_->parameter_changing(this, t);
        if (!why.empty()) return fail(ECapeInvalidArgumentHR, L"ICapeParameter", L"put_value", why);
        set_text(t);
    } else {
        if (FAILED(VariantChangeType(converted.get(), const_cast<VARIANT*>(v), 0, VT_R8)))
            return fail(ECapeInvalidArgumentHR, L"ICapeParameter", L"put_value", L"'" + name_ + L"' takes a number");
        const double d = converted.ref().dblVal;
        const std::wstring why = check_number(d);
        if (!why.empty()) return fail(std::isnan(d) || std::isinf(d) ? ECapeInvalidArgumentHR : ECapeOutOfBoundsHR,
                                      L"ICapeParameter", L"put_value", why);
        set_number(d);
    }
    unit_->invalidate();
    return S_OK;
    ELYCO_CATCH(L"ICapeParameter", L"put_value")
}

STDMETHODIMP Parameter::get_ValStatus(CapeValidationStatus* status) {
    if (!status) return E_POINTER;
    if (spec_.mode == CAPE_OUTPUT) *status = has_value_ ? CAPE_VALID : CAPE_NOT_VALIDATED;
    else *status = (spec_.kind == ParamKind::option ? check_text(text_) : check_number(number_)).empty() ? CAPE_VALID : CAPE_INVALID;
    return S_OK;
}

STDMETHODIMP Parameter::get_Mode(CapeParamMode* mode) {
    if (!mode) return E_POINTER;
    *mode = spec_.mode;
    return S_OK;
}

STDMETHODIMP Parameter::put_Mode(CapeParamMode mode) {
    if (mode == spec_.mode) return S_OK;
    return fail(ECapeInvalidOperationHR, L"ICapeParameter", L"put_Mode",
                L"the mode of '" + name_ + L"' is fixed by the variable table");
}

namespace {
HRESULT answer(const std::wstring& why, BSTR* message, VARIANT_BOOL* ok) {
    if (!message || !ok) return E_POINTER;
    SysFreeString(*message);  // [in, out]: the caller's string is ours to replace
    *message = why.empty() ? nullptr : SysAllocStringLen(why.data(), static_cast<UINT>(why.size()));
    *ok = why.empty() ? VARIANT_TRUE : VARIANT_FALSE;
    return S_OK;
}
}  // namespace

STDMETHODIMP Parameter::Validate(BSTR* message, VARIANT_BOOL* ok) {
    if (spec_.mode == CAPE_OUTPUT) return answer(L"", message, ok);
    return answer(spec_.kind == ParamKind::option ? check_text(text_) : check_number(number_), message, ok);
}

STDMETHODIMP Parameter::Reset() {
    if (spec_.mode == CAPE_OUTPUT) return S_OK;
    if (spec_.kind == ParamKind::option) {
        VARIANT v;
        v.vt = VT_BSTR;
        v.bstrVal = SysAllocStringLen(spec_.default_text.data(), static_cast<UINT>(spec_.default_text.size()));
        const HRESULT hr = put_value(v);
        SysFreeString(v.bstrVal);
        return hr;
    }
    set_number(spec_.default_number);
    if (unit_) unit_->invalidate();
    return S_OK;
}

STDMETHODIMP Parameter::get_Type(CapeParamType* type) {
    if (!type) return E_POINTER;
    *type = spec_.kind == ParamKind::real ? CAPE_REAL : spec_.kind == ParamKind::integer ? CAPE_INT : CAPE_OPTION;
    return S_OK;
}

STDMETHODIMP Parameter::get_Dimensionality(VARIANT* dimensionality) {
    return make_double_array(spec_.dimensionality, dimensionality);
}

STDMETHODIMP Parameter::get_DefaultValue(double* value) {
    if (!value) return E_POINTER;
    *value = spec_.default_number;
    return S_OK;
}
STDMETHODIMP Parameter::get_LowerBound(double* value) {
    if (!value) return E_POINTER;
    *value = spec_.lower;
    return S_OK;
}
STDMETHODIMP Parameter::get_UpperBound(double* value) {
    if (!value) return E_POINTER;
    *value = spec_.upper;
    return S_OK;
}
STDMETHODIMP Parameter::Validate(double value, BSTR* message, VARIANT_BOOL* ok) {
    return answer(check_number(value), message, ok);
}

namespace {
long to_long(double v, long if_nan) {
    if (std::isnan(v)) return if_nan;
    return static_cast<long>(std::max(-2147483647.0, std::min(2147483647.0, v)));
}
}  // namespace

STDMETHODIMP Parameter::get_DefaultValue(long* value) {
    if (!value) return E_POINTER;
    *value = to_long(spec_.default_number, 0);
    return S_OK;
}
STDMETHODIMP Parameter::get_LowerBound(long* value) {
    if (!value) return E_POINTER;
    *value = to_long(spec_.lower, -2147483647L);
    return S_OK;
}
STDMETHODIMP Parameter::get_UpperBound(long* value) {
    if (!value) return E_POINTER;
    *value = to_long(spec_.upper, 2147483647L);
    return S_OK;
}
STDMETHODIMP Parameter::Validate(long value, BSTR* message, VARIANT_BOOL* ok) {
    return answer(check_number(static_cast<double>(value)), message, ok);
}

STDMETHODIMP Parameter::get_DefaultValue(BSTR* value) {
    if (!value) return E_POINTER;
    *value = SysAllocStringLen(spec_.default_text.data(), static_cast<UINT>(spec_.default_text.size()));
    return S_OK;
}
STDMETHODIMP Parameter::get_OptionList(VARIANT* options) { return make_string_array(spec_.options, options); }
STDMETHODIMP Parameter::get_RestrictedToList(VARIANT_BOOL* restricted) {
    if (!restricted) return E_POINTER;
    *restricted = spec_.restricted ? VARIANT_TRUE : VARIANT_FALSE;
    return S_OK;
}
STDMETHODIMP Parameter::Validate(BSTR value, BSTR* message, VARIANT_BOOL* ok) {
    return answer(check_text(from_bstr(value)), message, ok);
}

// ---- Unit: construction, ports, parameters ----------------------------------------------

Unit::Unit()
    : CapeObject(kUnitName, kUnitDescription, true),
      ports_(new Collection(L"ports", L"material ports of the electrolyzer")),
      parameters_(new Collection(L"parameters", L"inputs and results of the electrolyzer, from elyblock's variable table")) {
    const std::string error = load_plant(kDefaultPlant);
    if (!error.empty()) fail(ECapeFailedInitialisationHR, L"ICapeUtilities", L"Initialize", error);
    build_parameters(kDefaultPlant, L"current_density");
    dirty_ = false;
}

Unit::~Unit() {
    Terminate();
    clear_parameters();
    for (Port* p : port_list_) {
        p->detach();
        p->Release();
    }
    ports_->Release();
    parameters_->Release();
    ely_block_destroy(block_);
}

STDMETHODIMP Unit::QueryInterface(REFIID iid, void** out) {
    if (!out) return E_POINTER;
    *out = nullptr;
    if (iid == IID_IUnknown || iid == IID_IDispatch || iid == __uuidof(ICapeUnit))
        return give(static_cast<ICapeUnit*>(this), out);
    if (iid == __uuidof(ICapeUtilities)) return give(static_cast<ICapeUtilities*>(this), out);
    if (iid == IID_IPersistStreamInit || iid == IID_IPersistStream || iid == IID_IPersist)
        return give(static_cast<IPersistStreamInit*>(this), out);
    return query_base(iid, out) ? S_OK : E_NOINTERFACE;
}

std::string Unit::load_plant(const std::wstring& plant) {
    // A description starting with '{' is JSON text; anything else a path to a JSON file (UTF-8).
    size_t first = plant.find_first_not_of(L" \t\r\n");
    const bool is_text = first != std::wstring::npos && plant[first] == L'{';
    ely_block* b = nullptr;
    const std::string utf8 = to_utf8(plant);
    const int32_t status = is_text ? ely_block_create(utf8.c_str(), &b) : ely_block_create_from_file(utf8.c_str(), &b);
    if (status != ELY_OK) return std::string("plant description: ") + ely_last_error();
    int32_t chlorine = -1;
    const bool brine = ely_block_find(b, "product.chlorine", &chlorine) == ELY_OK;
    ely_block_destroy(block_);
    block_ = b;
    if (port_list_.empty() || brine != brine_) build_ports(brine);
    brine_ = brine;
    return "";
}

void Unit::build_ports(bool brine) {
    ports_->clear();
    for (Port* p : port_list_) {
        p->Disconnect();
        p->detach();
        p->Release();
    }
    port_list_.clear();
    auto add = [&](PortRole role, const wchar_t* name, const wchar_t* description, CapePortDirection direction) {
        Port* p = new Port(this, role, name, description, direction);
        port_list_.push_back(p);
        ports_->add(p, static_cast<ICapeUnitPort*>(p));
    };
    if (brine) {
        add(PortRole::feed, L"brine", L"brine feed: water and sodium chloride (the net feeds; surplus leaves with the chlorine)", CAPE_INLET);
        add(PortRole::chlorine, L"chlorine", L"anode product: wet chlorine with oxygen, and any surplus brine", CAPE_OUTLET);
        add(PortRole::hydrogen, L"hydrogen", L"cathode product: wet hydrogen", CAPE_OUTLET);
        add(PortRole::caustic, L"caustic", L"sodium hydroxide solution at the configured strength", CAPE_OUTLET);
    } else {
        add(PortRole::feed, L"feed", L"make-up water (surplus passes through to the outlet on the water side)", CAPE_INLET);
        add(PortRole::hydrogen, L"hydrogen", L"cathode product: wet hydrogen (with steam for solid oxide cells)", CAPE_OUTLET);
        add(PortRole::oxygen, L"oxygen", L"anode product: wet oxygen", CAPE_OUTLET);
    }
}

void Unit::clear_parameters() {
    parameters_->clear();
    for (Parameter* p : parameter_list_) {
        p->detach();
        p->Release();
    }
    parameter_list_.clear();
}

// The parameter set, generated from the variable table of the current plant: its inputs (the
// drive input of every spec, temperature, pressures, ...) as input parameters, its parameters
// and outputs as results. The feed temperature comes from the inlet material, not a parameter.
void Unit::build_parameters(const std::wstring& plant_text, const std::wstring& spec) {
    clear_parameters();
    auto add = [&](Parameter* p) {
        parameter_list_.push_back(p);
        parameters_->add(p, static_cast<ICapeParameter*>(p));
    };
    Parameter::Spec plant;
    plant.kind = ParamKind::option;
    plant.default_text = kDefaultPlant;
    plant.restricted = false;
    add(new Parameter(this, L"plant",
                      L"plant description: the path of a plant JSON file, or the JSON text itself (starting with '{')",
                      plant));
    parameter_list_.back()->set_text(plant_text);
    Parameter::Spec drive;
    drive.kind = ParamKind::option;
    drive.default_text = L"current_density";
    drive.restricted = true;
    for (const char* s : kSpecs) drive.options.push_back(to_wide(s));
    add(new Parameter(this, L"spec", L"which drive input the solve reads: in.<spec>", drive));
    parameter_list_.back()->set_text(spec);

    int32_t count = 0;
    ely_block_variable_count(block_, &count);
    for (int32_t i = 0; i < count; ++i) {
        ely_variable_info info;
        std::memset(&info, 0, sizeof info);
        info.struct_size = sizeof info;
        if (ely_block_variable_info(block_, i, &info) != ELY_OK) continue;
        const std::string name = info.name;
        if (name == "in.feed_temperature") continue;
        const Metadata meta = metadata(info);
        const auto ends_with = [&](const char* tail) {
            const size_t n = std::strlen(tail);
            return name.size() >= n && name.compare(name.size() - n, n, tail) == 0;
        };
        Parameter::Spec ps;
        ps.variable = name;
        ps.kind = (meta.present ? meta.discrete : name.rfind("alarm.", 0) == 0) || ends_with(".cells") || ends_with(".stacks")
                      ? ParamKind::integer
                      : ParamKind::real;
        ps.mode = info.causality == ELY_CAUSALITY_INPUT || (info.causality == ELY_CAUSALITY_PARAMETER && meta.tunable)
                      ? CAPE_INPUT
                      : CAPE_OUTPUT;
        std::vector<double> dims;
        double scale = 1.0;
        if (si_unit(info.unit, dims, scale)) {
            ps.dimensionality = dims;
            ps.scale = scale;
        }
        double value = std::numeric_limits<double>::quiet_NaN();
        const bool readable = ely_block_get(block_, i, &value) == ELY_OK;
        if (ps.mode == CAPE_INPUT) {
            if (meta.present) {
                // The table's limits and start value (the plant description's, or its default).
                ps.lower = meta.min * ps.scale;
                ps.upper = meta.max * ps.scale;
                ps.lower_exclusive = meta.min_exclusive;
                ps.default_number = (std::isnan(meta.start) ? (readable ? value : 0.0) : meta.start) * ps.scale;
            } else {
                // Every input of the first table is a non-negative physical quantity (absolute
                // temperature and pressures, current, power, flows, hours): 0 is the lower bound.
                ps.lower = 0.0;
                ps.default_number = readable ? value * ps.scale : 0.0;
            }
        }
        std::wstring description = (meta.label.empty() ? L"" : to_wide(meta.label) + L": ") + to_wide(info.description) +
                                   L" [SI: " + to_wide(info.unit) + L"]";
        if (ps.scale != 1.0) description += L" (the variable table gives " + to_wide(info.unit) + L"; here in SI units)";
        auto* p = new Parameter(this, to_wide(name), description, ps);
        if (ps.mode == CAPE_OUTPUT && info.causality == ELY_CAUSALITY_PARAMETER && readable) p->set_number(value * ps.scale);
        add(p);
    }
}

Parameter* Unit::parameter(const std::string& name) const {
    const std::wstring w = to_wide(name);
    for (Parameter* p : parameter_list_)
        if (p->name() == w) return p;
    return nullptr;
}

Port* Unit::port(PortRole role) const {
    for (Port* p : port_list_)
        if (p->role() == role) return p;
    return nullptr;
}

std::wstring Unit::parameter_changing(Parameter* p, const std::wstring& text) {
    if (p->name() != L"plant") return L"";
    const std::string error = load_plant(text);
    if (!error.empty()) return to_wide(error);
    // The plant parameter itself stays; the others are generated anew from the new plant.
    Parameter* spec = parameter("spec");
    const std::wstring spec_text = spec ? spec->text() : L"current_density";
    p->AddRef();
    spec->AddRef();
    for (Parameter* q : parameter_list_)
        if (q != p && q != spec) q->detach();
    parameters_->clear();
    std::vector<Parameter*> old;
    old.swap(parameter_list_);
    build_parameters(text, spec_text);
    // Keep the caller's plant and spec objects in the collection (hosts may hold them).
    parameters_->clear();
    Parameter* fresh_plant = parameter_list_[0];
    Parameter* fresh_spec = parameter_list_[1];
    parameter_list_[0] = p;
    parameter_list_[1] = spec;
    for (Parameter* q : parameter_list_) parameters_->add(q, static_cast<ICapeParameter*>(q));
    fresh_plant->detach();
    fresh_plant->Release();
    fresh_spec->detach();
    fresh_spec->Release();
    for (Parameter* q : old) q->Release();  // plant and spec were AddRef'd above: they survive
    return L"";
}

// ---- ICapeUnit, ICapeUtilities ------------------------------------------------------------

STDMETHODIMP Unit::get_ports(IDispatch** ports) {
    if (!ports) return E_POINTER;
    return give(static_cast<ICapeCollection*>(ports_), reinterpret_cast<void**>(ports));
}

STDMETHODIMP Unit::get_ValStatus(CapeValidationStatus* status) {
    if (!status) return E_POINTER;
    *status = status_;
    return S_OK;
}

STDMETHODIMP Unit::Validate(BSTR* message, VARIANT_BOOL* valid) {
    ELYCO_TRY
    if (!message || !valid) return E_POINTER;
    std::wstring why;
    const bool ok = check(why);
    status_ = ok ? CAPE_VALID : CAPE_INVALID;
    validation_message_ = why;
    SysFreeString(*message);
    *message = SysAllocStringLen(why.data(), static_cast<UINT>(why.size()));
    *valid = ok ? VARIANT_TRUE : VARIANT_FALSE;
    return S_OK;
    ELYCO_CATCH(L"ICapeUnit", L"Validate")
}

STDMETHODIMP Unit::get_parameters(IDispatch** parameters) {
    if (!parameters) return E_POINTER;
    return give(static_cast<ICapeCollection*>(parameters_), reinterpret_cast<void**>(parameters));
}

STDMETHODIMP Unit::put_simulationContext(IDispatch* context) {
    if (context_) context_->Release();
    context_ = context;
    if (context_) context_->AddRef();
    return S_OK;
}

STDMETHODIMP Unit::Initialize() { return S_OK; }  // everything is set up by the constructor

STDMETHODIMP Unit::Terminate() {
    for (Port* p : port_list_) p->Disconnect();
    put_simulationContext(nullptr);
    return S_OK;
}

STDMETHODIMP Unit::Edit() {
    return fail(ECapeNoImplHR, L"ICapeUtilities", L"Edit",
                std::wstring(L"the elyblock unit has no editor of its own: set its parameters in the simulator"));
}

// Messages to the host's log (ICapeDiagnostic::LogMessage of the simulation context), called
// by name through IDispatch so that any context that offers it is used.
void Unit::log(const std::wstring& message) {
    if (!context_) return;
    DISPID id = 0;
    LPOLESTR name = const_cast<LPOLESTR>(L"LogMessage");
    if (FAILED(context_->GetIDsOfNames(IID_NULL, &name, 1, LOCALE_USER_DEFAULT, &id))) return;
    Bstr text(L"elyblock: " + message);
    VARIANT arg;
    arg.vt = VT_BSTR;
    arg.bstrVal = text.get();
    DISPPARAMS params = {&arg, nullptr, 1, 0};
    context_->Invoke(id, IID_NULL, LOCALE_USER_DEFAULT, DISPATCH_METHOD, &params, nullptr, nullptr, nullptr);
}

// ---- persistence --------------------------------------------------------------------------
// Format: "ELYCO\x01" then key/value records (uint32 length + UTF-8 bytes each): name,
// description, plant, spec, and "value:<parameter>" for every input parameter (%.17g text).

namespace {
const char kMagic[6] = {'E', 'L', 'Y', 'C', 'O', 1};

void put_string(std::vector<unsigned char>& out, const std::string& s) {
    const uint32_t n = static_cast<uint32_t>(s.size());
    for (int i = 0; i < 4; ++i) out.push_back(static_cast<unsigned char>(n >> (8 * i)));
    out.insert(out.end(), s.begin(), s.end());
}

bool read_exact(IStream* stream, void* buffer, ULONG size) {
    ULONG got = 0;
    return SUCCEEDED(stream->Read(buffer, size, &got)) && got == size;
}

bool get_string(IStream* stream, std::string& s) {
    unsigned char n4[4];
    if (!read_exact(stream, n4, 4)) return false;
    const uint32_t n = n4[0] | (n4[1] << 8) | (n4[2] << 16) | (static_cast<uint32_t>(n4[3]) << 24);
    if (n > (64u << 20)) return false;
    s.assign(n, '\0');
    return n == 0 || read_exact(stream, s.data(), n);
}
}  // namespace

std::vector<unsigned char> Unit::serialize() const {
    std::vector<unsigned char> out(kMagic, kMagic + sizeof kMagic);
    std::vector<std::pair<std::string, std::string>> records = {{"name", to_utf8(name_)},
                                                                {"description", to_utf8(description_)}};
    for (Parameter* p : parameter_list_) {
        if (p->spec().mode != CAPE_INPUT) continue;
        if (p->spec().kind == ParamKind::option) records.emplace_back(to_utf8(p->name()), to_utf8(p->text()));
        else records.emplace_back("value:" + to_utf8(p->name()), to_utf8(number_text(p->number())));
    }
    const uint32_t n = static_cast<uint32_t>(records.size());
    for (int i = 0; i < 4; ++i) out.push_back(static_cast<unsigned char>(n >> (8 * i)));
    for (const auto& r : records) {
        put_string(out, r.first);
        put_string(out, r.second);
    }
    return out;
}

STDMETHODIMP Unit::GetClassID(CLSID* clsid) {
    if (!clsid) return E_POINTER;
    *clsid = CLSID_ElyblockElectrolyzer;
    return S_OK;
}

STDMETHODIMP Unit::IsDirty() { return dirty_ ? S_OK : S_FALSE; }

STDMETHODIMP Unit::Save(IStream* stream, BOOL clear_dirty) {
    ELYCO_TRY
    if (!stream) return E_POINTER;
    const std::vector<unsigned char> data = serialize();
    ULONG written = 0;
    const HRESULT hr = stream->Write(data.data(), static_cast<ULONG>(data.size()), &written);
    if (FAILED(hr) || written != data.size())
        return fail(ECapePersistenceHR, L"IPersistStreamInit", L"Save", std::wstring(L"the stream did not take the unit's data"));
    if (clear_dirty) dirty_ = false;
    return S_OK;
    ELYCO_CATCH(L"IPersistStreamInit", L"Save")
}

STDMETHODIMP Unit::Load(IStream* stream) {
    ELYCO_TRY
    if (!stream) return E_POINTER;
    char magic[sizeof kMagic];
    unsigned char n4[4];
    if (!read_exact(stream, magic, sizeof magic) || std::memcmp(magic, kMagic, sizeof kMagic) != 0 || !read_exact(stream, n4, 4))
        return fail(ECapePersistenceHR, L"IPersistStreamInit", L"Load",
                    std::wstring(L"the stream does not hold a saved elyblock unit (format 1)"));
    const uint32_t n = n4[0] | (n4[1] << 8) | (n4[2] << 16) | (static_cast<uint32_t>(n4[3]) << 24);
    std::vector<std::pair<std::string, std::string>> records;
    for (uint32_t i = 0; i < n; ++i) {
        std::string key, value;
        if (!get_string(stream, key) || !get_string(stream, value))
            return fail(ECapePersistenceHR, L"IPersistStreamInit", L"Load", std::wstring(L"the saved unit is truncated"));
        records.emplace_back(key, value);
    }
    std::wstring plant = kDefaultPlant, spec = L"current_density";
    for (const auto& r : records) {
        if (r.first == "name") name_ = to_wide(r.second);
        else if (r.first == "description") description_ = to_wide(r.second);
        else if (r.first == "plant") plant = to_wide(r.second);
        else if (r.first == "spec") spec = to_wide(r.second);
    }
    // A plant file that moved must not lose the flowsheet: keep the saved text and report it.
    const std::string error = load_plant(plant);
    build_parameters(plant, spec);
    for (const auto& r : records) {
        if (r.first.rfind("value:", 0) != 0) continue;
        Parameter* p = parameter(r.first.substr(6));
        if (p && p->spec().mode == CAPE_INPUT) p->set_number(std::strtod(r.second.c_str(), nullptr));
    }
    status_ = CAPE_NOT_VALIDATED;
    dirty_ = false;
    if (!error.empty()) return fail(ECapePersistenceHR, L"IPersistStreamInit", L"Load", error);
    return S_OK;
    ELYCO_CATCH(L"IPersistStreamInit", L"Load")
}

STDMETHODIMP Unit::GetSizeMax(ULARGE_INTEGER* size) {
    ELYCO_TRY
    if (!size) return E_POINTER;
    size->QuadPart = serialize().size();
    return S_OK;
    ELYCO_CATCH(L"IPersistStreamInit", L"GetSizeMax")
}

STDMETHODIMP Unit::InitNew() {
    ELYCO_TRY
    const std::string error = load_plant(kDefaultPlant);
    if (!error.empty()) return fail(ECapeFailedInitialisationHR, L"IPersistStreamInit", L"InitNew", error);
    build_parameters(kDefaultPlant, L"current_density");
    status_ = CAPE_NOT_VALIDATED;
    dirty_ = false;
    return S_OK;
    ELYCO_CATCH(L"IPersistStreamInit", L"InitNew")
}

}  // namespace elyco
