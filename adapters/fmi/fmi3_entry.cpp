// FMI 3.0 Co-Simulation entry points: each translates its arguments and status to the shared
// glue (instance.hpp) and back. Every function of the standard's header is exported; those of
// Model Exchange, Scheduled Execution, clocks, event mode and derivatives answer fmi3Error with a
// log message saying why.
#include <string>

#include "fmi3_api.h"
#include "instance.hpp"

using elyfmi::Instance;
using elyfmi::Status;

namespace {

fmi3Status to_fmi3(Status s) { return static_cast<fmi3Status>(static_cast<int>(s)); }

Instance* live(fmi3Instance c) { return Instance::is_live(c) ? static_cast<Instance*>(c) : nullptr; }

template <class F>
fmi3Status call(fmi3Instance c, const char* function, F&& body) {
    Instance* instance = live(c);
    if (!instance) return fmi3Error;  // NULL, freed or foreign: no logger to tell
    return to_fmi3(elyfmi::guarded(instance, function, [&] { return body(*instance); }));
}

fmi3Status unsupported(fmi3Instance c, const char* function, const char* why) {
    return call(c, function, [&](Instance& i) { return i.unsupported(function, why); });
}

constexpr const char* kModelExchange = "a Model Exchange function; this FMU implements Co-Simulation only";
constexpr const char* kNoClocks = "this FMU has no clocks";
constexpr const char* kNoEventMode = "this FMU has no event mode (hasEventMode is false in the model description)";

elyfmi::LogSink make_sink(fmi3InstanceEnvironment environment, fmi3LogMessageCallback log) {
    if (!log) return {};
    return [environment, log](Status s, const char* category, const std::string& message) {
        log(environment, to_fmi3(s), category, message.c_str());
    };
}

fmi3Instance refuse_instantiation(fmi3InstanceEnvironment environment, fmi3LogMessageCallback log,
                                  const char* function, const char* why) {
    if (log) log(environment, fmi3Error, "logStatusError", (std::string(function) + ": " + why).c_str());
    return nullptr;
}

}  // namespace

