/*
 * elyblock — electrolyzer unit-operation model, public C interface (ABI 1).
 *
 * This header is the whole API: what is not declared here is not part of it.
 * It compiles as C99 and as C++.
 *
 * Conventions
 *  - Every fallible call returns an int32_t status: ELY_OK (0); > 0 a warning, the
 *    results are valid; < 0 an error: nothing was written to the out-parameters and the
 *    object is as it was before the call, with one exception: a failed ely_block_solve (or
 *    ely_block_advance) rolls the block back to its last successful solve (or reset or step),
 *    which discards the inputs and the spec set since then (see "the block" below). A batch
 *    or profile with a bad argument writes nothing; one that ran (ELY_PARTIAL,
 *    ELY_ERR_CANCELLED) fills its arrays as it says.
 *  - ely_last_error() gives the message of the last failing call on the calling thread
 *    ("" after a call that succeeded). It also covers a failed create, which has no handle.
 *    A message is at most about 4 KiB; user text it quotes (a key, a unit, a name) is cut
 *    to a few dozen bytes, and control characters in it, NUL included, are written as \xNN.
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

/* ---- species --------------------------------------------------------------------- */
/* Molar mass, kg/mol, of a species the streams carry: "H2", "O2", "H2O", "N2", "Cl2", "NaCl",
 * "NaOH", "KOH" (the model's own values, from IUPAC standard atomic weights). Hosts that work
 * in moles convert the kg/s outputs with it, so their mole balances close as the model's do.
 * ELY_ERR_UNKNOWN_NAME for any other formula. */
ELY_API int32_t ely_molar_mass(const char* formula, double* kg_per_mol);

/* ---- quantities with units --------------------------------------------------------- */
/* Two calls, one implementation (the plant description's unit parser and conversion):
 * - ely_parse_quantity for text that carries its own unit, as a user types it ("2 A/cm2" in a
 *   dialog, a spreadsheet cell, a command-line option), into the SI unit of a variable;
 * - ely_convert_unit (below) for a number whose unit is known apart from it (a data file's
 *   column header, a display unit of ely_variable_info), in either direction, degC included.
 * Both give the same double for the same quantity.
 *
 * Reads a quantity as the plant description takes it: "number unit" ("2 A/cm2", "80 degC",
 * "30 bar", "1.5 MW", "25 %") or a bare number, which is taken as already in `unit`. *value
 * receives it in `unit`, a unit expression without offset: an SI unit such as
 * ely_variable_info.unit, or any unit of the same dimension ("kW"). Units and limits are those
 * of the plant description (docs/config.md, "Units"). A text that does not read, a unit not
 * known or of another dimension, a non-finite result: ELY_ERR_INVALID_ARGUMENT, the message
 * naming the text and the unit (with hints such as "did you mean degC?"); a `unit` with an
 * offset (degC): ELY_ERR_INVALID_ARGUMENT. */
ELY_API int32_t ely_parse_quantity(const char* text, const char* unit, double* value);

/* ---- the block ---------------------------------------------------------------------
 * Life cycle: create (from JSON text or a file) → set inputs → solve → get outputs →
 * set … → solve … → destroy. Outputs are readable only while they belong to the current
 * inputs: after a successful solve and before the next set (else ELY_ERR_WRONG_STATE).
 * A failed set or set_spec changes nothing. A failed solve rolls the inputs, the spec and the
 * outputs back to those of the last successful solve (the sets made since then are
 * discarded; with no successful solve yet, back to the state after create), so the block
 * keeps its last valid state. Variables are addressed by a dense index 0..count-1
 * (look it up by name with ely_block_find); the set of variables depends on the
 * technology of the configuration. */
typedef struct ely_block ely_block;

#define ELY_CAUSALITY_INPUT 0
#define ELY_CAUSALITY_OUTPUT 1
#define ELY_CAUSALITY_PARAMETER 2 /* readable; settable only when its variability is TUNABLE */

/* How a variable may change (the FMI meanings). */
#define ELY_VARIABILITY_FIXED 0      /* set by the plant description only (structural parameters) */
#define ELY_VARIABILITY_TUNABLE 1    /* a parameter a host may set between solves (ely_block_set) */
#define ELY_VARIABILITY_CONTINUOUS 2 /* inputs and outputs that vary continuously */
#define ELY_VARIABILITY_DISCRETE 3   /* 0/1 alarms and other stepwise outputs */

