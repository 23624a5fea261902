#include "variables.hpp"

#include <boost/uuid/name_generator_sha1.hpp>
#include <boost/uuid/uuid_io.hpp>

#include <cctype>
#include <cmath>
#include <map>

namespace elyfmi {

uint32_t value_reference(std::string_view name) {
    // FNV-1a, 32 bits (offset basis 2166136261, prime 16777619: the published FNV parameters).
    uint32_t h = 2166136261u;
    for (const unsigned char c : name) {
        h ^= c;
        h *= 16777619u;
    }
    h &= 0x7fffffffu;
    return h == kTimeValueReference ? 1u : h;
}

namespace {

// The start an FMU declares for an input the plant description never gave (a drive input its
// spec does not read: the block stores it but never uses it): 0 when the limits allow it, else
// the nominal value. FMI asks every input for a start.
double declared_start(const ely_variable_info& info) {
    if (!std::isnan(info.start)) return info.start;
    const bool zero_allowed = (info.min < 0 || (info.min == 0 && !(info.flags & ELY_VARIABLE_MIN_EXCLUSIVE))) &&
                              info.max >= 0;
    return zero_allowed ? 0.0 : info.nominal;
}

}  // namespace

std::vector<Variable> fmi_variables(const ely_block* block) {
    int32_t count = 0;
    if (ely_block_variable_count(block, &count) < 0) throw std::runtime_error(ely_last_error());
    std::vector<Variable> out;
    out.reserve(static_cast<std::size_t>(count));
    std::map<uint32_t, std::string> taken;
    for (int32_t i = 0; i < count; ++i) {
        ely_variable_info info{};
        info.struct_size = sizeof info;
        if (ely_block_variable_info(block, i, &info) < 0) throw std::runtime_error(ely_last_error());
        Variable v;
        v.name = info.name;
        v.index = i;
        v.value_reference = value_reference(v.name);
        if (auto [it, fresh] = taken.emplace(v.value_reference, v.name); !fresh)
            throw std::runtime_error("variables " + it->second + " and " + v.name + " have the same value reference " +
                                     std::to_string(v.value_reference) + "; rename one");
        v.unit = info.unit;
        v.description = info.description;
        v.label = info.label ? info.label : "";
        v.display_unit = info.display_unit ? info.display_unit : v.unit;
        v.display_scale = info.display_scale;
        v.display_offset = info.display_offset;
        v.min = info.min;
        v.max = info.max;
        v.min_exclusive = (info.flags & ELY_VARIABLE_MIN_EXCLUSIVE) != 0;
        v.nominal = info.nominal;
        const bool discrete = info.variability == ELY_VARIABILITY_DISCRETE;
        switch (info.causality) {
            case ELY_CAUSALITY_INPUT:
                v.causality = Causality::input;
                v.variability = discrete ? Variability::discrete : Variability::continuous;
                v.has_start = true;
                v.start = declared_start(info);
                break;
            case ELY_CAUSALITY_PARAMETER:
                if (info.variability == ELY_VARIABILITY_TUNABLE) {
                    v.causality = Causality::parameter;
                    v.variability = Variability::tunable;
                    v.has_start = true;
                    v.start = info.start;
                } else {
                    // Structural (cells, stacks, area): set by the plant description in resources/,
                    // which the importer cannot change; FMI's calculated parameter.
                    v.causality = Causality::calculated_parameter;
                    v.variability = Variability::fixed;
                }
                break;
            default:
                v.causality = Causality::output;
                v.variability = discrete ? Variability::discrete : Variability::continuous;
                break;
        }
        out.push_back(std::move(v));
    }
    return out;
}

std::string instantiation_token(std::string_view plant_text, int fmi_version) {
    // Our own namespace UUID for elyblock FMUs (generated once, random).
    static const boost::uuids::uuid kNamespace = {{0x6b, 0x1e, 0x4f, 0x0a, 0x93, 0x2d, 0x4c, 0x51, 0xa7, 0x0e,
                                                   0x5c, 0x21, 0x8d, 0x3f, 0x76, 0xe4}};
    boost::uuids::name_generator_sha1 generate(kNamespace);
    std::string name = "elyblock FMI " + std::to_string(fmi_version) + " " + ely_version() + "\n";
    name.append(plant_text.data(), plant_text.size());
    return "{" + boost::uuids::to_string(generate(name)) + "}";
}

std::string model_identifier_from(std::string_view stem) {
    std::string out;
    for (const unsigned char c : stem) out += (std::isalnum(c) && c < 128) ? static_cast<char>(c) : '_';
    if (out.empty() || std::isdigit(static_cast<unsigned char>(out[0]))) out.insert(out.begin(), '_');
    return out;
}

}  // namespace elyfmi