extern "C" {

const char* fmi3GetVersion(void) { return fmi3Version; }

fmi3Status fmi3SetDebugLogging(fmi3Instance instance, fmi3Boolean loggingOn, size_t nCategories,
                               const fmi3String categories[]) {
    return call(instance, "fmi3SetDebugLogging",
                [&](Instance& i) { return i.set_debug_logging(loggingOn, nCategories, categories); });
}

fmi3Instance fmi3InstantiateModelExchange(fmi3String, fmi3String, fmi3String, fmi3Boolean, fmi3Boolean,
                                          fmi3InstanceEnvironment instanceEnvironment, fmi3LogMessageCallback logMessage) {
    return refuse_instantiation(instanceEnvironment, logMessage, "fmi3InstantiateModelExchange",
                                "this FMU implements Co-Simulation only");
}

fmi3Instance fmi3InstantiateCoSimulation(fmi3String instanceName, fmi3String instantiationToken,
                                         fmi3String resourcePath, fmi3Boolean visible, fmi3Boolean loggingOn,
                                         fmi3Boolean eventModeUsed, fmi3Boolean earlyReturnAllowed,
                                         const fmi3ValueReference requiredIntermediateVariables[],
                                         size_t nRequiredIntermediateVariables,
                                         fmi3InstanceEnvironment instanceEnvironment, fmi3LogMessageCallback logMessage,
                                         fmi3IntermediateUpdateCallback intermediateUpdate) {
    (void)visible;
    (void)earlyReturnAllowed;  // steps never return early
    (void)requiredIntermediateVariables;
    (void)nRequiredIntermediateVariables;
    (void)intermediateUpdate;  // providesIntermediateUpdate is false
    try {
        const char* function = "fmi3InstantiateCoSimulation";
        if (eventModeUsed)
            return refuse_instantiation(instanceEnvironment, logMessage, function,
                                        "eventModeUsed is true, but this FMU has no event mode (hasEventMode is false)");
        if (!resourcePath)
            return refuse_instantiation(instanceEnvironment, logMessage, function,
                                        "resourcePath is NULL (the FMU needs resources/plant.json)");
        return Instance::create(elyfmi::Standard::fmi3, instanceName, instantiationToken, resourcePath, loggingOn,
                                make_sink(instanceEnvironment, logMessage));
    } catch (...) {
        return nullptr;
    }
}

fmi3Instance fmi3InstantiateScheduledExecution(fmi3String, fmi3String, fmi3String, fmi3Boolean, fmi3Boolean,
                                               fmi3InstanceEnvironment instanceEnvironment,
                                               fmi3LogMessageCallback logMessage, fmi3ClockUpdateCallback,
                                               fmi3LockPreemptionCallback, fmi3UnlockPreemptionCallback) {
    return refuse_instantiation(instanceEnvironment, logMessage, "fmi3InstantiateScheduledExecution",
                                "this FMU implements Co-Simulation only");
}

void fmi3FreeInstance(fmi3Instance instance) {
    if (Instance* i = live(instance)) Instance::destroy(i);
}

fmi3Status fmi3EnterInitializationMode(fmi3Instance instance, fmi3Boolean toleranceDefined, fmi3Float64 tolerance,
                                       fmi3Float64 startTime, fmi3Boolean stopTimeDefined, fmi3Float64 stopTime) {
    return call(instance, "fmi3EnterInitializationMode", [&](Instance& i) {
        const char* function = "fmi3EnterInitializationMode";
        if (!i.allowed(function, elyfmi::kInstantiated)) return Status::error;
        const Status s = i.setup_experiment(function, toleranceDefined, tolerance, startTime, stopTimeDefined, stopTime);
        return s != Status::ok ? s : i.enter_initialization(function);
    });
}

fmi3Status fmi3ExitInitializationMode(fmi3Instance instance) {
    return call(instance, "fmi3ExitInitializationMode",
                [&](Instance& i) { return i.exit_initialization("fmi3ExitInitializationMode"); });
}

fmi3Status fmi3EnterEventMode(fmi3Instance instance) { return unsupported(instance, "fmi3EnterEventMode", kNoEventMode); }

fmi3Status fmi3Terminate(fmi3Instance instance) {
    return call(instance, "fmi3Terminate", [&](Instance& i) { return i.terminate("fmi3Terminate"); });
}

fmi3Status fmi3Reset(fmi3Instance instance) {
    return call(instance, "fmi3Reset", [&](Instance& i) { return i.reset("fmi3Reset"); });
}

fmi3Status fmi3GetFloat64(fmi3Instance instance, const fmi3ValueReference valueReferences[], size_t nValueReferences,
                          fmi3Float64 values[], size_t nValues) {
    return call(instance, "fmi3GetFloat64", [&](Instance& i) {
        if (nValues != nValueReferences)
            return i.bad_argument("fmi3GetFloat64", "nValues " + std::to_string(nValues) + " is not nValueReferences " +
                                                        std::to_string(nValueReferences) + " (every variable is a scalar)");
        return i.get_float64("fmi3GetFloat64", valueReferences, nValueReferences, values);
    });
}

fmi3Status fmi3SetFloat64(fmi3Instance instance, const fmi3ValueReference valueReferences[], size_t nValueReferences,
                          const fmi3Float64 values[], size_t nValues) {
    return call(instance, "fmi3SetFloat64", [&](Instance& i) {
        if (nValues != nValueReferences)
            return i.bad_argument("fmi3SetFloat64", "nValues " + std::to_string(nValues) + " is not nValueReferences " +
                                                        std::to_string(nValueReferences) + " (every variable is a scalar)");
        return i.set_float64("fmi3SetFloat64", valueReferences, nValueReferences, values);
    });
}

#define ELY_FMI3_NO_GETTER(Name, Type)                                                                         \
    fmi3Status fmi3Get##Name(fmi3Instance instance, const fmi3ValueReference valueReferences[],                \
                             size_t nValueReferences, Type values[], size_t nValues) {                         \
        (void)values;                                                                                          \
        (void)nValues;                                                                                         \
        return call(instance, "fmi3Get" #Name, [&](Instance& i) {                                              \
            return i.no_variables_of_type("fmi3Get" #Name, #Name, valueReferences, nValueReferences, false);   \
        });                                                                                                    \
    }