/* Bits of ely_variable_info.flags. */
#define ELY_VARIABLE_MIN_EXCLUSIVE 1 /* the value must be above min, not equal to it */

/* Description of one variable. The caller sets struct_size = sizeof(ely_variable_info);
 * later versions of this struct only grow at the end, and the library fills only the members
 * that fit in struct_size (a caller built against the first version, whose struct ends after
 * description, keeps working). Strings are owned by the library and stay valid while the
 * block, or any clone of it, exists. */
typedef struct ely_variable_info {
    uint32_t struct_size;
    int32_t causality;       /* ELY_CAUSALITY_* */
    const char* name;        /* "group.quantity" */
    const char* unit;        /* SI unit, "1" for dimensionless */
    const char* description;
    /* ---- second version of the struct: everything below ---- */
    int32_t variability;     /* ELY_VARIABILITY_* */
    uint32_t flags;          /* ELY_VARIABLE_* bits */
    double min, max;         /* SI limits that ely_block_set enforces on inputs and tunable parameters;
                                -HUGE_VAL / HUGE_VAL when unbounded (for outputs: bounds they keep) */
    double start;            /* inputs and parameters: the value the plant description gave (or its
                                default); NaN for outputs and for a drive input never given */
    double nominal;          /* typical magnitude, for scaling (> 0) */
    const char* label;       /* short display label, e.g. "stack temperature" */
    const char* display_unit;  /* preferred display unit, e.g. "degC" (the SI unit when no other) */
    double display_scale;    /* display value = SI value * display_scale + display_offset */
    double display_offset;
    const char* summary_group; /* heading of the variable's section in the technology's summary; "" if not shown */
    const char* config_key;  /* JSON path of the plant-description key that sets its start value,
                                e.g. "$.operating.temperature"; "" when none */
    int32_t summary_rank;    /* position (1, 2, ...) in the technology's summary; 0 when not shown */
} ely_variable_info;

/* Progress of a long call: return 0 to go on, non-zero to cancel. */
typedef int32_t (*ely_progress_fn)(size_t done, size_t total, void* user);

/* On failure *out is set to NULL and ely_last_error() names the problem (JSON path).
 * A plant description is kilobytes; the limits bound what any text can cost: at most
 * 4 MiB (4194304 bytes) of JSON, 32 levels of nesting, 256 members per object, 1024
 * elements per array, strings of 4096 bytes, keys of 128 bytes; a unit expression of at
 * most 128 bytes and 16 levels of parentheses (ELY_ERR_CONFIG naming the limit).
 * ely_block_create_from_file reads only a regular file of at most 4 MiB: a directory, a
 * device, a FIFO or a larger file is refused at once with ELY_ERR_IO, without reading it.
 * The path is UTF-8 (on Windows opened through its UTF-16 form). */
ELY_API int32_t ely_block_create(const char* config_json, ely_block** out);
ELY_API int32_t ely_block_create_from_file(const char* path, ely_block** out);
ELY_API int32_t ely_block_clone(const ely_block* block, ely_block** out); /* same inputs and solution */
ELY_API void ely_block_destroy(ely_block* block);                      /* NULL is a no-op */

ELY_API int32_t ely_block_variable_count(const ely_block* block, int32_t* count);
ELY_API int32_t ely_block_variable_info(const ely_block* block, int32_t index, ely_variable_info* info);
ELY_API int32_t ely_block_find(const ely_block* block, const char* name, int32_t* index);
/* Sets an input or a tunable parameter (checked against min/max; a cell parameter rebuilds
 * that block's cell model, clones keep theirs). Any input may be set whatever the spec: the
 * spec decides which drive input the solve reads. An output or a fixed (structural) parameter
 * gives ELY_ERR_INVALID_ARGUMENT; a failed set changes nothing. */
ELY_API int32_t ely_block_set(ely_block* block, int32_t index, double value);
ELY_API int32_t ely_block_get(const ely_block* block, int32_t index, double* value);

/* Selects which drive input the solve reads: "current_density", "current", "power",
 * "hydrogen_rate" or "voltage" (the config's operating.spec is the initial choice). */
