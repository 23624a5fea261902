// The COM in-process server: DllGetClassObject, DllCanUnloadNow, DllRegisterServer and
// DllUnregisterServer, and the type library embedded in this DLL (resource TYPELIB 1).
//
// Registration (Methods & Tools Integrated Guidelines of CAPE-OPEN) under HKEY_CLASSES_ROOT:
//   CLSID\{clsid}                    "elyblock electrolyzer"
//     InprocServer32                 this DLL, ThreadingModel Apartment
//     ProgID, VersionIndependentProgID
//     Implemented Categories\{CAPE-OPEN component}, {unit operation}, {consumes thermodynamics},
//                            {supports thermodynamics 1.1}
//     CapeDescription                Name, Description, CapeVersion, ComponentVersion, VendorURL,
//                                    HelpURL, About
//   elyblock.Electrolyzer.1          CLSID
//   elyblock.Electrolyzer            CLSID, CurVer
// Unregistration deletes exactly these three keys. The category descriptions under
// "Component Categories" are shared by every CAPE-OPEN component and are left alone.
#include <olectl.h>

#include <mutex>

#include "unit.hpp"

namespace elyco {

namespace {

HMODULE g_module = nullptr;
std::atomic<long> g_locks{0};

// CAPE-OPEN component categories (Methods & Tools Integrated Guidelines).
const wchar_t* const kCategories[] = {
    L"{678C09A1-7D66-11D2-A67D-00105A42887F}",  // CAPE-OPEN component
    L"{678C09A5-7D66-11D2-A67D-00105A42887F}",  // CAPE-OPEN unit operation
    L"{4150C28A-EE06-403F-A871-87AFEC38A249}",  // consumes thermodynamics
    L"{4667023A-5A8E-4CCA-AB6D-9D78C5112FED}",  // supports thermodynamics 1.1
};

std::wstring module_path() {
    std::wstring path(MAX_PATH, L'\0');
    for (;;) {
        const DWORD n = GetModuleFileNameW(g_module, path.data(), static_cast<DWORD>(path.size()));
        if (n == 0) return L"";
        if (n < path.size()) {
            path.resize(n);
            return path;
        }
        path.resize(path.size() * 2);
    }
}

std::wstring clsid_text() {
    wchar_t buf[64];
    StringFromGUID2(CLSID_ElyblockElectrolyzer, buf, 64);
    return buf;
}

LONG set_value(HKEY key, const wchar_t* name, const std::wstring& value) {
    return RegSetValueExW(key, name, 0, REG_SZ, reinterpret_cast<const BYTE*>(value.c_str()),
                          static_cast<DWORD>((value.size() + 1) * sizeof(wchar_t)));
}

// Creates HKCR\<path> and sets its values (name "" is the default value).
HRESULT write_key(const std::wstring& path, std::initializer_list<std::pair<const wchar_t*, std::wstring>> values) {
    HKEY key = nullptr;
    if (RegCreateKeyExW(HKEY_CLASSES_ROOT, path.c_str(), 0, nullptr, 0, KEY_WRITE, nullptr, &key, nullptr) != ERROR_SUCCESS)
        return SELFREG_E_CLASS;
    LONG rc = ERROR_SUCCESS;
    for (const auto& v : values)
        if (rc == ERROR_SUCCESS) rc = set_value(key, v.first[0] ? v.first : nullptr, v.second);
    RegCloseKey(key);
    return rc == ERROR_SUCCESS ? S_OK : SELFREG_E_CLASS;
}

std::once_flag g_library_once;
ITypeLib* g_library = nullptr;

class ClassFactory : public IClassFactory {
public:
    STDMETHODIMP QueryInterface(REFIID iid, void** out) override {
        if (!out) return E_POINTER;
        if (iid == IID_IUnknown || iid == IID_IClassFactory) {
            *out = static_cast<IClassFactory*>(this);
            AddRef();
            return S_OK;
        }
        *out = nullptr;
        return E_NOINTERFACE;
    }
    STDMETHODIMP_(ULONG) AddRef() override { return 2; }  // a static object
    STDMETHODIMP_(ULONG) Release() override { return 1; }
    STDMETHODIMP CreateInstance(IUnknown* outer, REFIID iid, void** out) override {
        if (!out) return E_POINTER;
        *out = nullptr;
        if (outer) return CLASS_E_NOAGGREGATION;
        Unit* unit = nullptr;
        try {
            unit = new Unit();
        } catch (...) {
            return E_OUTOFMEMORY;
        }
        const HRESULT hr = unit->QueryInterface(iid, out);
        unit->Release();
        return hr;
    }
    STDMETHODIMP LockServer(BOOL lock) override {
        if (lock) ++g_locks;
        else --g_locks;
        return S_OK;
    }
};

ClassFactory g_factory;

}  // namespace

HRESULT type_info(REFIID iid, ITypeInfo** out) {
    std::call_once(g_library_once, [] {
        const std::wstring path = module_path();
        if (FAILED(LoadTypeLibEx(path.c_str(), REGKIND_NONE, &g_library))) g_library = nullptr;
    });
    if (!g_library) return TYPE_E_CANTLOADLIBRARY;
    return g_library->GetTypeInfoOfGuid(iid, out);
}

}  // namespace elyco

