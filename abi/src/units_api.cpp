// Quantities with units through the C interface: both calls are the plant description's unit
// code (lib/config/units), so every host reads "2 A/cm2" as the config does. ely_parse_quantity
// reads text that carries its unit; ely_convert_unit converts a number whose unit is given apart.
#include "config/units.hpp"
#include "elyblock/elyblock.h"
#include "guard.hpp"

namespace {

// Runs a unit call: its unit errors are config errors inside the model; here the text and the
// units are arguments, so they are reported as ELY_ERR_INVALID_ARGUMENT.
template <class Convert>
int32_t unit_call(Convert convert) {
    return ely::capi::guard([&] {
        try {
            convert();
        } catch (const ely::Error& e) {
            if (e.kind() != ely::ErrorKind::config) throw;
            throw ely::Error(ely::ErrorKind::invalid_argument, e.what());
        }
        return ELY_OK;
    });
}

}  // namespace

extern "C" {

ELY_API int32_t ely_parse_quantity(const char* text, const char* unit, double* value) {
    return unit_call([&] {
        ely::capi::require_pointer(text, "text");
        ely::capi::require_pointer(unit, "unit");
        ely::capi::require_pointer(value, "value");
        *value = ely::parse_quantity(text, unit);
    });
}

ELY_API int32_t ely_convert_unit(double value, const char* from_unit, const char* to_unit, double* result) {
    return unit_call([&] {
        ely::capi::require_pointer(from_unit, "from_unit");
        ely::capi::require_pointer(to_unit, "to_unit");
        ely::capi::require_pointer(result, "result");
        *result = ely::convert_unit(value, from_unit, to_unit);
    });
}

}  // extern "C"
