#include "block.hpp"

#include "errors.hpp"

namespace elycli {

Block::Block(const std::string& config_path) : config_path_(config_path) {
    ely_block* created = nullptr;
    check(ely_block_create_from_file(config_path.c_str(), &created), "");
    block_.reset(created);
    int32_t n = 0;
    check(ely_block_variable_count(block_.get(), &n), "variables");
    variables_.reserve(static_cast<std::size_t>(n));
    for (int32_t i = 0; i < n; ++i) {
        Variable v{i, {}};
        v.info.struct_size = sizeof v.info;
        check(ely_block_variable_info(block_.get(), i, &v.info), "variables");
        variables_.push_back(v);
    }
}

const Variable* Block::find(const std::string& name) const {
    for (const auto& v : variables_)
        if (name == v.info.name) return &v;
    return nullptr;
}

double Block::get(const Variable& v) const {
    double value = 0;
    check(ely_block_get(block_.get(), v.index, &value), v.info.name);
    return value;
}

std::string Block::spec() const {
    const char* spec = nullptr;
    check(ely_block_get_spec(block_.get(), &spec), "spec");
    return spec;
}

bool Block::try_set_spec(const std::string& spec) { return ely_block_set_spec(block_.get(), spec.c_str()) == ELY_OK; }

std::string drive_input_of(const std::string& spec) { return "in." + spec; }

}  // namespace elycli
