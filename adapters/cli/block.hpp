#pragma once
// The plant's block through the C interface: its handle, its variables and their descriptions.
#include <elyblock/elyblock.h>

#include <cstdint>
#include <memory>
#include <string>
#include <vector>

namespace elycli {

/// One variable of the block, as ely_variable_info describes it (strings owned by the block).
struct Variable {
    int32_t index;
    ely_variable_info info;
    bool is_input() const { return info.causality == ELY_CAUSALITY_INPUT; }
    bool is_output() const { return info.causality == ELY_CAUSALITY_OUTPUT; }
    bool is_tunable() const { return info.variability == ELY_VARIABILITY_TUNABLE; }
};

class Block {
public:
    /// Creates the block from a plant description file; Failure with the library's message.
    explicit Block(const std::string& config_path);

    ely_block* handle() const { return block_.get(); }
    const std::string& config_path() const { return config_path_; }

    /// Every variable, in the block's order.
    const std::vector<Variable>& variables() const { return variables_; }
    /// The variable of that name, or null.
    const Variable* find(const std::string& name) const;
    /// "in.current_density, in.current, ..." — the names of the variables that pass `keep`.
    template <class Keep>
    std::string names_where(Keep keep) const {
        std::string out;
        for (const auto& v : variables_)
            if (keep(v)) out += (out.empty() ? "" : ", ") + std::string(v.info.name);
        return out;
    }

    double get(const Variable& v) const;  // Failure when the library refuses
    /// The spec in force ("current_density", ...).
    std::string spec() const;
    /// Selects a spec; false (and nothing changed) when the library knows no spec of that name.
    bool try_set_spec(const std::string& spec);

private:
    std::unique_ptr<ely_block, void (*)(ely_block*)> block_{nullptr, ely_block_destroy};
    std::string config_path_;
    std::vector<Variable> variables_;
};

/// The drive input a spec reads: the variable table names it in.<spec> (in.power for power, ...).
std::string drive_input_of(const std::string& spec);

}  // namespace elycli