ELY_API int32_t ely_block_set_spec(ely_block* block, const char* spec);

/* The spec in force: *spec receives its name (static storage, never freed). */
ELY_API int32_t ely_block_get_spec(const ely_block* block, const char** spec);

/* Steady state at the current inputs. ELY_OK, ELY_WARNING (an alarm is raised; the
 * message says which; outputs valid), or an error (block rolled back). */
ELY_API int32_t ely_block_solve(ely_block* block);

/* Solves n_points operating points in one call without changing the block: for point k the
 * inputs input_indices[0..n_inputs) take inputs[k*n_inputs + i] (row-major), the block is
 * solved, and outputs[k*n_outputs + o] receives output_indices[o]; point_status[k] gets the
 * point's status (outputs of a failed point are NaN). Points are solved in order on one
 * working copy, each starting from the state the previous one left; a failed point returns the
 * copy to the block's state at the start of the call (inputs, parameters and spec as set on
 * the block, solved or not), not to the block's last successful solve. Returns ELY_OK,
 * ELY_WARNING (some point warned), ELY_PARTIAL (some point failed), ELY_ERR_CANCELLED (the
 * progress callback asked to stop, even at its last call; points not yet solved get
 * ELY_ERR_CANCELLED), or an error for bad arguments (nothing written). Arguments, checked
 * for every count, zero included: n_inputs and n_outputs >= 0; input_indices (inputs only)
 * and output_indices must be valid whenever n_inputs, n_outputs > 0, even for n_points = 0;
 * inputs, outputs and point_status whenever n_points > 0 (and the count they go with is).
 * progress is called every 1024 points and after the last; it may be NULL. */
ELY_API int32_t ely_block_solve_batch(const ely_block* block, size_t n_points, int32_t n_inputs,
                                      const int32_t* input_indices, const double* inputs, int32_t n_outputs,
                                      const int32_t* output_indices, double* outputs, int32_t* point_status,
                                      ely_progress_fn progress, void* user);

/* ely_block_solve_batch with the inputs and outputs as columns, the layout of arrays kept per
 * variable (numpy arrays, data frames): point k takes input_indices[i] from input_columns[i][k] and
 * gives output_indices[o] into output_columns[o][k]. Everything else as ely_block_solve_batch
 * (statuses, messages, NaN for failed points, progress, the working copy). Each column has n_points
 * elements; input_columns and output_columns, and each of their n_inputs and n_outputs columns,
 * must not be NULL whenever n_points > 0; no output column may overlap an input column. Where the
 * vectorized batch applies (docs/batch.md) the points are read from and written into the columns
 * without a copy. */
ELY_API int32_t ely_block_solve_batch_columns(const ely_block* block, size_t n_points, int32_t n_inputs,
                                              const int32_t* input_indices, const double* const* input_columns,
                                              int32_t n_outputs, const int32_t* output_indices,
                                              double* const* output_columns, int32_t* point_status,
                                              ely_progress_fn progress, void* user);

/* ely_block_solve_batch on several threads: the same arguments, statuses, outputs and messages,
 * and threads (>= 1; 0 for one per core). The points are cut into pieces of 4096 in order; each
 * piece is solved in order on its own working copy of the block at the start of the call (as
 * ely_block_solve_batch solves all points on one), so the results do not depend on the thread
 * count. progress is
 * called on the calling thread after each piece it solves and after the last point; returning
 * non-zero stops the pieces not yet started (their points get ELY_ERR_CANCELLED). Every other
 * call on the same block must wait for it (the block is read, not changed). */
ELY_API int32_t ely_block_solve_batch_threads(const ely_block* block, size_t n_points, int32_t n_inputs,
                                              const int32_t* input_indices, const double* inputs, int32_t n_outputs,
                                              const int32_t* output_indices, double* outputs, int32_t* point_status,
                                              int32_t threads, ely_progress_fn progress, void* user);

/* The solved state as JSON text (UTF-8, NUL-terminated). *length receives the size needed
 * including the NUL; with buffer NULL and capacity 0 only the size is reported (ELY_OK);
 * a smaller non-zero capacity gives ELY_ERR_BUFFER_TOO_SMALL, reports the size needed in
 * *length and writes nothing into buffer. */