#define ELY_FMI3_NO_SETTER(Name, Type)                                                                         \
    fmi3Status fmi3Set##Name(fmi3Instance instance, const fmi3ValueReference valueReferences[],                \
                             size_t nValueReferences, const Type values[], size_t nValues) {                   \
        (void)values;                                                                                          \
        (void)nValues;                                                                                         \
        return call(instance, "fmi3Set" #Name, [&](Instance& i) {                                              \
            return i.no_variables_of_type("fmi3Set" #Name, #Name, valueReferences, nValueReferences, true);    \
        });                                                                                                    \
    }
#define ELY_FMI3_OTHER_TYPES(X)                                                                               \
    X(Float32, fmi3Float32) X(Int8, fmi3Int8) X(UInt8, fmi3UInt8) X(Int16, fmi3Int16) X(UInt16, fmi3UInt16)   \
    X(Int32, fmi3Int32) X(UInt32, fmi3UInt32) X(Int64, fmi3Int64) X(UInt64, fmi3UInt64) X(Boolean, fmi3Boolean) \
    X(String, fmi3String)
ELY_FMI3_OTHER_TYPES(ELY_FMI3_NO_GETTER)
ELY_FMI3_OTHER_TYPES(ELY_FMI3_NO_SETTER)

fmi3Status fmi3GetBinary(fmi3Instance instance, const fmi3ValueReference valueReferences[], size_t nValueReferences,
                         size_t[], fmi3Binary[], size_t) {
    return call(instance, "fmi3GetBinary", [&](Instance& i) {
        return i.no_variables_of_type("fmi3GetBinary", "Binary", valueReferences, nValueReferences, false);
    });
}

fmi3Status fmi3SetBinary(fmi3Instance instance, const fmi3ValueReference valueReferences[], size_t nValueReferences,
                         const size_t[], const fmi3Binary[], size_t) {
    return call(instance, "fmi3SetBinary", [&](Instance& i) {
        return i.no_variables_of_type("fmi3SetBinary", "Binary", valueReferences, nValueReferences, true);
    });
}

fmi3Status fmi3GetClock(fmi3Instance instance, const fmi3ValueReference[], size_t, fmi3Clock[]) {
    return unsupported(instance, "fmi3GetClock", kNoClocks);
}
fmi3Status fmi3SetClock(fmi3Instance instance, const fmi3ValueReference[], size_t, const fmi3Clock[]) {
    return unsupported(instance, "fmi3SetClock", kNoClocks);
}

fmi3Status fmi3GetNumberOfVariableDependencies(fmi3Instance instance, fmi3ValueReference, size_t*) {
    return unsupported(instance, "fmi3GetNumberOfVariableDependencies",
                       "not provided: every output may depend on every input and on the state");
}
fmi3Status fmi3GetVariableDependencies(fmi3Instance instance, fmi3ValueReference, size_t[], fmi3ValueReference[],
                                       size_t[], fmi3DependencyKind[], size_t) {
    return unsupported(instance, "fmi3GetVariableDependencies",
                       "not provided: every output may depend on every input and on the state");
}

fmi3Status fmi3GetFMUState(fmi3Instance instance, fmi3FMUState* FMUState) {
    return call(instance, "fmi3GetFMUState", [&](Instance& i) { return i.get_state("fmi3GetFMUState", FMUState); });
}
fmi3Status fmi3SetFMUState(fmi3Instance instance, fmi3FMUState FMUState) {
    return call(instance, "fmi3SetFMUState", [&](Instance& i) { return i.set_state("fmi3SetFMUState", FMUState); });
}
fmi3Status fmi3FreeFMUState(fmi3Instance instance, fmi3FMUState* FMUState) {
    return call(instance, "fmi3FreeFMUState", [&](Instance& i) { return i.free_state("fmi3FreeFMUState", FMUState); });
}
fmi3Status fmi3SerializedFMUStateSize(fmi3Instance instance, fmi3FMUState FMUState, size_t* size) {
    return call(instance, "fmi3SerializedFMUStateSize",
                [&](Instance& i) { return i.serialized_size("fmi3SerializedFMUStateSize", FMUState, size); });
}
fmi3Status fmi3SerializeFMUState(fmi3Instance instance, fmi3FMUState FMUState, fmi3Byte serializedState[], size_t size) {
    return call(instance, "fmi3SerializeFMUState",
                [&](Instance& i) { return i.serialize("fmi3SerializeFMUState", FMUState, serializedState, size); });
}
fmi3Status fmi3DeserializeFMUState(fmi3Instance instance, const fmi3Byte serializedState[], size_t size,
                                   fmi3FMUState* FMUState) {
    return call(instance, "fmi3DeserializeFMUState", [&](Instance& i) {
        return i.deserialize("fmi3DeserializeFMUState", serializedState, size, FMUState);
    });
}