using namespace elyco;

extern "C" {

BOOL WINAPI DllMain(HINSTANCE instance, DWORD reason, LPVOID) {
    if (reason == DLL_PROCESS_ATTACH) {
        g_module = instance;
        DisableThreadLibraryCalls(instance);
    }
    return TRUE;
}

HRESULT STDAPICALLTYPE DllGetClassObject(REFCLSID clsid, REFIID iid, void** out) {
    if (!out) return E_POINTER;
    *out = nullptr;
    if (clsid != CLSID_ElyblockElectrolyzer) return CLASS_E_CLASSNOTAVAILABLE;
    if (ely_abi_version() != ELY_ABI_VERSION) return CLASS_E_CLASSNOTAVAILABLE;  // elyblock.dll of another ABI
    return g_factory.QueryInterface(iid, out);
}

HRESULT STDAPICALLTYPE DllCanUnloadNow() { return (g_objects == 0 && g_locks == 0) ? S_OK : S_FALSE; }

HRESULT STDAPICALLTYPE DllUnregisterServer() {
    const std::wstring clsid = L"CLSID\\" + clsid_text();
    for (const std::wstring& key : {clsid, std::wstring(kProgId), std::wstring(kVersionIndependentProgId)}) {
        const LONG rc = RegDeleteTreeW(HKEY_CLASSES_ROOT, key.c_str());
        if (rc != ERROR_SUCCESS && rc != ERROR_FILE_NOT_FOUND) return SELFREG_E_CLASS;
        RegDeleteKeyW(HKEY_CLASSES_ROOT, key.c_str());
    }
    return S_OK;
}

HRESULT STDAPICALLTYPE DllRegisterServer() {
    const std::wstring path = module_path();
    if (path.empty()) return SELFREG_E_CLASS;
    const std::wstring id = clsid_text();
    const std::wstring clsid = L"CLSID\\" + id;
    HRESULT hr = S_OK;
    auto step = [&](HRESULT r) {
        if (SUCCEEDED(hr)) hr = r;
    };
    step(write_key(clsid, {{L"", kUnitName}}));
    step(write_key(clsid + L"\\InprocServer32", {{L"", path}, {L"ThreadingModel", L"Apartment"}}));
    step(write_key(clsid + L"\\ProgID", {{L"", kProgId}}));
    step(write_key(clsid + L"\\VersionIndependentProgID", {{L"", kVersionIndependentProgId}}));
    for (const wchar_t* category : kCategories) step(write_key(clsid + L"\\Implemented Categories\\" + category, {}));
    step(write_key(clsid + L"\\CapeDescription",
                   {{L"Name", kUnitName},
                    {L"Description", kUnitDescription},
                    {L"CapeVersion", L"1.1"},
                    {L"ComponentVersion", to_wide(ely_version())},
                    {L"VendorURL", L""},
                    {L"HelpURL", L""},
                    {L"About", L"elyblock " + to_wide(ely_version()) + L": a client of the elyblock C interface (elyblock.dll)"}}));
    step(write_key(kProgId, {{L"", kUnitName}}));
    step(write_key(std::wstring(kProgId) + L"\\CLSID", {{L"", id}}));
    step(write_key(kVersionIndependentProgId, {{L"", kUnitName}}));
    step(write_key(std::wstring(kVersionIndependentProgId) + L"\\CLSID", {{L"", id}}));
    step(write_key(std::wstring(kVersionIndependentProgId) + L"\\CurVer", {{L"", kProgId}}));
    if (FAILED(hr)) DllUnregisterServer();
    return hr;
}

}  // extern "C"
