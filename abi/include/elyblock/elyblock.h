/*
 * elyblock — electrolyzer unit-operation model, public C interface (ABI 1).
 *
 * This header is the whole API: what is not declared here is not part of it.
 * It compiles as C99 and as C++.
 *
 * Conventions
 *  - Every fallible call returns an int32_t status: ELY_OK (0); > 0 a warning, the
 *    results are valid; < 0 an error, nothing was written to the out-parameters and
 *    the object is unchanged.
 *  - ely_last_error() gives the message of the last failing call on the calling thread
 *    ("" after a call that succeeded). It also covers a failed create, which has no handle.
 *  - No C++ exception ever leaves a function of this header.
 *  - Handles are independent: two threads may use two handles at once without locks.
 *    One handle must not be used by two threads at once.
 *  - SI units everywhere: K, Pa, A, m2, W, kg/s, mol/s, J/kg.
 *  - Status values are frozen: a value keeps its meaning forever and is never reused.
 */
#ifndef ELYBLOCK_ELYBLOCK_H
#define ELYBLOCK_ELYBLOCK_H

#include <stddef.h>
#include <stdint.h>

#if defined(_WIN32)
#  if defined(ELYBLOCK_BUILDING)
#    define ELY_API __declspec(dllexport)
#  else
#    define ELY_API __declspec(dllimport)
#  endif
#elif defined(__GNUC__)
#  define ELY_API __attribute__((visibility("default")))
#else
#  define ELY_API
#endif

#ifdef __cplusplus
extern "C" {
#endif

/* Version of the binary interface this header describes; ely_abi_version() returns the
 * library's. An adapter checks that they are equal before any other call. */
#define ELY_ABI_VERSION 1

/* ---- status values (frozen) ---------------------------------------------------- */
#define ELY_OK 0
#define ELY_WARNING 1                /* solved; an alarm or extrapolation flag is raised  */
#define ELY_PARTIAL 2                /* batch done; some points failed, see their status  */
#define ELY_ERR_INVALID_ARGUMENT (-1) /* NULL pointer, NaN, infinity, negative size...    */
#define ELY_ERR_OUT_OF_RANGE (-2)    /* outside a correlation's or the model's envelope    */
#define ELY_ERR_CONFIG (-3)          /* plant description does not parse or validate       */
#define ELY_ERR_INFEASIBLE (-4)      /* no state within the limits meets the spec          */
#define ELY_ERR_NO_CONVERGENCE (-5)  /* an iterative solve missed its tolerance            */
#define ELY_ERR_UNKNOWN_NAME (-6)    /* no variable of that name                           */
#define ELY_ERR_WRONG_STATE (-7)     /* call out of the life-cycle order                   */
#define ELY_ERR_IO (-8)              /* a file could not be read                           */
#define ELY_ERR_BUFFER_TOO_SMALL (-9) /* caller's buffer too small; length reported        */
#define ELY_ERR_CANCELLED (-10)      /* a progress callback asked to stop                  */
#define ELY_ERR_OUT_OF_MEMORY (-11)
#define ELY_ERR_INTERNAL (-12)       /* a bug: please report it with the message           */

/* ---- library ------------------------------------------------------------------- */
ELY_API int32_t ely_abi_version(void);
ELY_API const char* ely_version(void);       /* "MAJOR.MINOR.PATCH" */
ELY_API const char* ely_last_error(void);    /* never NULL; thread-local; valid until the next call on this thread */
ELY_API const char* ely_status_text(int32_t status); /* never NULL; static storage */

/* ---- water properties (IAPWS-IF97) ----------------------------------------------- */
/* Saturation pressure of water, Pa, at 273.15 K <= T <= 647.096 K (IF97 eq. 30). */
ELY_API int32_t ely_water_saturation_pressure(double temperature_K, double* pressure_Pa);

/* Water splitting with liquid feed at stack temperature T and absolute electrode pressures:
 * reversible voltage by the Nernst equation with the partial pressures of the wet product
 * gases (each saturated with water vapour at T), and the thermoneutral voltage on the
 * higher-heating-value basis. Either out-pointer may be NULL if not wanted, not both. */
ELY_API int32_t ely_water_electrolysis_voltages(double temperature_K, double pressure_anode_Pa,
                                                double pressure_cathode_Pa, double* reversible_V,
                                                double* thermoneutral_V);

#ifdef __cplusplus
}
#endif

#endif /* ELYBLOCK_ELYBLOCK_H */