fmi3Status fmi3GetDirectionalDerivative(fmi3Instance instance, const fmi3ValueReference[], size_t,
                                        const fmi3ValueReference[], size_t, const fmi3Float64[], size_t, fmi3Float64[],
                                        size_t) {
    return unsupported(instance, "fmi3GetDirectionalDerivative",
                       "not provided (providesDirectionalDerivatives is false in the model description)");
}
fmi3Status fmi3GetAdjointDerivative(fmi3Instance instance, const fmi3ValueReference[], size_t,
                                    const fmi3ValueReference[], size_t, const fmi3Float64[], size_t, fmi3Float64[],
                                    size_t) {
    return unsupported(instance, "fmi3GetAdjointDerivative",
                       "not provided (providesAdjointDerivatives is false in the model description)");
}

fmi3Status fmi3EnterConfigurationMode(fmi3Instance instance) {
    return unsupported(instance, "fmi3EnterConfigurationMode",
                       "this FMU has no structural parameters: its structure comes from resources/plant.json");
}
fmi3Status fmi3ExitConfigurationMode(fmi3Instance instance) {
    return unsupported(instance, "fmi3ExitConfigurationMode",
                       "this FMU has no structural parameters: its structure comes from resources/plant.json");
}
fmi3Status fmi3GetIntervalDecimal(fmi3Instance instance, const fmi3ValueReference[], size_t, fmi3Float64[],
                                  fmi3IntervalQualifier[]) {
    return unsupported(instance, "fmi3GetIntervalDecimal", kNoClocks);
}
fmi3Status fmi3GetIntervalFraction(fmi3Instance instance, const fmi3ValueReference[], size_t, fmi3UInt64[],
                                   fmi3UInt64[], fmi3IntervalQualifier[]) {
    return unsupported(instance, "fmi3GetIntervalFraction", kNoClocks);
}
fmi3Status fmi3GetShiftDecimal(fmi3Instance instance, const fmi3ValueReference[], size_t, fmi3Float64[]) {
    return unsupported(instance, "fmi3GetShiftDecimal", kNoClocks);
}
fmi3Status fmi3GetShiftFraction(fmi3Instance instance, const fmi3ValueReference[], size_t, fmi3UInt64[], fmi3UInt64[]) {
    return unsupported(instance, "fmi3GetShiftFraction", kNoClocks);
}
fmi3Status fmi3SetIntervalDecimal(fmi3Instance instance, const fmi3ValueReference[], size_t, const fmi3Float64[]) {
    return unsupported(instance, "fmi3SetIntervalDecimal", kNoClocks);
}
fmi3Status fmi3SetIntervalFraction(fmi3Instance instance, const fmi3ValueReference[], size_t, const fmi3UInt64[],
                                   const fmi3UInt64[]) {
    return unsupported(instance, "fmi3SetIntervalFraction", kNoClocks);
}
fmi3Status fmi3SetShiftDecimal(fmi3Instance instance, const fmi3ValueReference[], size_t, const fmi3Float64[]) {
    return unsupported(instance, "fmi3SetShiftDecimal", kNoClocks);
}
fmi3Status fmi3SetShiftFraction(fmi3Instance instance, const fmi3ValueReference[], size_t, const fmi3UInt64[],
                                const fmi3UInt64[]) {
    return unsupported(instance, "fmi3SetShiftFraction", kNoClocks);
}
fmi3Status fmi3EvaluateDiscreteStates(fmi3Instance instance) {
    return unsupported(instance, "fmi3EvaluateDiscreteStates", kNoEventMode);
}
fmi3Status fmi3UpdateDiscreteStates(fmi3Instance instance, fmi3Boolean*, fmi3Boolean*, fmi3Boolean*, fmi3Boolean*,
                                    fmi3Boolean*, fmi3Float64*) {
    return unsupported(instance, "fmi3UpdateDiscreteStates", kNoEventMode);
}

