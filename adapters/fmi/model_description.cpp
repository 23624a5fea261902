#include "model_description.hpp"

#include <fmt/format.h>
#include <libxml/xmlwriter.h>

#include <cmath>
#include <map>
#include <memory>
#include <stdexcept>
#include <vector>

#include "instance.hpp"
#include "si_units.hpp"
#include "variables.hpp"

namespace elyfmi {
namespace {

// Numbers as the shortest text that reads back to the same double.
std::string number(double x) { return fmt::format("{}", x); }

class Writer {
public:
    Writer() : buffer_(xmlBufferCreate()), writer_(buffer_ ? xmlNewTextWriterMemory(buffer_, 0) : nullptr) {
        if (!writer_) throw std::runtime_error("libxml2 cannot create a text writer");
        xmlTextWriterSetIndent(writer_, 1);
        xmlTextWriterSetIndentString(writer_, BAD_CAST "  ");
        check(xmlTextWriterStartDocument(writer_, "1.0", "UTF-8", nullptr));
    }
    ~Writer() {
        if (writer_) xmlFreeTextWriter(writer_);
        if (buffer_) xmlBufferFree(buffer_);
    }
    void start(const char* element) { check(xmlTextWriterStartElement(writer_, BAD_CAST element)); }
    void end() { check(xmlTextWriterEndElement(writer_)); }
    void attribute(const char* name, const std::string& value) {
        check(xmlTextWriterWriteAttribute(writer_, BAD_CAST name, BAD_CAST value.c_str()));
    }
    void attribute(const char* name, double value) { attribute(name, number(value)); }
    void attribute(const char* name, bool value) { attribute(name, std::string(value ? "true" : "false")); }
    void attribute(const char* name, const char* value) { attribute(name, std::string(value)); }
    std::string finish() {
        check(xmlTextWriterEndDocument(writer_));
        xmlFreeTextWriter(writer_);
        writer_ = nullptr;
        return std::string(reinterpret_cast<const char*>(xmlBufferContent(buffer_)), xmlBufferLength(buffer_));
    }

private:
    static void check(int rc) {
        if (rc < 0) throw std::runtime_error("libxml2 could not write the model description");
    }
    xmlBufferPtr buffer_;
    xmlTextWriterPtr writer_;
};

const char* causality_text(Causality c) {
    switch (c) {
        case Causality::input: return "input";
        case Causality::parameter: return "parameter";
        case Causality::calculated_parameter: return "calculatedParameter";
        default: return "output";
    }
}

const char* variability_text(Variability v) {
    switch (v) {
        case Variability::fixed: return "fixed";
        case Variability::tunable: return "tunable";
        case Variability::discrete: return "discrete";
        default: return "continuous";
    }
}

struct UnitEntry {
    BaseUnit base;
    std::map<std::string, std::pair<double, double>> display;  // name → factor, offset
};

// A unit whose exponent is itself a parameter ("(A/m2)^-n" of a correlation's coefficient) has no
// fixed SI dimension: FMI cannot state it, so such a variable goes without a unit attribute and
// names its unit in its description.
bool expressible(const std::string& unit) { return unit.find("^-n") == std::string::npos && unit.find("^n") == std::string::npos; }

// The units of the variables, each with its base-unit exponents and the display units used with it.
std::map<std::string, UnitEntry> collect_units(const std::vector<Variable>& variables, int fmi_version) {
    std::map<std::string, UnitEntry> units;
    if (fmi_version == 3) units["s"].base = base_unit("s");  // the independent variable
    for (const Variable& v : variables) {
        if (!expressible(v.unit)) continue;
        auto [it, fresh] = units.try_emplace(v.unit);
        if (fresh) {
            try {
                it->second.base = base_unit(v.unit);
            } catch (const std::exception& e) {
                throw std::runtime_error(v.name + ": " + e.what());
            }
        }
        if (!v.display_unit.empty() && v.display_unit != v.unit)
            it->second.display.emplace(v.display_unit, std::make_pair(v.display_scale, v.display_offset));
    }
    return units;
}

// Attributes a variable's element carries: unit, display unit, start, limits, nominal.
void value_attributes(Writer& w, const Variable& v) {
    if (expressible(v.unit)) {
        w.attribute("unit", v.unit);
        if (!v.display_unit.empty() && v.display_unit != v.unit) w.attribute("displayUnit", v.display_unit);
    }
    const bool settable = v.causality == Causality::input || v.causality == Causality::parameter;
    if (settable) {
        // FMI limits are inclusive; an exclusive minimum is written as its bound (the FMU
        // refuses the bound itself with a message).
        if (std::isfinite(v.min)) w.attribute("min", v.min);
        if (std::isfinite(v.max)) w.attribute("max", v.max);
    }
    if (std::isfinite(v.nominal) && v.nominal > 0) w.attribute("nominal", v.nominal);
    if (v.has_start) w.attribute("start", v.start);
}

std::string description_of(const Variable& v) {
    std::string text = v.label.empty() || v.label == v.description ? v.description : v.label + ": " + v.description;
    if (!expressible(v.unit)) text += " [unit " + v.unit + "]";
    return text;
}

}  // namespace

std::string model_description(const ely_block* block, const DescriptionOptions& o) {
    if (o.fmi_version != 2 && o.fmi_version != 3) throw std::runtime_error("FMI version must be 2 or 3");
    const bool fmi3 = o.fmi_version == 3;
    const std::vector<Variable> variables = fmi_variables(block);
    const auto units = collect_units(variables, o.fmi_version);

    Writer w;
    w.start("fmiModelDescription");
    w.attribute("fmiVersion", fmi3 ? "3.0" : "2.0");
    w.attribute("modelName", o.model_name);
    w.attribute(fmi3 ? "instantiationToken" : "guid", instantiation_token(o.plant_text, o.fmi_version));
    w.attribute("description", o.description);
    w.attribute("version", std::string(ely_version()));
    w.attribute("generationTool", std::string("elyblock ") + ely_version());
    w.attribute("generationDateAndTime", o.generation_time);
    w.attribute("variableNamingConvention", "structured");
    if (!fmi3) w.attribute("numberOfEventIndicators", "0");

    w.start("CoSimulation");
    w.attribute("modelIdentifier", o.model_identifier);
    w.attribute("canHandleVariableCommunicationStepSize", true);
    if (fmi3) {
        w.attribute("canGetAndSetFMUState", true);
        w.attribute("canSerializeFMUState", true);
        w.attribute("providesDirectionalDerivatives", false);
        w.attribute("providesAdjointDerivatives", false);
        w.attribute("hasEventMode", false);
        w.attribute("providesIntermediateUpdate", false);
        w.attribute("mightReturnEarlyFromDoStep", false);
    } else {
        w.attribute("canInterpolateInputs", false);
        w.attribute("maxOutputDerivativeOrder", "0");
        w.attribute("canRunAsynchronuously", false);  // the standard's spelling
        w.attribute("canBeInstantiatedOnlyOncePerProcess", false);
        w.attribute("canNotUseMemoryManagementFunctions", true);
        w.attribute("canGetAndSetFMUstate", true);
        w.attribute("canSerializeFMUstate", true);
        w.attribute("providesDirectionalDerivative", false);
    }
    w.end();

    w.start("UnitDefinitions");
    for (const auto& [name, entry] : units) {
        w.start("Unit");
        w.attribute("name", name);
        w.start("BaseUnit");
        for (std::size_t i = 0; i < entry.base.exponents.size(); ++i)
            if (entry.base.exponents[i] != 0) w.attribute(kBaseUnitNames[i], std::to_string(entry.base.exponents[i]));
        if (entry.base.factor != 1) w.attribute("factor", entry.base.factor);
        w.end();
        for (const auto& [display, scale] : entry.display) {
            w.start("DisplayUnit");
            w.attribute("name", display);
            if (scale.first != 1) w.attribute("factor", scale.first);
            if (scale.second != 0) w.attribute("offset", scale.second);
            w.end();
        }
        w.end();
    }
    w.end();

    w.start("LogCategories");
    for (const Category& c : kCategories) {
        w.start("Category");
        w.attribute("name", c.name);
        w.attribute("description", c.description);
        w.end();
    }
    w.end();

    // A day at one-second steps, the co-simulation a control engineer starts with.
    w.start("DefaultExperiment");
    w.attribute("startTime", 0.0);
    w.attribute("stopTime", 86400.0);
    w.attribute("stepSize", 1.0);
    w.end();

    w.start("ModelVariables");
    if (fmi3) {
        w.start("Float64");
        w.attribute("name", "time");
        w.attribute("valueReference", std::to_string(kTimeValueReference));
        w.attribute("description", "simulation time");
        w.attribute("causality", "independent");
        w.attribute("variability", "continuous");
        w.attribute("unit", "s");
        w.end();
    }
    for (const Variable& v : variables) {
        w.start(fmi3 ? "Float64" : "ScalarVariable");
        w.attribute("name", v.name);
        w.attribute("valueReference", std::to_string(v.value_reference));
        w.attribute("description", description_of(v));
        w.attribute("causality", causality_text(v.causality));
        w.attribute("variability", variability_text(v.variability));
        if (v.causality == Causality::parameter) w.attribute("initial", "exact");
        if (v.causality == Causality::calculated_parameter) w.attribute("initial", "calculated");
        if (fmi3) {
            value_attributes(w, v);
        } else {
            w.start("Real");
            value_attributes(w, v);
            w.end();
        }
        w.end();
    }
    w.end();

    // Outputs may depend on every input and on the state: no dependencies are listed, which both
    // standards read as "depends on all". Initial unknowns: the outputs and the calculated parameters.
    w.start("ModelStructure");
    const std::size_t first_index = fmi3 ? 2 : 1;  // FMI 2 indices count from 1; FMI 3 has `time` first
    auto unknown = [&](const char* element, std::size_t k) {
        w.start(element);
        if (fmi3)
            w.attribute("valueReference", std::to_string(variables[k].value_reference));
        else
            w.attribute("index", std::to_string(k + first_index));
        w.end();
    };
    if (!fmi3) w.start("Outputs");
    for (std::size_t k = 0; k < variables.size(); ++k)
        if (variables[k].causality == Causality::output) unknown(fmi3 ? "Output" : "Unknown", k);
    if (!fmi3) {
        w.end();
        w.start("InitialUnknowns");
    }
    for (std::size_t k = 0; k < variables.size(); ++k)
        if (variables[k].causality == Causality::output || variables[k].causality == Causality::calculated_parameter)
            unknown(fmi3 ? "InitialUnknown" : "Unknown", k);
    if (!fmi3) w.end();
    w.end();

    w.end();
    return w.finish();
}

}  // namespace elyfmi
