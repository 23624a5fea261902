// Library-wide calls of the C interface: versions, status texts, last error, water.
#include <algorithm>
#include <cmath>
#include <cstring>
#include <fmt/format.h>
#include <string>

#include "elyblock/elyblock.h"
#include "elyblock_version.h"
#include "guard.hpp"
#include "thermo/reaction.hpp"
#include "thermo/water.hpp"

namespace ely::capi {
namespace {
// A fixed-size buffer, not a thread_local std::string: a thread-local object with a destructor
// hangs a process whose thread exits after the host unloaded the library (seen with the Windows
// DLL under Wine; spreadsheets and simulators load and unload DLLs freely).
constexpr std::size_t kMaxMessageBytes = 4096;
constexpr char kCutNote[] = " \xE2\x80\xA6 (message cut at 4096 bytes)";
thread_local char t_last_error[kMaxMessageBytes + sizeof kCutNote];
}  // namespace

void set_last_error(const std::string& message) noexcept {
    // ely_last_error() hands out a C string: an embedded NUL would cut the message there, so it
    // is written as \x00. The length is bounded whatever user text a message quotes; a cut
    // falls on a UTF-8 character boundary.
    char* const buffer = t_last_error;  // one look-up of the thread's buffer (a call in a shared library)
    // The usual message: no NUL, within the bound: copied whole.
    if (message.size() <= kMaxMessageBytes && std::memchr(message.data(), '\0', message.size()) == nullptr) {
        std::memcpy(buffer, message.data(), message.size());
        buffer[message.size()] = '\0';
        return;
    }
    std::size_t out = 0, i = 0;
    for (; i < message.size(); ++i) {
        const bool nul = message[i] == '\0';
        if (out + (nul ? 4 : 1) > kMaxMessageBytes) break;
        if (nul) {
            std::memcpy(buffer + out, "\\x00", 4);
            out += 4;
        } else {
            buffer[out++] = message[i];
        }
    }
    if (i < message.size()) {
        while (out > 0 && i > 0 && (static_cast<unsigned char>(message[i]) & 0xC0) == 0x80) {
            --out;
            --i;
        }
        std::memcpy(buffer + out, kCutNote, sizeof kCutNote - 1);
        out += sizeof kCutNote - 1;
    }
    buffer[out] = '\0';
}

void clear_last_error() noexcept { t_last_error[0] = '\0'; }

int32_t status_of(ErrorKind kind) noexcept {
    switch (kind) {
        case ErrorKind::invalid_argument: return ELY_ERR_INVALID_ARGUMENT;
        case ErrorKind::out_of_range: return ELY_ERR_OUT_OF_RANGE;
        case ErrorKind::config: return ELY_ERR_CONFIG;
        case ErrorKind::infeasible: return ELY_ERR_INFEASIBLE;
        case ErrorKind::no_convergence: return ELY_ERR_NO_CONVERGENCE;
        case ErrorKind::unknown_name: return ELY_ERR_UNKNOWN_NAME;
        case ErrorKind::wrong_state: return ELY_ERR_WRONG_STATE;
        case ErrorKind::io: return ELY_ERR_IO;
        case ErrorKind::buffer_too_small: return ELY_ERR_BUFFER_TOO_SMALL;
        case ErrorKind::cancelled: return ELY_ERR_CANCELLED;
        case ErrorKind::internal: return ELY_ERR_INTERNAL;
    }
    return ELY_ERR_INTERNAL;
}

}  // namespace ely::capi

extern "C" {

ELY_API int32_t ely_abi_version(void) { return ELY_ABI_VERSION; }

ELY_API const char* ely_version(void) { return ELYBLOCK_VERSION_STRING; }

ELY_API const char* ely_last_error(void) { return ely::capi::t_last_error; }

ELY_API const char* ely_status_text(int32_t status) {
    switch (status) {
        case ELY_OK: return "ok";
        case ELY_WARNING: return "solved with a warning";
        case ELY_PARTIAL: return "batch finished; some points failed";
        case ELY_ERR_INVALID_ARGUMENT: return "invalid argument";
        case ELY_ERR_OUT_OF_RANGE: return "out of range";
        case ELY_ERR_CONFIG: return "invalid configuration";
        case ELY_ERR_INFEASIBLE: return "infeasible specification";
        case ELY_ERR_NO_CONVERGENCE: return "no convergence";
        case ELY_ERR_UNKNOWN_NAME: return "unknown name";
        case ELY_ERR_WRONG_STATE: return "call in the wrong state";
        case ELY_ERR_IO: return "file error";
        case ELY_ERR_BUFFER_TOO_SMALL: return "buffer too small";
        case ELY_ERR_CANCELLED: return "cancelled";
        case ELY_ERR_OUT_OF_MEMORY: return "out of memory";
        case ELY_ERR_INTERNAL: return "internal error";
        default: return "unknown status";
    }
}

ELY_API int32_t ely_water_saturation_pressure(double temperature_K, double* pressure_Pa) {
    return ely::capi::guard([&] {
        ely::capi::require_pointer(pressure_Pa, "pressure_Pa");
        const double p = ely::water_saturation_pressure(temperature_K);
        *pressure_Pa = p;
        return ELY_OK;
    });
}

ELY_API int32_t ely_water_electrolysis_voltages(double temperature_K, double pressure_anode_Pa,
                                                double pressure_cathode_Pa, double* reversible_V,
                                                double* thermoneutral_V) {
    return ely::capi::guard([&] {
        if (reversible_V == nullptr && thermoneutral_V == nullptr)
            throw ely::Error(ely::ErrorKind::invalid_argument, "reversible_V and thermoneutral_V are both NULL");
        // The liquid water of the reaction is IAPWS-IF97 region 1, valid up to 100 MPa (IAPWS
        // R7-97(2012), section 1); the Nernst term takes the product gases as ideal, which is
        // itself an extrapolation long before that. Pressures beyond it are outside the correlation.
        constexpr double kPressureMax = 100e6;  // Pa
        const struct { double value; const char* name; } pressures[] = {{pressure_anode_Pa, "anode pressure"},
                                                                        {pressure_cathode_Pa, "cathode pressure"}};
        for (const auto& p : pressures) {
            if (std::isfinite(p.value) && p.value > kPressureMax)
                throw ely::Error(ely::ErrorKind::out_of_range,
                                 fmt::format("{} {:g} Pa is above 1e8 Pa (100 MPa), the upper limit of the "
                                             "IAPWS-IF97 liquid water properties this correlation uses",
                                             p.name, p.value));
        }
        const double e_rev = ely::reversible_voltage_liquid_water(temperature_K, pressure_anode_Pa, pressure_cathode_Pa);
        const double e_tn = ely::thermoneutral_voltage_hhv(temperature_K);
        if (reversible_V) *reversible_V = e_rev;
        if (thermoneutral_V) *thermoneutral_V = e_tn;
        return ELY_OK;
    });
}

}  // extern "C"