ELY_API int32_t ely_block_report_json(const ely_block* block, char* buffer, size_t capacity, size_t* length);

/* ---- units ------------------------------------------------------------------------- */
/* Converts a number from one unit to another with the units a plant description accepts
 * ("degC", "bar", "A/cm2", "ohm cm2", "kWh/kg", "%", ...; docs/config.md lists them):
 * e.g. 1.5 "A/cm2" to "A/m2" gives 15000. For a number whose unit comes apart from it (a
 * column header, a display unit); text with its own unit goes through ely_parse_quantity (see
 * above: the same conversion). The dimensions must agree (ELY_ERR_INVALID_ARGUMENT naming both
 * units otherwise); a unit that does not parse, a non-finite value or result is
 * ELY_ERR_INVALID_ARGUMENT naming it. Either unit may be degC, a temperature (offset
 * 273.15 K), not a difference: "25 degC" to "K" is 298.15, 353.15 "K" to "degC" is 80. */
ELY_API int32_t ely_convert_unit(double value, const char* from_unit, const char* to_unit, double* result);

/* ---- calibration -------------------------------------------------------------------
 * ely_block_fit fits tunable parameters of the block to measured data by weighted nonlinear
 * least squares (Levenberg-Marquardt) within bounds; docs/calibration.md gives the method.
 *
 * Data, laid out like ely_block_solve_batch: n_points rows; row k sets the inputs
 * input_indices[0..n_inputs) to inputs[k*n_inputs + i] (row-major; inputs the rows do not
 * set keep the block's current values) and the block is solved with its spec; the model's
 * values of the outputs measured_indices[0..n_measured) are compared with
 * measured[k*n_measured + o]. A measured value of NaN means "not measured at this row" and is
 * left out. weights (same layout, NULL for all 1) weigh the squared residuals, e.g. 1/sigma^2
 * in the output's SI unit; a weight of 0 leaves a value out. Only ratios of weights matter to
 * the standard errors, which scale with the residual variance of the fit.
 *
 * Free parameters: n_free names, each a tunable parameter's variable name
 * ("param.cell.anode_exchange_current_density", "param.degradation.voltage_rate") or the key
 * of the technology's cell object ("anode_exchange_current_density"). The fit starts from the
 * block's current values (set others with ely_block_set first) and sets values only through
 * the checks of ely_block_set, within the variable's limits or the options' tighter bounds.
 *
 * options may be NULL (defaults). The caller sets struct_size = sizeof(ely_fit_options); the
 * struct only grows at its end. progress (may be NULL) is called after every iteration with
 * (iteration, max_iterations); returning non-zero cancels the fit (ELY_ERR_CANCELLED).
 *
 * Returns ELY_OK, or ELY_WARNING when the report carries warnings (parameters the data
 * cannot separate, a parameter at a bound, ...; ely_last_error() gives them joined by "; "):
 * in both cases the block holds the fitted values (inputs and spec unchanged; solve before
 * reading outputs) and *result receives the fit, to read with ely_fit_report_json,
 * ely_fit_plant_json and ely_fit_parameter and to free with ely_fit_destroy. On an error
 * *result is NULL and the block is unchanged: ELY_ERR_INVALID_ARGUMENT (a NULL array whose
 * count is positive, a count below 1 for n_points, n_measured or n_free, an index that is
 * not an input or not an output, a name given twice, a non-finite input, weight or bound,
 * bounds outside the variable's limits, fewer measured values than free parameters, a
 * parameter the measured outputs do not depend on at these rows); ELY_ERR_UNKNOWN_NAME (a
 * free name); the status of a data row that cannot be solved at the start values (the
 * message names the row, counted from 1); ELY_ERR_NO_CONVERGENCE (iteration limit; the
 * message gives the best values found); ELY_ERR_CANCELLED. */
typedef struct ely_fit ely_fit;

#define ELY_FIT_SCALE_AUTO 0   /* log space for positive parameters whose limits span decades */
#define ELY_FIT_SCALE_LINEAR 1
#define ELY_FIT_SCALE_LOG 2    /* the start value must be positive */