fmi3Status fmi3EnterContinuousTimeMode(fmi3Instance instance) {
    return unsupported(instance, "fmi3EnterContinuousTimeMode", kModelExchange);
}
fmi3Status fmi3CompletedIntegratorStep(fmi3Instance instance, fmi3Boolean, fmi3Boolean*, fmi3Boolean*) {
    return unsupported(instance, "fmi3CompletedIntegratorStep", kModelExchange);
}
fmi3Status fmi3SetTime(fmi3Instance instance, fmi3Float64) { return unsupported(instance, "fmi3SetTime", kModelExchange); }
fmi3Status fmi3SetContinuousStates(fmi3Instance instance, const fmi3Float64[], size_t) {
    return unsupported(instance, "fmi3SetContinuousStates", kModelExchange);
}
fmi3Status fmi3GetContinuousStateDerivatives(fmi3Instance instance, fmi3Float64[], size_t) {
    return unsupported(instance, "fmi3GetContinuousStateDerivatives", kModelExchange);
}
fmi3Status fmi3GetEventIndicators(fmi3Instance instance, fmi3Float64[], size_t) {
    return unsupported(instance, "fmi3GetEventIndicators", kModelExchange);
}
fmi3Status fmi3GetContinuousStates(fmi3Instance instance, fmi3Float64[], size_t) {
    return unsupported(instance, "fmi3GetContinuousStates", kModelExchange);
}
fmi3Status fmi3GetNominalsOfContinuousStates(fmi3Instance instance, fmi3Float64[], size_t) {
    return unsupported(instance, "fmi3GetNominalsOfContinuousStates", kModelExchange);
}
fmi3Status fmi3GetNumberOfEventIndicators(fmi3Instance instance, size_t*) {
    return unsupported(instance, "fmi3GetNumberOfEventIndicators", kModelExchange);
}
fmi3Status fmi3GetNumberOfContinuousStates(fmi3Instance instance, size_t*) {
    return unsupported(instance, "fmi3GetNumberOfContinuousStates", kModelExchange);
}

fmi3Status fmi3EnterStepMode(fmi3Instance instance) { return unsupported(instance, "fmi3EnterStepMode", kNoEventMode); }

fmi3Status fmi3GetOutputDerivatives(fmi3Instance instance, const fmi3ValueReference[], size_t, const fmi3Int32[],
                                    fmi3Float64[], size_t) {
    return unsupported(instance, "fmi3GetOutputDerivatives",
                       "not provided (maxOutputDerivativeOrder is 0 in the model description)");
}

fmi3Status fmi3DoStep(fmi3Instance instance, fmi3Float64 currentCommunicationPoint, fmi3Float64 communicationStepSize,
                      fmi3Boolean noSetFMUStatePriorToCurrentPoint, fmi3Boolean* eventHandlingNeeded,
                      fmi3Boolean* terminateSimulation, fmi3Boolean* earlyReturn, fmi3Float64* lastSuccessfulTime) {
    (void)noSetFMUStatePriorToCurrentPoint;
    return call(instance, "fmi3DoStep", [&](Instance& i) {
        if (!eventHandlingNeeded || !terminateSimulation || !earlyReturn || !lastSuccessfulTime)
            return i.bad_argument("fmi3DoStep",
                                  "eventHandlingNeeded, terminateSimulation, earlyReturn or lastSuccessfulTime is NULL");
        const Status s = i.do_step("fmi3DoStep", currentCommunicationPoint, communicationStepSize);
        *eventHandlingNeeded = false;
        *terminateSimulation = false;
        *earlyReturn = false;
        *lastSuccessfulTime = i.last_successful_time();
        return s;
    });
}

fmi3Status fmi3ActivateModelPartition(fmi3Instance instance, fmi3ValueReference, fmi3Float64) {
    return unsupported(instance, "fmi3ActivateModelPartition", "a Scheduled Execution function; this FMU is Co-Simulation");
}

}  // extern "C"
