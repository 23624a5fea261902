// FMI 2.0 Co-Simulation entry points: each translates its arguments and status to the shared
// glue (instance.hpp) and back. Model Exchange functions are exported, as the standard's header
// declares them, and answer fmi2Error: this FMU is Co-Simulation only.
#include <cctype>
#include <cstring>
#include <string>

#include "fmi2_api.h"
#include "instance.hpp"

using elyfmi::Instance;
using elyfmi::Status;

namespace {

fmi2Status to_fmi2(Status s) { return static_cast<fmi2Status>(static_cast<int>(s)); }

Instance* live(fmi2Component c) { return Instance::is_live(c) ? static_cast<Instance*>(c) : nullptr; }

// An FMI 2 resource location is a URI ("file:///path/resources", "file:/path", "file://localhost/path").
bool uri_to_path(const char* uri, std::string& path) {
    std::string u = uri;
    if (u.rfind("file://localhost/", 0) == 0)
        u = u.substr(16);
    else if (u.rfind("file:///", 0) == 0)
        u = u.substr(7);
    else if (u.rfind("file:/", 0) == 0)
        u = u.substr(5);
    else
        return false;
    path.clear();
    for (std::size_t i = 0; i < u.size(); ++i) {
        if (u[i] == '%' && i + 2 < u.size() && std::isxdigit(static_cast<unsigned char>(u[i + 1])) &&
            std::isxdigit(static_cast<unsigned char>(u[i + 2]))) {
            path += static_cast<char>(std::stoi(u.substr(i + 1, 2), nullptr, 16));
            i += 2;
        } else {
            path += u[i];
        }
    }
#ifdef _WIN32
    // "file:///C:/dir" names the path C:/dir (RFC 8089, appendix E.2: a drive letter after the slash).
    if (path.size() >= 3 && path[0] == '/' && std::isalpha(static_cast<unsigned char>(path[1])) && path[2] == ':')
        path.erase(0, 1);
#endif
    return true;
}

// The logger takes a printf format: a message goes through with its '%' doubled.
std::string as_format(const std::string& message) {
    std::string out;
    for (char c : message) out += c == '%' ? std::string("%%") : std::string(1, c);
    return out;
}

template <class F>
fmi2Status call(fmi2Component c, const char* function, F&& body) {
    Instance* instance = live(c);
    if (!instance) return fmi2Error;  // NULL, freed or foreign: no logger to tell
    return to_fmi2(elyfmi::guarded(instance, function, [&] { return body(*instance); }));
}

fmi2Status not_for_cosimulation(fmi2Component c, const char* function) {
    return call(c, function, [&](Instance& i) {
        return i.unsupported(function, "a Model Exchange function; this FMU implements Co-Simulation only");
    });
}

}  // namespace