typedef struct ely_fit_options {
    uint32_t struct_size;      /* sizeof(ely_fit_options) */
    int32_t max_iterations;    /* Levenberg-Marquardt iterations; 0 means 200 */
    double tolerance;          /* relative change of the sum of squares and of the step; 0 means 1e-10 */
    const double* lower;       /* n_free lower bounds (SI) or NULL; a NaN entry keeps the variable's minimum */
    const double* upper;       /* n_free upper bounds (SI) or NULL; a NaN entry keeps the variable's maximum */
    const int32_t* scales;     /* n_free ELY_FIT_SCALE_* or NULL (all ELY_FIT_SCALE_AUTO) */
} ely_fit_options;

ELY_API int32_t ely_block_fit(ely_block* block, size_t n_points, int32_t n_inputs, const int32_t* input_indices,
                              const double* inputs, int32_t n_measured, const int32_t* measured_indices,
                              const double* measured, const double* weights, int32_t n_free,
                              const char* const* free_names, const ely_fit_options* options,
                              ely_progress_fn progress, void* user, ely_fit** result);

/* The fit report as JSON text (UTF-8, NUL-terminated), with the buffer protocol of
 * ely_block_report_json. Members: "parameters" (each "name", "config_key", "unit", "scale",
 * "start", "value", "standard_error", "interval_95" [low, high], "bounds" [low, high],
 * "at_bound"), "correlation" (n_free x n_free), "condition_number", "measured" (the measured
 * variables' names), "rmse" (per measured variable, SI), "rmse_V" (when cell.voltage is
 * measured), "residuals" and "fitted" (n_points rows of model - measured and of the model's
 * values, null where not measured), "warnings", "termination", "iterations", "evaluations",
 * "points", "measurements", "degrees_of_freedom", "sum_of_squares", "residual_variance", and
 * "plant" (the calibrated plant description, as ely_fit_plant_json gives it).
 * Numbers that are not defined (a standard error the data cannot give) are null. */
ELY_API int32_t ely_fit_report_json(const ely_fit* fit, char* buffer, size_t capacity, size_t* length);

/* The calibrated plant description as JSON text: the description the block was created from
 * with the values of its tunable parameters in place (the fitted ones and any other set since
 * create), which loads again and gives the fitted block exactly. Buffer protocol of
 * ely_block_report_json. (Every block of this interface is created from JSON text, so every
 * fit has one; the same text is the report's "plant".) */
ELY_API int32_t ely_fit_plant_json(const ely_fit* fit, char* buffer, size_t capacity, size_t* length);

/* Free parameter k (0..n_free-1, in the order named): fitted value and standard error (SI;
 * NaN when the data cannot give one). Either out-pointer may be NULL. */
ELY_API int32_t ely_fit_parameter(const ely_fit* fit, int32_t k, double* value, double* standard_error);

/* Measured variable o (0..n_measured-1, in the order given): the root mean square of its
 * residuals, model - measured, unweighted, in the variable's SI unit (the report's "rmse"; NaN
 * when it was measured at no row), and the number of rows where it was measured (a weight of
 * 0 included). Either out-pointer may be NULL. For hosts that show a fit's quality without
 * reading JSON. */
ELY_API int32_t ely_fit_rmse(const ely_fit* fit, int32_t o, double* rmse, size_t* rows);

ELY_API void ely_fit_destroy(ely_fit* fit); /* NULL is a no-op */

/* ---- the block in time (dynamic runs) -------------------------------------------------
 * Life cycle: create → set inputs → ely_block_reset(start time) → set inputs →
 * ely_block_advance(step) → get outputs → set … → advance … → destroy. The state of a run: the
 * stack temperature (stack.temperature), the gas of the anode separator (gas.h2_in_o2), the
 * coolant valve's controller, the current and its ramp, the operating mode (state.mode) and its
 * start-up timers, the operating hours (state.hours_operated) and start-ups, and the totals of
 * the run summary. Inputs are held over a step; in.mode_request asks for a mode (0 off, 1 hot
 * standby, 2 production, 3 automatic). Equations, defaults and sources: docs/dynamics.md.
 * A step's status is like ely_block_solve's: ELY_WARNING when an alarm is raised at its end. A
 * failed step (the stack temperature leaving the cell model's range, say) rolls the block back
 * like a failed solve: to its state before the call, without the sets made since the last
 * successful solve, reset or step. ely_block_solve stays available during a run (a steady solve
 * at in.temperature; the run goes on from its own state at the next step). */

