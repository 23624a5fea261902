#pragma once
// The elyblock unit operation for CAPE-OPEN hosts: the unit, its ports, its parameters and
// the collections that hold them. A client of the public C interface only.
#include <limits>
#include <string>
#include <vector>

#include "com_base.hpp"
#include "elyblock/elyblock.h"

namespace elyco {

class Unit;

// One of the drive inputs (in.current_density, in.current, in.power, in.hydrogen_rate, in.voltage).
bool is_drive_input(const std::string& variable);

// ProgIDs of our own (the class id is the coclass of capeopen.idl: CLSID_ElyblockElectrolyzer).
extern const wchar_t* const kProgId;
extern const wchar_t* const kVersionIndependentProgId;
extern const wchar_t* const kUnitName;
extern const wchar_t* const kUnitDescription;

// An ordered, read-only collection of CAPE-OPEN objects (ports, parameters), by 1-based index
// or by name (case-insensitive).
class Collection : public CapeObject, public DispatchOf<ICapeCollection> {
public:
    Collection(std::wstring name, std::wstring description) : CapeObject(std::move(name), std::move(description), false) {}
    ~Collection() override { clear(); }
    ELYCO_IUNKNOWN
    STDMETHODIMP Item(VARIANT id, IDispatch** item) override;
    STDMETHODIMP Count(long* count) override;
    void add(CapeObject* item, IDispatch* as_dispatch);  // AddRefs
    void clear();

private:
    std::vector<std::pair<CapeObject*, IDispatch*>> items_;
};

// What a port carries (decides the compounds it gets after a calculation).
enum class PortRole { feed, hydrogen, oxygen, chlorine, caustic };

class Port : public CapeObject, public DispatchOf<ICapeUnitPort> {
public:
    Port(Unit* unit, PortRole role, std::wstring name, std::wstring description, CapePortDirection direction)
        : CapeObject(std::move(name), std::move(description), false), unit_(unit), role_(role), direction_(direction) {}
    ~Port() override { Disconnect(); }
    ELYCO_IUNKNOWN
    STDMETHODIMP get_portType(CapePortType* type) override;
    STDMETHODIMP get_direction(CapePortDirection* direction) override;
    STDMETHODIMP get_connectedObject(IDispatch** object) override;
    STDMETHODIMP Connect(IDispatch* object) override;
    STDMETHODIMP Disconnect() override;

