// COM plumbing shared by the CAPE-OPEN unit and its test client (see com_base.hpp).
#include "com_base.hpp"

#include <cmath>

namespace elyco {

std::atomic<long> g_objects{0};

std::wstring to_wide(const std::string& utf8) {
    if (utf8.empty()) return {};
    const int n = MultiByteToWideChar(CP_UTF8, 0, utf8.data(), static_cast<int>(utf8.size()), nullptr, 0);
    std::wstring out(static_cast<size_t>(n), L'\0');
    MultiByteToWideChar(CP_UTF8, 0, utf8.data(), static_cast<int>(utf8.size()), out.data(), n);
    return out;
}

std::string to_utf8(const wchar_t* text, size_t length) {
    if (length == 0) return {};
    const int n = WideCharToMultiByte(CP_UTF8, 0, text, static_cast<int>(length), nullptr, 0, nullptr, nullptr);
    std::string out(static_cast<size_t>(n), '\0');
    WideCharToMultiByte(CP_UTF8, 0, text, static_cast<int>(length), out.data(), n, nullptr, nullptr);
    return out;
}

namespace {
template <class T, class Put>
HRESULT make_array(VARTYPE vt, const std::vector<T>& items, VARIANT* out, Put put) {
    if (!out) return E_POINTER;
    VariantInit(out);
    SAFEARRAY* a = SafeArrayCreateVector(vt, 0, static_cast<ULONG>(items.size()));
    if (!a) return E_OUTOFMEMORY;
    for (LONG i = 0; i < static_cast<LONG>(items.size()); ++i) {
        const HRESULT hr = put(a, i, items[static_cast<size_t>(i)]);
        if (FAILED(hr)) {
            SafeArrayDestroy(a);
            return hr;
        }
    }
    out->vt = static_cast<VARTYPE>(VT_ARRAY | vt);
    out->parray = a;
    return S_OK;
}

// Elements of a one-dimensional array VARIANT (or a scalar), each converted with VariantChangeType.
template <class T>
bool read_array(const VARIANT& v, VARTYPE vt, std::vector<T>& out, T (*get)(const VARIANT&)) {
    out.clear();
    const VARIANT* src = &v;
    if (v.vt == (VT_BYREF | VT_VARIANT) && v.pvarVal) src = v.pvarVal;
    if (!(src->vt & VT_ARRAY)) {
        if (src->vt == VT_EMPTY || src->vt == VT_NULL) return true;
        VARIANT c;
        VariantInit(&c);
        if (FAILED(VariantChangeType(&c, const_cast<VARIANT*>(src), 0, vt))) return false;
        out.push_back(get(c));
        VariantClear(&c);
        return true;
    }
    SAFEARRAY* a = (src->vt & VT_BYREF) ? (src->pparray ? *src->pparray : nullptr) : src->parray;
    if (!a) return true;
    if (SafeArrayGetDim(a) != 1) return false;
    LONG lo = 0, hi = -1;
    SafeArrayGetLBound(a, 1, &lo);
    SafeArrayGetUBound(a, 1, &hi);
    const VARTYPE element = static_cast<VARTYPE>(src->vt & VT_TYPEMASK);
    for (LONG i = lo; i <= hi; ++i) {
        VARIANT e, c;
        VariantInit(&e);
        VariantInit(&c);
        HRESULT hr;
        if (element == VT_VARIANT) {
            hr = SafeArrayGetElement(a, &i, &e);
        } else {
            e.vt = element;
            hr = SafeArrayGetElement(a, &i, &e.byref);  // the element's bytes land in the union
        }
        if (SUCCEEDED(hr)) hr = VariantChangeType(&c, &e, 0, vt);
        if (SUCCEEDED(hr)) out.push_back(get(c));
        VariantClear(&e);
        VariantClear(&c);
        if (FAILED(hr)) return false;
    }
    return true;
}
}  // namespace

HRESULT make_string_array(const std::vector<std::wstring>& items, VARIANT* out) {
    return make_array(VT_BSTR, items, out, [](SAFEARRAY* a, LONG i, const std::wstring& s) {
        BSTR b = SysAllocStringLen(s.data(), static_cast<UINT>(s.size()));
        const HRESULT hr = SafeArrayPutElement(a, &i, b);  // copies the string
        SysFreeString(b);
        return hr;
    });
}

HRESULT make_double_array(const std::vector<double>& items, VARIANT* out) {
    return make_array(VT_R8, items, out, [](SAFEARRAY* a, LONG i, double d) { return SafeArrayPutElement(a, &i, &d); });
}

HRESULT make_long_array(const std::vector<long>& items, VARIANT* out) {
    return make_array(VT_I4, items, out, [](SAFEARRAY* a, LONG i, long l) { return SafeArrayPutElement(a, &i, &l); });
}

bool read_string_array(const VARIANT& v, std::vector<std::wstring>& out) {
    return read_array<std::wstring>(v, VT_BSTR, out, [](const VARIANT& c) { return from_bstr(c.bstrVal); });
}

bool read_double_array(const VARIANT& v, std::vector<double>& out) {
    return read_array<double>(v, VT_R8, out, [](const VARIANT& c) { return c.dblVal; });
}

// ---- CapeObject ----------------------------------------------------------------------------

CapeObject::CapeObject(std::wstring name, std::wstring description, bool renamable)
    : name_(std::move(name)), description_(std::move(description)), renamable_(renamable) {
    ++g_objects;
}

CapeObject::~CapeObject() { --g_objects; }

namespace {
HRESULT out_string(const std::wstring& s, BSTR* out) {
    if (!out) return E_POINTER;
    *out = SysAllocStringLen(s.data(), static_cast<UINT>(s.size()));
    return *out ? S_OK : E_OUTOFMEMORY;
}

const wchar_t* error_name(HRESULT hr) {
    switch (hr) {
        case ECapeDataHR: return L"ECapeData";
        case ECapeBadCOParameterHR: return L"ECapeBadCOParameter";
        case ECapeBadArgumentHR: return L"ECapeBadArgument";
        case ECapeInvalidArgumentHR: return L"ECapeInvalidArgument";
        case ECapeOutOfBoundsHR: return L"ECapeOutOfBounds";
        case ECapeImplementationHR: return L"ECapeImplementation";
        case ECapeNoImplHR: return L"ECapeNoImpl";
        case ECapeComputationHR: return L"ECapeComputation";
        case ECapeOutOfResourcesHR: return L"ECapeOutOfResources";
        case ECapeFailedInitialisationHR: return L"ECapeFailedInitialisation";
        case ECapeSolvingErrorHR: return L"ECapeSolvingError";
        case ECapeBadInvOrderHR: return L"ECapeBadInvOrder";
        case ECapeInvalidOperationHR: return L"ECapeInvalidOperation";
        case ECapePersistenceHR: return L"ECapePersistence";
        default: return L"ECapeUnknown";
    }
}
}  // namespace

STDMETHODIMP CapeObject::get_ComponentName(BSTR* name) { return out_string(name_, name); }

STDMETHODIMP CapeObject::put_ComponentName(BSTR name) {
    if (!renamable_)
        return fail(ECapeInvalidOperationHR, L"ICapeIdentification", L"put_ComponentName",
                    L"the name of '" + name_ + L"' is fixed: hosts find it by this name");
    const std::wstring n = from_bstr(name);
    if (n.empty()) return fail(ECapeInvalidArgumentHR, L"ICapeIdentification", L"put_ComponentName", std::wstring(L"a name cannot be empty"));
    name_ = n;
    on_renamed();
    return S_OK;
}

STDMETHODIMP CapeObject::get_ComponentDescription(BSTR* description) { return out_string(description_, description); }

STDMETHODIMP CapeObject::put_ComponentDescription(BSTR description) {
    if (!renamable_)
        return fail(ECapeInvalidOperationHR, L"ICapeIdentification", L"put_ComponentDescription",
                    L"the description of '" + name_ + L"' is fixed");
    description_ = from_bstr(description);
    on_renamed();
    return S_OK;
}

STDMETHODIMP CapeObject::get_name(BSTR* name) { return out_string(error_name(error_hr_), name); }
STDMETHODIMP CapeObject::get_code(long* code) {
    if (!code) return E_POINTER;
    *code = static_cast<long>(error_hr_);
    return S_OK;
}
STDMETHODIMP CapeObject::get_description(BSTR* description) { return out_string(error_description_, description); }
STDMETHODIMP CapeObject::get_scope(BSTR* scope) { return out_string(error_scope_, scope); }
STDMETHODIMP CapeObject::get_interfaceName(BSTR* name) { return out_string(error_interface_, name); }
STDMETHODIMP CapeObject::get_operation(BSTR* operation) { return out_string(error_scope_, operation); }
STDMETHODIMP CapeObject::get_moreInfo(BSTR* info) {
    return out_string(L"elyblock CAPE-OPEN unit: see README.md, section 'Flowsheet simulators (CAPE-OPEN)'", info);
}

HRESULT CapeObject::fail(HRESULT hr, const wchar_t* interface_name, const wchar_t* scope, const std::wstring& message) {
    try {
        error_hr_ = hr;
        error_description_ = message;
        error_interface_ = interface_name;
        error_scope_ = scope;
    } catch (...) {
        // out of memory while copying: the HRESULT still tells the kind of error
    }
    ICreateErrorInfo* create = nullptr;
    if (SUCCEEDED(CreateErrorInfo(&create))) {
        create->SetDescription(const_cast<LPOLESTR>(error_description_.c_str()));
        create->SetSource(const_cast<LPOLESTR>(L"elyblock CAPE-OPEN unit"));
        IErrorInfo* info = nullptr;
        if (SUCCEEDED(create->QueryInterface(IID_IErrorInfo, reinterpret_cast<void**>(&info)))) {
            SetErrorInfo(0, info);
            info->Release();
        }
        create->Release();
    }
    return hr;
}

bool CapeObject::query_base(REFIID iid, void** out) {
    if (iid == __uuidof(ICapeIdentification)) return give(static_cast<ICapeIdentification*>(this), out) == S_OK;
    if (iid == __uuidof(ECapeRoot)) return give(static_cast<ECapeRoot*>(this), out) == S_OK;
    if (iid == __uuidof(ECapeUser)) return give(static_cast<ECapeUser*>(this), out) == S_OK;
    if (iid == __uuidof(ECapeUnknown)) return give(static_cast<ECapeUnknown*>(this), out) == S_OK;
    if (iid == IID_ISupportErrorInfo) return give(static_cast<ISupportErrorInfo*>(this), out) == S_OK;
    // The method-less category interface of the last error answers with the same vtable.
    const struct {
        HRESULT hr;
        const IID* iid;
    } categories[] = {{ECapeDataHR, &__uuidof(ECapeData)},
                      {ECapeImplementationHR, &__uuidof(ECapeImplementation)},
                      {ECapeNoImplHR, &__uuidof(ECapeNoImpl)},
                      {ECapeComputationHR, &__uuidof(ECapeComputation)},
                      {ECapeSolvingErrorHR, &__uuidof(ECapeSolvingError)},
                      {ECapeInvalidOperationHR, &__uuidof(ECapeInvalidOperation)}};
    for (const auto& c : categories)
        if (error_hr_ == c.hr && iid == *c.iid) return give(static_cast<ECapeUnknown*>(this), out) == S_OK;
    return false;
}

}  // namespace elyco