/* Starts a run at start_time_s from the current inputs: the stack temperature takes
 * in.temperature, the operating hours in.hours_operated, the plant is in the mode in.mode_request
 * asks for, at its setpoint, without a start-up sequence (ask for off at the reset, then for
 * production, to run a start from cold). Every output is valid for that state. A reset during a
 * run starts a new run. */
ELY_API int32_t ely_block_reset(ely_block* block, double start_time_s);

/* Integrates the run over step_s seconds (finite, >= 0) with the inputs held; the outputs are
 * valid at the end. A step of 0 applies the inputs at the current time (a mode request, a new
 * setpoint that the current then ramps towards). ELY_ERR_WRONG_STATE before a reset. */
ELY_API int32_t ely_block_advance(ely_block* block, double step_s);

/* The time of the run, s. ELY_ERR_WRONG_STATE before a reset. */
ELY_API int32_t ely_block_time(const ely_block* block, double* time_s);

/* Everything a later result of the block depends on (inputs, parameters, spec, outputs, the warm
 * start of the spec solve and the run with its integrator) as bytes, with the buffer protocol of
 * ely_block_report_json (binary: *length is the number of bytes, with no terminator). A state
 * restores into any block created from the same plant description by the same library version;
 * the restored block continues bit for bit as the saved one would have. A state of another plant
 * description, library version or ABI, or one cut short or changed, is refused with
 * ELY_ERR_INVALID_ARGUMENT and a message saying which, and the block is left as it was. */
ELY_API int32_t ely_block_save_state(const ely_block* block, void* buffer, size_t capacity, size_t* length);
ELY_API int32_t ely_block_restore_state(ely_block* block, const void* buffer, size_t length);

/* A whole profile in one call, laid out like ely_block_solve_batch: row k holds the time
 * times[k] (s, non-decreasing) and the inputs input_indices[0..n_inputs) taking
 * inputs[k*n_inputs + i]. The block is reset at times[0] with the inputs of row 0; then for each
 * following row it advances to times[k] with the inputs of row k-1 held and applies the inputs of
 * row k at times[k]. outputs[k*n_outputs + o] receives output_indices[o] at times[k] (with row k's
 * inputs applied) and row_status[k] the row's status. The block is left running at the last row,
 * and ely_block_run_summary_json reports the profile. Returns ELY_OK, ELY_WARNING (some row
 * warned), ELY_PARTIAL (the run stopped at a row that failed: that row and those after it get its
 * status and NaN outputs; the block is left running where it stopped, at the last time it reached
 * with the inputs in force there, its outputs valid), the failing row's status when it is the
 * first, ELY_ERR_CANCELLED (the progress callback asked to stop, even at its last call; rows not
 * run get ELY_ERR_CANCELLED), or an error for bad arguments (nothing written, the block unchanged).
 * Arguments are checked as for ely_block_solve_batch, and the times before anything runs.
 * progress is called every 1024 rows and after the last; it may be NULL. */
ELY_API int32_t ely_block_simulate(ely_block* block, size_t n_rows, const double* times, int32_t n_inputs,
                                   const int32_t* input_indices, const double* inputs, int32_t n_outputs,
                                   const int32_t* output_indices, double* outputs, int32_t* row_status,
                                   ely_progress_fn progress, void* user);

/* What the run made and used since its reset, as JSON text (UTF-8, NUL-terminated; the buffer
 * protocol of ely_block_report_json): {"technology", "name", "start_time", "end_time",
 * "figures": {name: {"value" (SI, null when not a number), "unit", "label", "display_unit",
 * "display_scale", "display_offset"}}} with the figures hydrogen, energy_dc, energy_ac,
 * specific_energy_dc and _ac, water, full_load_hours, hours in each mode, starts, hours at minimum
 * load, the purity alarms with their hours, the degradation at the end and, when
 * param.degradation.voltage_limit is set, the stack-replacement point (docs/dynamics.md lists them
 * all). ELY_ERR_WRONG_STATE before a reset. */
ELY_API int32_t ely_block_run_summary_json(const ely_block* block, char* buffer, size_t capacity, size_t* length);

#ifdef __cplusplus
}
#endif

#endif /* ELYBLOCK_ELYBLOCK_H */