    PortRole role() const { return role_; }
    CapePortDirection port_direction() const { return direction_; }
    ICapeThermoMaterial* material() const { return material_; }
    void detach() { unit_ = nullptr; }

private:
    Unit* unit_;  // not owned: the unit outlives its ports or detaches them
    PortRole role_;
    CapePortDirection direction_;
    IDispatch* connected_ = nullptr;
    ICapeThermoMaterial* material_ = nullptr;
};

enum class ParamKind { real, integer, option };

// One CAPE-OPEN parameter with its specification (real, integer or option). Real values are
// SI; the variable table's unit is converted with `scale` (value_SI = value_table * scale).
class Parameter : public CapeObject,
                  public DispatchOf<ICapeParameter>,
                  public DispatchOf<ICapeParameterSpec>,
                  public DispatchOf<ICapeRealParameterSpec>,
                  public DispatchOf<ICapeIntegerParameterSpec>,
                  public DispatchOf<ICapeOptionParameterSpec> {
public:
    struct Spec {
        ParamKind kind = ParamKind::real;
        CapeParamMode mode = CAPE_INPUT;
        double lower = std::numeric_limits<double>::quiet_NaN();
        double upper = std::numeric_limits<double>::quiet_NaN();
        bool lower_exclusive = false;  // the value must be above `lower`
        double default_number = std::numeric_limits<double>::quiet_NaN();
        std::wstring default_text;
        std::vector<std::wstring> options;
        bool restricted = false;
        std::vector<double> dimensionality;  // m, kg, s, A, K, mol, cd, rad
        std::string variable;                // the variable of the table it maps to ("" for plant and spec)
        double scale = 1.0;                  // table unit -> SI
    };
    Parameter(Unit* unit, std::wstring name, std::wstring description, Spec spec);
    ELYCO_IUNKNOWN
    // ICapeParameter
    STDMETHODIMP get_Specification(IDispatch** spec) override;
    STDMETHODIMP get_value(VARIANT* value) override;
    STDMETHODIMP put_value(VARIANT value) override;
    STDMETHODIMP get_ValStatus(CapeValidationStatus* status) override;
    STDMETHODIMP get_Mode(CapeParamMode* mode) override;
    STDMETHODIMP put_Mode(CapeParamMode mode) override;
    STDMETHODIMP Validate(BSTR* message, VARIANT_BOOL* ok) override;
    STDMETHODIMP Reset() override;
    // ICapeParameterSpec
    STDMETHODIMP get_Type(CapeParamType* type) override;
    STDMETHODIMP get_Dimensionality(VARIANT* dimensionality) override;
    // ICapeRealParameterSpec
    STDMETHODIMP get_DefaultValue(double* value) override;
    STDMETHODIMP get_LowerBound(double* value) override;
    STDMETHODIMP get_UpperBound(double* value) override;
    STDMETHODIMP Validate(double value, BSTR* message, VARIANT_BOOL* ok) override;
    // ICapeIntegerParameterSpec
    STDMETHODIMP get_DefaultValue(long* value) override;
    STDMETHODIMP get_LowerBound(long* value) override;
    STDMETHODIMP get_UpperBound(long* value) override;
    STDMETHODIMP Validate(long value, BSTR* message, VARIANT_BOOL* ok) override;
    // ICapeOptionParameterSpec
    STDMETHODIMP get_DefaultValue(BSTR* value) override;
    STDMETHODIMP get_OptionList(VARIANT* options) override;
    STDMETHODIMP get_RestrictedToList(VARIANT_BOOL* restricted) override;
    STDMETHODIMP Validate(BSTR value, BSTR* message, VARIANT_BOOL* ok) override;

    const Spec& spec() const { return spec_; }
    double number() const { return number_; }
    const std::wstring& text() const { return text_; }
    bool has_value() const { return has_value_; }
    // Sets the value without the checks of put_value (results, restored state).
    void set_number(double v) {
        number_ = v;
        has_value_ = true;
    }
    void set_text(std::wstring t) {
        text_ = std::move(t);
        has_value_ = true;
    }
    void clear_value() { has_value_ = false; }
    void detach() { unit_ = nullptr; }
    // Checks a value; "" when it is acceptable.
    std::wstring check_number(double v) const;
    std::wstring check_text(const std::wstring& t) const;

private:
    Unit* unit_;
    Spec spec_;
    double number_ = std::numeric_limits<double>::quiet_NaN();
    std::wstring text_;
    bool has_value_ = false;
};

class Unit : public CapeObject,
             public DispatchOf<ICapeUnit>,
             public DispatchOf<ICapeUtilities>,
             public IPersistStreamInit {
public:
    Unit();
    ~Unit() override;
    ELYCO_IUNKNOWN
    // ICapeUnit
    STDMETHODIMP get_ports(IDispatch** ports) override;
    STDMETHODIMP get_ValStatus(CapeValidationStatus* status) override;
    STDMETHODIMP Calculate() override;
    STDMETHODIMP Validate(BSTR* message, VARIANT_BOOL* valid) override;
    // ICapeUtilities
    STDMETHODIMP get_parameters(IDispatch** parameters) override;
    STDMETHODIMP put_simulationContext(IDispatch* context) override;
    STDMETHODIMP Initialize() override;
    STDMETHODIMP Terminate() override;
    STDMETHODIMP Edit() override;
    // IPersistStreamInit (its first methods are those of IPersistStream, which it also answers)
    STDMETHODIMP GetClassID(CLSID* clsid) override;
    STDMETHODIMP IsDirty() override;
    STDMETHODIMP Load(IStream* stream) override;
    STDMETHODIMP Save(IStream* stream, BOOL clear_dirty) override;
    STDMETHODIMP GetSizeMax(ULARGE_INTEGER* size) override;
    STDMETHODIMP InitNew() override;

    // From ports and parameters.
    void invalidate() {
        status_ = CAPE_NOT_VALIDATED;
        dirty_ = true;
    }
    // A new value for an input parameter: "" to accept, else the reason to refuse it.
    std::wstring parameter_changing(Parameter* p, const std::wstring& text);

private:
    void on_renamed() override { dirty_ = true; }
    std::string load_plant(const std::wstring& plant);  // "" on success, else the library's message
    void build_ports(bool brine);
    void build_parameters(const std::wstring& plant_text, const std::wstring& spec);
    void clear_parameters();
    bool check(std::wstring& message);                   // validation; message says why not
    std::string apply_inputs(ely_block* b, double feed_temperature);  // "" or the library's message
    Parameter* parameter(const std::string& name) const;
    Port* port(PortRole role) const;
    void log(const std::wstring& message);
    std::vector<unsigned char> serialize() const;

    ely_block* block_ = nullptr;
    bool brine_ = false;
    Collection* ports_;
    Collection* parameters_;
    std::vector<Port*> port_list_;
    std::vector<Parameter*> parameter_list_;
    CapeValidationStatus status_ = CAPE_NOT_VALIDATED;
    std::wstring validation_message_;
    IDispatch* context_ = nullptr;
    bool dirty_ = false;
    friend class Calculation;
};

}  // namespace elyco