extern "C" {

const char* fmi2GetTypesPlatform(void) { return fmi2TypesPlatform; }
const char* fmi2GetVersion(void) { return fmi2Version; }

fmi2Status fmi2SetDebugLogging(fmi2Component c, fmi2Boolean loggingOn, size_t nCategories,
                               const fmi2String categories[]) {
    return call(c, "fmi2SetDebugLogging",
                [&](Instance& i) { return i.set_debug_logging(loggingOn != fmi2False, nCategories, categories); });
}

fmi2Component fmi2Instantiate(fmi2String instanceName, fmi2Type fmuType, fmi2String fmuGUID,
                              fmi2String fmuResourceLocation, const fmi2CallbackFunctions* functions,
                              fmi2Boolean visible, fmi2Boolean loggingOn) {
    (void)visible;
    try {
        elyfmi::LogSink sink;
        if (functions && functions->logger) {
            const fmi2CallbackLogger logger = functions->logger;
            const fmi2ComponentEnvironment environment = functions->componentEnvironment;
            const std::string name = instanceName ? instanceName : "";
            sink = [logger, environment, name](Status s, const char* category, const std::string& message) {
                logger(environment, name.c_str(), to_fmi2(s), category, as_format(message).c_str());
            };
        }
        auto refuse = [&](const std::string& why) -> fmi2Component {
            if (sink) sink(Status::error, "logStatusError", "fmi2Instantiate: " + why);
            return nullptr;
        };
        if (!functions) return nullptr;  // no callbacks, not even a logger to say so
        if (fmuType != fmi2CoSimulation)
            return refuse("this FMU implements Co-Simulation only (fmuType must be fmi2CoSimulation)");
        std::string resources;
        if (!fmuResourceLocation || !uri_to_path(fmuResourceLocation, resources))
            return refuse(std::string("fmuResourceLocation ") + (fmuResourceLocation ? fmuResourceLocation : "(NULL)") +
                          " is not a file: URI");
        return Instance::create(elyfmi::Standard::fmi2, instanceName, fmuGUID, resources, loggingOn != fmi2False,
                                std::move(sink));
    } catch (...) {
        return nullptr;
    }
}

void fmi2FreeInstance(fmi2Component c) {
    if (Instance* instance = live(c)) Instance::destroy(instance);
}

fmi2Status fmi2SetupExperiment(fmi2Component c, fmi2Boolean toleranceDefined, fmi2Real tolerance, fmi2Real startTime,
                               fmi2Boolean stopTimeDefined, fmi2Real stopTime) {
    return call(c, "fmi2SetupExperiment", [&](Instance& i) {
        return i.setup_experiment("fmi2SetupExperiment", toleranceDefined != fmi2False, tolerance, startTime,
                                  stopTimeDefined != fmi2False, stopTime);
    });
}

fmi2Status fmi2EnterInitializationMode(fmi2Component c) {
    return call(c, "fmi2EnterInitializationMode",
                [&](Instance& i) { return i.enter_initialization("fmi2EnterInitializationMode"); });
}

fmi2Status fmi2ExitInitializationMode(fmi2Component c) {
    return call(c, "fmi2ExitInitializationMode",
                [&](Instance& i) { return i.exit_initialization("fmi2ExitInitializationMode"); });
}

fmi2Status fmi2Terminate(fmi2Component c) {
    return call(c, "fmi2Terminate", [&](Instance& i) { return i.terminate("fmi2Terminate"); });
}

fmi2Status fmi2Reset(fmi2Component c) {
    return call(c, "fmi2Reset", [&](Instance& i) { return i.reset("fmi2Reset"); });
}

fmi2Status fmi2GetReal(fmi2Component c, const fmi2ValueReference vr[], size_t nvr, fmi2Real value[]) {
    return call(c, "fmi2GetReal", [&](Instance& i) { return i.get_float64("fmi2GetReal", vr, nvr, value); });
}

fmi2Status fmi2SetReal(fmi2Component c, const fmi2ValueReference vr[], size_t nvr, const fmi2Real value[]) {
    return call(c, "fmi2SetReal", [&](Instance& i) { return i.set_float64("fmi2SetReal", vr, nvr, value); });
}

#define ELY_FMI2_NO_VARIABLES(Verb, Name, Type, setter)                                                           \
    fmi2Status fmi2##Verb##Name(fmi2Component c, const fmi2ValueReference vr[], size_t nvr, Type value[]) {     \
        (void)value;                                                                                                \
        return call(c, "fmi2" #Verb #Name,                                                                          \
                    [&](Instance& i) { return i.no_variables_of_type("fmi2" #Verb #Name, #Name, vr, nvr, setter); }); \
    }
ELY_FMI2_NO_VARIABLES(Get, Integer, fmi2Integer, false)
ELY_FMI2_NO_VARIABLES(Get, Boolean, fmi2Boolean, false)
ELY_FMI2_NO_VARIABLES(Get, String, fmi2String, false)
ELY_FMI2_NO_VARIABLES(Set, Integer, const fmi2Integer, true)
ELY_FMI2_NO_VARIABLES(Set, Boolean, const fmi2Boolean, true)
ELY_FMI2_NO_VARIABLES(Set, String, const fmi2String, true)

fmi2Status fmi2GetFMUstate(fmi2Component c, fmi2FMUstate* FMUstate) {
    return call(c, "fmi2GetFMUstate", [&](Instance& i) { return i.get_state("fmi2GetFMUstate", FMUstate); });
}

fmi2Status fmi2SetFMUstate(fmi2Component c, fmi2FMUstate FMUstate) {
    return call(c, "fmi2SetFMUstate", [&](Instance& i) { return i.set_state("fmi2SetFMUstate", FMUstate); });
}

fmi2Status fmi2FreeFMUstate(fmi2Component c, fmi2FMUstate* FMUstate) {
    return call(c, "fmi2FreeFMUstate", [&](Instance& i) { return i.free_state("fmi2FreeFMUstate", FMUstate); });
}

fmi2Status fmi2SerializedFMUstateSize(fmi2Component c, fmi2FMUstate FMUstate, size_t* size) {
    return call(c, "fmi2SerializedFMUstateSize",
                [&](Instance& i) { return i.serialized_size("fmi2SerializedFMUstateSize", FMUstate, size); });
}

fmi2Status fmi2SerializeFMUstate(fmi2Component c, fmi2FMUstate FMUstate, fmi2Byte serializedState[], size_t size) {
    return call(c, "fmi2SerializeFMUstate", [&](Instance& i) {
        return i.serialize("fmi2SerializeFMUstate", FMUstate, reinterpret_cast<unsigned char*>(serializedState), size);
    });
}

fmi2Status fmi2DeSerializeFMUstate(fmi2Component c, const fmi2Byte serializedState[], size_t size,
                                   fmi2FMUstate* FMUstate) {
    return call(c, "fmi2DeSerializeFMUstate", [&](Instance& i) {
        return i.deserialize("fmi2DeSerializeFMUstate", reinterpret_cast<const unsigned char*>(serializedState), size,
                             FMUstate);
    });
}

fmi2Status fmi2GetDirectionalDerivative(fmi2Component c, const fmi2ValueReference[], size_t,
                                        const fmi2ValueReference[], size_t, const fmi2Real[], fmi2Real[]) {
    return call(c, "fmi2GetDirectionalDerivative", [&](Instance& i) {
        return i.unsupported("fmi2GetDirectionalDerivative",
                             "not provided (providesDirectionalDerivative is false in the model description)");
    });
}

// ---- Model Exchange ---------------------------------------------------------------------------

fmi2Status fmi2EnterEventMode(fmi2Component c) { return not_for_cosimulation(c, "fmi2EnterEventMode"); }
fmi2Status fmi2NewDiscreteStates(fmi2Component c, fmi2EventInfo*) {
    return not_for_cosimulation(c, "fmi2NewDiscreteStates");
}
fmi2Status fmi2EnterContinuousTimeMode(fmi2Component c) {
    return not_for_cosimulation(c, "fmi2EnterContinuousTimeMode");
}
fmi2Status fmi2CompletedIntegratorStep(fmi2Component c, fmi2Boolean, fmi2Boolean*, fmi2Boolean*) {
    return not_for_cosimulation(c, "fmi2CompletedIntegratorStep");
}
fmi2Status fmi2SetTime(fmi2Component c, fmi2Real) { return not_for_cosimulation(c, "fmi2SetTime"); }
fmi2Status fmi2SetContinuousStates(fmi2Component c, const fmi2Real[], size_t) {
    return not_for_cosimulation(c, "fmi2SetContinuousStates");
}
fmi2Status fmi2GetDerivatives(fmi2Component c, fmi2Real[], size_t) {
    return not_for_cosimulation(c, "fmi2GetDerivatives");
}
fmi2Status fmi2GetEventIndicators(fmi2Component c, fmi2Real[], size_t) {
    return not_for_cosimulation(c, "fmi2GetEventIndicators");
}
fmi2Status fmi2GetContinuousStates(fmi2Component c, fmi2Real[], size_t) {
    return not_for_cosimulation(c, "fmi2GetContinuousStates");
}
fmi2Status fmi2GetNominalsOfContinuousStates(fmi2Component c, fmi2Real[], size_t) {
    return not_for_cosimulation(c, "fmi2GetNominalsOfContinuousStates");
}

// ---- Co-Simulation ----------------------------------------------------------------------------

fmi2Status fmi2SetRealInputDerivatives(fmi2Component c, const fmi2ValueReference[], size_t, const fmi2Integer[],
                                       const fmi2Real[]) {
    return call(c, "fmi2SetRealInputDerivatives", [&](Instance& i) {
        return i.unsupported("fmi2SetRealInputDerivatives",
                             "inputs are held over a step (canInterpolateInputs is false in the model description)");
    });
}

fmi2Status fmi2GetRealOutputDerivatives(fmi2Component c, const fmi2ValueReference[], size_t, const fmi2Integer[],
                                        fmi2Real[]) {
    return call(c, "fmi2GetRealOutputDerivatives", [&](Instance& i) {
        return i.unsupported("fmi2GetRealOutputDerivatives",
                             "not provided (maxOutputDerivativeOrder is 0 in the model description)");
    });
}

fmi2Status fmi2DoStep(fmi2Component c, fmi2Real currentCommunicationPoint, fmi2Real communicationStepSize,
                      fmi2Boolean noSetFMUStatePriorToCurrentPoint) {
    (void)noSetFMUStatePriorToCurrentPoint;
    return call(c, "fmi2DoStep",
                [&](Instance& i) { return i.do_step("fmi2DoStep", currentCommunicationPoint, communicationStepSize); });
}

fmi2Status fmi2CancelStep(fmi2Component c) {
    return call(c, "fmi2CancelStep", [&](Instance& i) {
        return i.unsupported("fmi2CancelStep", "steps run synchronously and never return fmi2Pending");
    });
}

fmi2Status fmi2GetStatus(fmi2Component c, const fmi2StatusKind s, fmi2Status* value) {
    return call(c, "fmi2GetStatus", [&](Instance& i) {
        (void)s;
        (void)value;
        return i.unsupported("fmi2GetStatus", "steps run synchronously: there is no pending step to ask about");
    });
}

fmi2Status fmi2GetRealStatus(fmi2Component c, const fmi2StatusKind s, fmi2Real* value) {
    return call(c, "fmi2GetRealStatus", [&](Instance& i) {
        if (s != fmi2LastSuccessfulTime)
            return i.bad_argument("fmi2GetRealStatus", "only fmi2LastSuccessfulTime is a Real status");
        if (!value) return i.bad_argument("fmi2GetRealStatus", "value is NULL");
        if (!i.allowed("fmi2GetRealStatus", elyfmi::kStep | elyfmi::kStepFailed | elyfmi::kTerminated))
            return Status::error;
        *value = i.last_successful_time();
        return Status::ok;
    });
}

fmi2Status fmi2GetIntegerStatus(fmi2Component c, const fmi2StatusKind, fmi2Integer*) {
    return call(c, "fmi2GetIntegerStatus",
                [&](Instance& i) { return i.unsupported("fmi2GetIntegerStatus", "the standard defines no Integer status"); });
}

fmi2Status fmi2GetBooleanStatus(fmi2Component c, const fmi2StatusKind s, fmi2Boolean* value) {
    return call(c, "fmi2GetBooleanStatus", [&](Instance& i) {
        if (s != fmi2Terminated) return i.bad_argument("fmi2GetBooleanStatus", "only fmi2Terminated is a Boolean status");
        if (!value) return i.bad_argument("fmi2GetBooleanStatus", "value is NULL");
        if (!i.allowed("fmi2GetBooleanStatus", elyfmi::kStep | elyfmi::kStepFailed | elyfmi::kTerminated))
            return Status::error;
        *value = fmi2False;  // the plant never asks to end the simulation
        return Status::ok;
    });
}

fmi2Status fmi2GetStringStatus(fmi2Component c, const fmi2StatusKind, fmi2String*) {
    return call(c, "fmi2GetStringStatus", [&](Instance& i) {
        return i.unsupported("fmi2GetStringStatus", "steps run synchronously: there is no pending status text");
    });
}

}  // extern "C"
