// Quantities with units through the C interface: the plant description's unit parser, so that
// every host reads "2 A/cm2" as the config does.
#include <string>

#include "base/excerpt.hpp"
#include "config/units.hpp"
#include "elyblock/elyblock.h"
#include "guard.hpp"

extern "C" {

ELY_API int32_t ely_parse_quantity(const char* text, const char* unit, double* value) {
    return ely::capi::guard([&] {
        ely::capi::require_pointer(text, "text");
        ely::capi::require_pointer(unit, "unit");
        ely::capi::require_pointer(value, "value");
        try {
            // The target unit must be a plain factor: a reading in degC has no single SI value.
            bool has_offset = false;
            try {
                has_offset = ely::parse_unit(unit).offset != 0;
            } catch (const ely::Error&) {
                // A unit outside the grammar takes bare numbers only: parse_quantity says so.
            }
            if (has_offset)
                throw ely::Error(ely::ErrorKind::invalid_argument,
                                 "unit '" + ely::excerpt(unit, ely::kMaxUnitLength) +
                                     "' has an offset; give a unit without one (K, not degC)");
            *value = ely::parse_quantity(text, unit);
        } catch (const ely::Error& e) {
            if (e.kind() != ely::ErrorKind::config) throw;
            throw ely::Error(ely::ErrorKind::invalid_argument, e.what());
        }
        return ELY_OK;
    });
}

}  // extern "C"
