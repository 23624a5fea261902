#pragma once
// The co-simulation glue shared by the FMI 2.0 and FMI 3.0 entry points (fmi2_entry.cpp,
// fmi3_entry.cpp, each a thin translation of its standard's types): one Instance per FMU
// instance over one ely_block, with the call-order state machine, logging through the host's
// callback by category, stepping, variable access by value reference and FMU states. A client
// of the public C header only. Every member returns a Status and never throws; the entry points
// check the instance pointer against the registry of live instances before any call.
#include <elyblock/elyblock.h>

#include <cstddef>
#include <cstdint>
#include <exception>
#include <functional>
#include <new>
#include <memory>
#include <string>
#include <unordered_set>
#include <vector>

#include "variables.hpp"

namespace elyfmi {

enum class Standard { fmi2 = 2, fmi3 = 3 };

/// The status values both standards share (fmi2Status and fmi3Status agree on 0..4).
enum class Status : int { ok = 0, warning = 1, discard = 2, error = 3, fatal = 4 };

/// States of an instance (bits, so that a call names the set of states it is allowed in).
enum State : unsigned {
    kInstantiated = 1u << 0,
    kInitialization = 1u << 1,
    kStep = 1u << 2,        // FMI 2 stepComplete, FMI 3 Step Mode
    kStepFailed = 1u << 3,  // after a discarded step (FMI 2 stepFailed); FMI 3 stays in Step Mode
    kTerminated = 1u << 4,
};
inline constexpr unsigned kAnyState = kInstantiated | kInitialization | kStep | kStepFailed | kTerminated;

/// The log categories of the model description (FMI 2 and 3 spell them alike).
struct Category {
    const char* name;
    const char* description;
};
inline constexpr Category kCategories[] = {
    {"logEvents", "mode changes and alarms raised or cleared by a step"},
    {"logStatusWarning", "calls that return Warning"},
    {"logStatusDiscard", "steps that are discarded (the model refused them; the FMU stays at the step's start)"},
    {"logStatusError", "calls that return Error, with the reason (logged even when logging is off)"},
    {"logStatusFatal", "calls that return Fatal (logged even when logging is off)"},
    {"logCalls", "the life-cycle calls (instantiate, initialization, steps, terminate, reset, FMU states)"},
};
inline constexpr std::size_t kCategoryCount = sizeof kCategories / sizeof kCategories[0];

/// The host's logger: status, category name, message (UTF-8). Empty when the host gave none.
using LogSink = std::function<void(Status, const char* category, const std::string& message)>;

class Instance {
public:
    /// A new instance of the plant in resource_dir/plant.json, or nullptr after logging why
    /// (no plant, a token that is not this plant's, a plant the library refuses).
    static Instance* create(Standard standard, const char* name, const char* token, const std::string& resource_dir,
                            bool logging_on, LogSink sink);
    ~Instance();
    Instance(const Instance&) = delete;
    Instance& operator=(const Instance&) = delete;

    /// The live instances of the process; a call on any other pointer is refused.
    static bool is_live(const void* instance);
    static void destroy(Instance* instance);

    Status set_debug_logging(bool on, std::size_t n, const char* const categories[]);
    Status setup_experiment(const char* function, bool tolerance_defined, double tolerance, double start_time,
                            bool stop_time_defined, double stop_time);
    Status enter_initialization(const char* function);
    Status exit_initialization(const char* function);
    Status do_step(const char* function, double current_time, double step_size);
    Status terminate(const char* function);
    Status reset(const char* function);

    Status get_float64(const char* function, const uint32_t vr[], std::size_t n, double values[]);
    Status set_float64(const char* function, const uint32_t vr[], std::size_t n, const double values[]);
    /// Getters and setters of types this FMU has no variable of: OK for n = 0, else an error
    /// naming the first value reference.
    Status no_variables_of_type(const char* function, const char* type, const uint32_t vr[], std::size_t n,
                                bool setter);

    Status get_state(const char* function, void** state);
    Status set_state(const char* function, void* state);
    Status free_state(const char* function, void** state);
    Status serialized_size(const char* function, void* state, std::size_t* size);
    Status serialize(const char* function, void* state, unsigned char* bytes, std::size_t size);
    Status deserialize(const char* function, const unsigned char* bytes, std::size_t size, void** state);

    /// A function of the standard that does not apply to this FMU: Error, with the reason logged.
    Status unsupported(const char* function, const char* why);
    /// Any call with a bad argument: Error naming it.
    Status bad_argument(const char* function, const std::string& what);

    /// The end of the last step that completed (FMI 3 lastSuccessfulTime, FMI 2 fmi2LastSuccessfulTime).
    double last_successful_time() const { return last_successful_time_; }
    bool in_state(unsigned states) const { return (state_ & states) != 0; }
    /// Logs that a call is not allowed in the current state; returns false then.
    bool allowed(const char* function, unsigned states);
    void log(Status status, const char* category, const std::string& message);
    /// The category of the messages of a call that returns this status.
    static const char* category_of(Status status);

private:
    struct SavedState;
    Instance(Standard standard, std::string name, LogSink sink);
    bool load_block(std::string& why);
    const Variable* find(uint32_t vr) const;
    Status fail(const char* function, const std::string& message, Status status = Status::error);
    Status ensure_outputs(const char* function, const ely_block** from);
    void drop_preview();
    void log_step_events(int32_t status);
    double read_mode() const;

    Standard standard_;
    std::string name_;
    LogSink sink_;
    bool logging_on_ = false;
    bool category_on_[kCategoryCount] = {};

    std::string plant_text_;
    ely_block* block_ = nullptr;
    ely_block* preview_ = nullptr;  // the block with inputs set since the last step applied (advance by 0)
    std::vector<Variable> variables_;
    std::vector<std::pair<uint32_t, std::size_t>> by_reference_;  // sorted by value reference
    int32_t mode_index_ = -1;

    unsigned state_ = kInstantiated;
    double start_time_ = 0, time_ = 0, last_successful_time_ = 0;
    bool started_ = false;  // the block was reset since the last change in Initialization Mode
    bool dirty_ = false;    // inputs or parameters set since the last reset or step
    std::string last_alarms_;
    double last_mode_ = -1;
    std::unordered_set<SavedState*> states_;
};

/// Runs an entry point's body; an exception (none is expected) becomes Error, or Fatal for lack of
/// memory, logged through the instance when there is one.
template <class F>
Status guarded(Instance* instance, const char* function, F&& body) noexcept {
    try {
        return body();
    } catch (const std::bad_alloc&) {
        if (instance) instance->log(Status::fatal, "logStatusFatal", std::string(function) + ": out of memory");
        return Status::fatal;
    } catch (const std::exception& e) {
        if (instance) instance->log(Status::error, "logStatusError", std::string(function) + ": " + e.what());
        return Status::error;
    } catch (...) {
        if (instance) instance->log(Status::error, "logStatusError", std::string(function) + ": unknown exception");
        return Status::error;
    }
}

}  // namespace elyfmi
