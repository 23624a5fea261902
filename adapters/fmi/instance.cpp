#include "instance.hpp"

#include <algorithm>
#include <cmath>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <mutex>
#include <sstream>

namespace elyfmi {
namespace {

std::mutex g_live_mutex;
std::unordered_set<const void*>& live_instances() {
    static std::unordered_set<const void*> live;
    return live;
}

std::string state_name(unsigned state) {
    switch (state) {
        case kInstantiated: return "the instantiated state";
        case kInitialization: return "Initialization Mode";
        case kStep: return "Step Mode";
        case kStepFailed: return "the state after a discarded step";
        case kTerminated: return "the terminated state";
        default: return "an unknown state";
    }
}

std::string number(double x) {
    std::ostringstream s;
    s.precision(17);
    s << x;
    return s.str();
}

bool read_file(const std::string& path, std::string& text) {
#ifdef _WIN32
    // The host passes UTF-8; a narrow path would be read in the ANSI code page.
    std::ifstream in(std::filesystem::u8path(path), std::ios::binary);
#else
    std::ifstream in(path, std::ios::binary);
#endif
    if (!in) return false;
    text.assign(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
    return !in.bad();
}

// The serialized FMU state: this header, then the block's own state bytes (ely_block_save_state).
constexpr char kMagic[8] = {'E', 'L', 'Y', 'F', 'M', 'U', 'S', '1'};
constexpr std::size_t kHeaderSize = sizeof kMagic + 4 + 4 + 8 * 4 + 2 + 8;

}  // namespace

struct Instance::SavedState {
    std::string block;  // ely_block_save_state
    unsigned state = kInstantiated;
    double start_time = 0, time = 0, last_successful_time = 0, last_mode = -1;
    bool started = false, dirty = false;
};

Instance::Instance(Standard standard, std::string name, LogSink sink)
    : standard_(standard), name_(std::move(name)), sink_(std::move(sink)) {}

Instance::~Instance() {
    drop_preview();
    ely_block_destroy(block_);
    for (SavedState* s : states_) delete s;
}

bool Instance::is_live(const void* instance) {
    std::lock_guard<std::mutex> lock(g_live_mutex);
    return instance && live_instances().count(instance) != 0;
}

void Instance::destroy(Instance* instance) {
    {
        std::lock_guard<std::mutex> lock(g_live_mutex);
        live_instances().erase(instance);
    }
    delete instance;
}

const char* Instance::category_of(Status status) {
    switch (status) {
        case Status::warning: return "logStatusWarning";
        case Status::discard: return "logStatusDiscard";
        case Status::fatal: return "logStatusFatal";
        default: return "logStatusError";
    }
}

void Instance::log(Status status, const char* category, const std::string& message) {
    if (!sink_) return;
    // Errors are always reported: a host that gave a logger wants to know why a call failed.
    bool on = status == Status::error || status == Status::fatal;
    if (!on && logging_on_) {
        for (std::size_t i = 0; i < kCategoryCount; ++i)
            if (std::strcmp(kCategories[i].name, category) == 0) on = category_on_[i];
    }
    if (on) sink_(status, category, message);
}

Status Instance::fail(const char* function, const std::string& message, Status status) {
    log(status, category_of(status), std::string(function) + ": " + message);
    return status;
}

Status Instance::bad_argument(const char* function, const std::string& what) { return fail(function, what); }

Status Instance::unsupported(const char* function, const char* why) { return fail(function, why); }

bool Instance::allowed(const char* function, unsigned states) {
    if (in_state(states)) return true;
    std::string where;
    for (unsigned bit = 1; bit <= kTerminated; bit <<= 1)
        if (states & bit) where += (where.empty() ? "" : ", ") + state_name(bit);
    fail(function, "not allowed in " + state_name(state_) + " (allowed in: " + where + ")");
    return false;
}

Instance* Instance::create(Standard standard, const char* name, const char* token, const std::string& resource_dir,
                           bool logging_on, LogSink sink) {
    const char* function = standard == Standard::fmi2 ? "fmi2Instantiate" : "fmi3InstantiateCoSimulation";
    std::unique_ptr<Instance> instance(new (std::nothrow) Instance(standard, name ? name : "", std::move(sink)));
    if (!instance) return nullptr;
    instance->logging_on_ = logging_on;
    std::fill(std::begin(instance->category_on_), std::end(instance->category_on_), logging_on);
    if (!name || !*name) {
        instance->fail(function, "the instance name is NULL or empty");
        return nullptr;
    }
    if (!token) {
        instance->fail(function, "the instantiation token is NULL");
        return nullptr;
    }
    std::string path = resource_dir;
    if (!path.empty() && path.back() != '/' && path.back() != '\\') path += '/';
    path += "plant.json";
    if (!read_file(path, instance->plant_text_)) {
        instance->fail(function, "cannot read the plant description " + path +
                                     " (the resources folder of the FMU must hold plant.json)");
        return nullptr;
    }
    const std::string expected = instantiation_token(instance->plant_text_, static_cast<int>(standard));
    if (expected != token) {
        instance->fail(function, std::string("the instantiation token ") + token + " is not this FMU's " + expected +
                                     ": the model description and resources/plant.json belong to different plants or "
                                     "library versions");
        return nullptr;
    }
    std::string why;
    if (!instance->load_block(why)) {
        instance->fail(function, why);
        return nullptr;
    }
    instance->log(Status::ok, "logCalls", std::string(function) + ": instance " + name + " of " + path);
    std::lock_guard<std::mutex> lock(g_live_mutex);
    live_instances().insert(instance.get());
    return instance.release();
}

bool Instance::load_block(std::string& why) {
    drop_preview();
    ely_block_destroy(block_);
    block_ = nullptr;
    if (ely_abi_version() != ELY_ABI_VERSION) {
        why = "the model library's ABI " + std::to_string(ely_abi_version()) + " is not " +
              std::to_string(ELY_ABI_VERSION);
        return false;
    }
    if (ely_block_create(plant_text_.c_str(), &block_) < 0) {
        why = std::string("the plant description in resources/plant.json is refused: ") + ely_last_error();
        return false;
    }
    try {
        variables_ = fmi_variables(block_);
    } catch (const std::exception& e) {
        why = e.what();
        return false;
    }
    by_reference_.clear();
    for (std::size_t i = 0; i < variables_.size(); ++i) {
        const Variable& v = variables_[i];
        by_reference_.emplace_back(v.value_reference, i);
        double current = 0;
        // An input the plant description never gave gets the start the model description declares.
        if (v.causality == Causality::input && ely_block_get(block_, v.index, &current) >= 0 && std::isnan(current) &&
            ely_block_set(block_, v.index, v.start) < 0) {
            why = "input " + v.name + " refuses its declared start " + number(v.start) + ": " + ely_last_error();
            return false;
        }
        if (v.name == "state.mode") mode_index_ = v.index;
    }
    std::sort(by_reference_.begin(), by_reference_.end());
    state_ = kInstantiated;
    start_time_ = time_ = last_successful_time_ = 0;
    started_ = dirty_ = false;
    last_alarms_.clear();
    last_mode_ = -1;
    return true;
}

const Variable* Instance::find(uint32_t vr) const {
    auto it = std::lower_bound(by_reference_.begin(), by_reference_.end(), std::make_pair(vr, std::size_t{0}));
    return it != by_reference_.end() && it->first == vr ? &variables_[it->second] : nullptr;
}

void Instance::drop_preview() {
    ely_block_destroy(preview_);
    preview_ = nullptr;
}

Status Instance::set_debug_logging(bool on, std::size_t n, const char* const categories[]) {
    const char* function = standard_ == Standard::fmi2 ? "fmi2SetDebugLogging" : "fmi3SetDebugLogging";
    if (n > 0 && !categories) return bad_argument(function, "categories is NULL while nCategories > 0");
    if (n == 0) {
        std::fill(std::begin(category_on_), std::end(category_on_), on);
        logging_on_ = on;
        return Status::ok;
    }
    for (std::size_t k = 0; k < n; ++k) {
        const char* c = categories[k];
        std::size_t i = 0;
        while (i < kCategoryCount && !(c && std::strcmp(kCategories[i].name, c) == 0)) ++i;
        if (i == kCategoryCount) {
            std::string known;
            for (const Category& cat : kCategories) known += std::string(known.empty() ? "" : ", ") + cat.name;
            return bad_argument(function, std::string("unknown log category ") + (c ? c : "(NULL)") + " (known: " +
                                              known + ")");
        }
    }
    for (std::size_t k = 0; k < n; ++k)
        for (std::size_t i = 0; i < kCategoryCount; ++i)
            if (std::strcmp(kCategories[i].name, categories[k]) == 0) category_on_[i] = on;
    logging_on_ = std::any_of(std::begin(category_on_), std::end(category_on_), [](bool b) { return b; });
    return Status::ok;
}

Status Instance::setup_experiment(const char* function, bool tolerance_defined, double tolerance, double start_time,
                                  bool stop_time_defined, double stop_time) {
    if (!allowed(function, kInstantiated)) return Status::error;
    if (!std::isfinite(start_time)) return bad_argument(function, "startTime " + number(start_time) + " is not finite");
    if (stop_time_defined && !(stop_time >= start_time))
        return bad_argument(function, "stopTime " + number(stop_time) + " is before startTime " + number(start_time));
    if (tolerance_defined && !(tolerance > 0)) return bad_argument(function, "tolerance " + number(tolerance) + " is not > 0");
    // The model keeps its own integration tolerance (param.dynamics.tolerance): an importer's
    // tolerance is for its own solver, and the steps must not depend on who imports the FMU.
    start_time_ = time_ = last_successful_time_ = start_time;
    return Status::ok;
}

Status Instance::enter_initialization(const char* function) {
    if (!allowed(function, kInstantiated)) return Status::error;
    state_ = kInitialization;
    started_ = false;
    log(Status::ok, "logCalls", std::string(function) + ": start time " + number(start_time_) + " s");
    return Status::ok;
}

Status Instance::exit_initialization(const char* function) {
    if (!allowed(function, kInitialization)) return Status::error;
    if (!started_) {
        const int32_t status = ely_block_reset(block_, start_time_);
        if (status < 0) return fail(function, std::string("the plant cannot start from these inputs: ") + ely_last_error());
        log_step_events(status);
    }
    started_ = true;
    dirty_ = false;
    state_ = kStep;
    time_ = last_successful_time_ = start_time_;
    last_mode_ = read_mode();
    return Status::ok;
}

double Instance::read_mode() const {
    double mode = -1;
    if (mode_index_ >= 0 && ely_block_get(block_, mode_index_, &mode) < 0) mode = -1;
    return mode;
}

void Instance::log_step_events(int32_t status) {
    const std::string alarms = status == ELY_WARNING ? ely_last_error() : "";
    if (alarms != last_alarms_) {
        log(Status::ok, "logEvents",
            "at t = " + number(time_) + " s: " + (alarms.empty() ? std::string("alarms cleared") : alarms));
        last_alarms_ = alarms;
    }
    const double mode = read_mode();
    if (mode != last_mode_ && last_mode_ >= 0)
        log(Status::ok, "logEvents", "at t = " + number(time_) + " s: mode " + number(last_mode_) + " -> " + number(mode) +
                                         " (0 off, 1 hot standby, 2 production, 3 starting from cold, 4 starting "
                                         "from hot standby)");
    last_mode_ = mode;
}

Status Instance::do_step(const char* function, double current_time, double step_size) {
    if (!allowed(function, kStep)) return Status::error;
    if (!std::isfinite(step_size) || step_size <= 0)
        return bad_argument(function, "communicationStepSize " + number(step_size) + " is not a finite number > 0");
    if (!std::isfinite(current_time) || std::fabs(current_time - time_) > 1e-9 * std::max(1.0, std::fabs(time_)))
        return bad_argument(function, "currentCommunicationPoint " + number(current_time) + " is not the FMU's time " +
                                          number(time_) + " s");
    drop_preview();
    dirty_ = false;
    const int32_t status = ely_block_advance(block_, step_size);
    if (status < 0) {
        // The block rolled back to the start of the step (without the inputs set since the
        // last step): the FMU is as before the call, as Discard says.
        if (standard_ == Standard::fmi2) state_ = kStepFailed;
        last_successful_time_ = time_;
        return fail(function,
                    "the step from " + number(time_) + " s by " + number(step_size) + " s is refused: " + ely_last_error(),
                    Status::discard);
    }
    double t = time_ + step_size;
    ely_block_time(block_, &t);
    time_ = last_successful_time_ = t;
    log_step_events(status);
    return Status::ok;
}

Status Instance::terminate(const char* function) {
    if (!allowed(function, kStep | kStepFailed)) return Status::error;
    drop_preview();
    state_ = kTerminated;
    log(Status::ok, "logCalls", std::string(function) + ": at t = " + number(time_) + " s");
    return Status::ok;
}

Status Instance::reset(const char* function) {
    std::string why;
    if (!load_block(why)) return fail(function, why, Status::fatal);
    log(Status::ok, "logCalls", std::string(function) + ": back to the instantiated state");
    return Status::ok;
}

Status Instance::ensure_outputs(const char* function, const ely_block** from) {
    *from = block_;
    if (state_ == kInitialization && !started_) {
        const int32_t status = ely_block_reset(block_, start_time_);
        if (status < 0) return fail(function, std::string("the plant cannot start from these inputs: ") + ely_last_error());
        started_ = true;
        dirty_ = false;
    } else if (state_ == kStep && dirty_) {
        // Outputs at the current time with the inputs just set (direct feedthrough), on a copy,
        // so that the run itself steps on exactly as ely_block_advance would.
        if (!preview_) {
            ely_block* copy = nullptr;
            if (ely_block_clone(block_, &copy) < 0) return fail(function, ely_last_error());
            if (ely_block_advance(copy, 0) < 0) {
                const std::string message = ely_last_error();
                ely_block_destroy(copy);
                return fail(function, "the outputs at the inputs just set cannot be computed: " + message);
            }
            preview_ = copy;
        }
        *from = preview_;
    }
    return Status::ok;
}

Status Instance::get_float64(const char* function, const uint32_t vr[], std::size_t n, double values[]) {
    // Both standards allow reading from Initialization Mode on (FMI 2: not in the instantiated state).
    if (!allowed(function, kInitialization | kStep | kStepFailed | kTerminated)) return Status::error;
    if (n == 0) return Status::ok;
    if (!vr || !values) return bad_argument(function, "valueReferences or values is NULL");
    const ely_block* outputs_from = nullptr;
    for (std::size_t k = 0; k < n; ++k) {
        if (standard_ == Standard::fmi3 && vr[k] == kTimeValueReference) {
            values[k] = time_;
            continue;
        }
        const Variable* v = find(vr[k]);
        if (!v) return bad_argument(function, "no Float64 variable has value reference " + std::to_string(vr[k]));
        const ely_block* from = block_;
        if (v->causality == Causality::output) {
            if (!outputs_from) {
                const Status s = ensure_outputs(function, &outputs_from);
                if (s != Status::ok) return s;
            }
            from = outputs_from;
        }
        if (ely_block_get(from, v->index, &values[k]) < 0)
            return fail(function, v->name + ": " + ely_last_error());
    }
    return Status::ok;
}

Status Instance::set_float64(const char* function, const uint32_t vr[], std::size_t n, const double values[]) {
    if (!allowed(function, kInstantiated | kInitialization | kStep)) return Status::error;
    if (n == 0) return Status::ok;
    if (!vr || !values) return bad_argument(function, "valueReferences or values is NULL");
    std::vector<std::pair<const Variable*, double>> previous;
    previous.reserve(n);
    for (std::size_t k = 0; k < n; ++k) {
        if (standard_ == Standard::fmi3 && vr[k] == kTimeValueReference)
            return bad_argument(function, "time is the independent variable and cannot be set");
        const Variable* v = find(vr[k]);
        if (!v) return bad_argument(function, "no Float64 variable has value reference " + std::to_string(vr[k]));
        if (v->causality == Causality::output) return bad_argument(function, v->name + " is an output and cannot be set");
        if (v->causality == Causality::calculated_parameter)
            return bad_argument(function, v->name + " is fixed by the plant description (resources/plant.json)");
    }
    for (std::size_t k = 0; k < n; ++k) {
        const Variable* v = find(vr[k]);
        double old = 0;
        ely_block_get(block_, v->index, &old);
        if (ely_block_set(block_, v->index, values[k]) < 0) {
            const std::string message = ely_last_error();
            for (auto it = previous.rbegin(); it != previous.rend(); ++it) ely_block_set(block_, it->first->index, it->second);
            return fail(function, v->name + " = " + number(values[k]) + " is refused, nothing was set: " + message);
        }
        previous.emplace_back(v, old);
    }
    drop_preview();
    dirty_ = true;
    started_ = false;
    return Status::ok;
}

Status Instance::no_variables_of_type(const char* function, const char* type, const uint32_t vr[], std::size_t n,
                                      bool setter) {
    if (setter && !allowed(function, kInstantiated | kInitialization | kStep)) return Status::error;
    if (n == 0) return Status::ok;
    if (!vr) return bad_argument(function, "valueReferences is NULL");
    return bad_argument(function, std::string("this FMU has no ") + type + " variables (value reference " +
                                      std::to_string(vr[0]) + "); its variables are " +
                                      (standard_ == Standard::fmi2 ? "Real" : "Float64"));
}

// ---- FMU states ---------------------------------------------------------------------------------

Status Instance::get_state(const char* function, void** state) {
    if (!state) return bad_argument(function, "the FMU state pointer is NULL");
    SavedState* target = static_cast<SavedState*>(*state);
    if (target && !states_.count(target)) return bad_argument(function, "*FMUState is not an FMU state of this instance");
    std::size_t length = 0;
    if (ely_block_save_state(block_, nullptr, 0, &length) < 0) return fail(function, ely_last_error());
    std::string bytes(length, '\0');
    if (ely_block_save_state(block_, bytes.data(), bytes.size(), &length) < 0) return fail(function, ely_last_error());
    std::unique_ptr<SavedState> fresh;
    if (!target) {
        fresh.reset(new SavedState);
        target = fresh.get();
    }
    target->block = std::move(bytes);
    target->state = state_;
    target->start_time = start_time_;
    target->time = time_;
    target->last_successful_time = last_successful_time_;
    target->last_mode = last_mode_;
    target->started = started_;
    target->dirty = dirty_;
    if (fresh) states_.insert(fresh.release());
    *state = target;
    log(Status::ok, "logCalls", std::string(function) + ": at t = " + number(time_) + " s");
    return Status::ok;
}

Status Instance::set_state(const char* function, void* state) {
    SavedState* s = static_cast<SavedState*>(state);
    if (!s || !states_.count(s)) return bad_argument(function, "FMUState is not an FMU state of this instance");
    if (ely_block_restore_state(block_, s->block.data(), s->block.size()) < 0) return fail(function, ely_last_error());
    drop_preview();
    state_ = s->state;
    start_time_ = s->start_time;
    time_ = s->time;
    last_successful_time_ = s->last_successful_time;
    last_mode_ = s->last_mode;
    started_ = s->started;
    dirty_ = s->dirty;
    log(Status::ok, "logCalls", std::string(function) + ": back at t = " + number(time_) + " s");
    return Status::ok;
}

Status Instance::free_state(const char* function, void** state) {
    if (!state) return bad_argument(function, "the FMU state pointer is NULL");
    if (!*state) return Status::ok;
    SavedState* s = static_cast<SavedState*>(*state);
    if (!states_.erase(s)) return bad_argument(function, "*FMUState is not an FMU state of this instance");
    delete s;
    *state = nullptr;
    return Status::ok;
}

Status Instance::serialized_size(const char* function, void* state, std::size_t* size) {
    SavedState* s = static_cast<SavedState*>(state);
    if (!s || !states_.count(s)) return bad_argument(function, "FMUState is not an FMU state of this instance");
    if (!size) return bad_argument(function, "size is NULL");
    *size = kHeaderSize + s->block.size();
    return Status::ok;
}

Status Instance::serialize(const char* function, void* state, unsigned char* bytes, std::size_t size) {
    SavedState* s = static_cast<SavedState*>(state);
    if (!s || !states_.count(s)) return bad_argument(function, "FMUState is not an FMU state of this instance");
    const std::size_t needed = kHeaderSize + s->block.size();
    if (!bytes || size < needed)
        return bad_argument(function, "the buffer holds " + std::to_string(size) + " bytes; the state needs " +
                                          std::to_string(needed) + " (SerializedFMUStateSize)");
    unsigned char* p = bytes;
    auto put = [&p](const void* data, std::size_t n) {
        std::memcpy(p, data, n);
        p += n;
    };
    const uint32_t standard = static_cast<uint32_t>(standard_);
    const uint64_t length = s->block.size();
    const unsigned char flags[2] = {static_cast<unsigned char>(s->started), static_cast<unsigned char>(s->dirty)};
    put(kMagic, sizeof kMagic);
    put(&standard, 4);
    put(&s->state, 4);
    put(&s->start_time, 8);
    put(&s->time, 8);
    put(&s->last_successful_time, 8);
    put(&s->last_mode, 8);
    put(flags, 2);
    put(&length, 8);
    put(s->block.data(), s->block.size());
    return Status::ok;
}

Status Instance::deserialize(const char* function, const unsigned char* bytes, std::size_t size, void** state) {
    if (!state) return bad_argument(function, "the FMU state pointer is NULL");
    if (!bytes) return bad_argument(function, "serializedState is NULL");
    auto refuse = [&](const std::string& why) { return bad_argument(function, "not a serialized state of this FMU: " + why); };
    if (size < kHeaderSize || std::memcmp(bytes, kMagic, sizeof kMagic) != 0) return refuse("no header");
    const unsigned char* p = bytes + sizeof kMagic;
    auto take = [&p](void* data, std::size_t n) {
        std::memcpy(data, p, n);
        p += n;
    };
    auto s = std::make_unique<SavedState>();
    uint32_t standard = 0;
    uint64_t length = 0;
    unsigned char flags[2] = {};
    take(&standard, 4);
    take(&s->state, 4);
    take(&s->start_time, 8);
    take(&s->time, 8);
    take(&s->last_successful_time, 8);
    take(&s->last_mode, 8);
    take(flags, 2);
    take(&length, 8);
    if (standard != static_cast<uint32_t>(standard_)) return refuse("saved by an FMI " + std::to_string(standard) + " FMU");
    if (length != size - kHeaderSize) return refuse("cut short or too long");
    if (s->state == 0 || (s->state & (s->state - 1)) != 0 || (s->state & ~kAnyState) != 0) return refuse("bad state");
    s->started = flags[0] != 0;
    s->dirty = flags[1] != 0;
    s->block.assign(reinterpret_cast<const char*>(p), length);
    // The block checks its bytes (plant, library version, integrity) when they are restored: try
    // them on a copy now, so that a foreign state is refused here and not at SetFMUState.
    ely_block* probe = nullptr;
    if (ely_block_clone(block_, &probe) < 0) return fail(function, ely_last_error());
    const int32_t status = ely_block_restore_state(probe, s->block.data(), s->block.size());
    const std::string message = status < 0 ? ely_last_error() : "";
    ely_block_destroy(probe);
    if (status < 0) return refuse(message);
    SavedState* raw = s.release();
    states_.insert(raw);
    *state = raw;
    return Status::ok;
}

}  // namespace elyfmi
