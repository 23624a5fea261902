// The docs are generated from the same tables the code reads: docs/variables.md from the
// variable table, the reference part of docs/config.md from the config key tables. These
// tests fail when a table changes and its doc does not; ELY_REGENERATE_DOCS=1 rewrites them.
#include <gtest/gtest.h>

#include <cstdlib>
#include <fmt/format.h>
#include <fstream>
#include <sstream>
#include <string>

#include "config/config.hpp"
#include "unit/variables.hpp"

using namespace ely;

namespace {
std::string read(const std::string& path) {
    std::ifstream in(path);
    std::stringstream ss;
    ss << in.rdbuf();
    return ss.str();
}

std::string variables_markdown() {
    std::string out =
        "# Variables (table version 1)\n\n"
        "Generated from `lib/unit/variables.cpp` (the one variable table); `tests/model/test_docs.cpp`\n"
        "checks that this file matches it. Units are SI. Hosts look variables up by name\n"
        "(`ely_block_find`); the index order is not part of the interface.\n\n"
        "\"stack\" is the DC side of the plant: the identical stacks are in parallel on one rectifier\n"
        "bus, so they share `stack.voltage` and `stack.current`/`stack.power` are their totals.\n"
        "Products, feeds and streams are plant totals. A custom cell adds, per half-reaction,\n"
        "`reaction.<electrode>_<n>.current_efficiency` and `reaction.<electrode>_<n>.product_rate`.\n\n"
        "| name | unit | causality | technologies | description |\n|---|---|---|---|---|\n";
    const char* causality[] = {"input", "output", "parameter"};
    for (int i = 0; i < kVarCount; ++i) {
        const auto& v = variable_info(static_cast<Var>(i));
        std::string techs;
        const Technology all[] = {Technology::pem, Technology::alkaline, Technology::solid_oxide, Technology::brine,
                                  Technology::custom};
        if (v.technologies == kTechAll) techs = "all";
        else
            for (auto t : all)
                if (v.technologies & tech_bit(t)) techs += (techs.empty() ? "" : ", ") + std::string(technology_name(t));
        out += fmt::format("| `{}` | {} | {} | {} | {} |\n", v.name, v.unit, causality[static_cast<int>(v.causality)],
                           techs, v.description);
    }
    return out;
}
}  // namespace

TEST(Docs, VariablesMarkdownMatchesTheTable) {
    const std::string path = std::string(ELY_SOURCE_DIR) + "/docs/variables.md";
    const std::string want = variables_markdown();
    if (std::getenv("ELY_REGENERATE_DOCS")) std::ofstream(path) << want;
    EXPECT_EQ(read(path), want) << "docs/variables.md is out of date: run the model tests with ELY_REGENERATE_DOCS=1";
}

TEST(Docs, ConfigReferenceMatchesTheKeyTables) {
    const std::string path = std::string(ELY_SOURCE_DIR) + "/docs/config.md";
    std::string text = read(path);
    const std::string generated = config_schema_markdown();
    // The hand-written part ends where the generated reference ("## Keys" to the end) begins.
    const auto start = text.find("## Keys\n");
    if (std::getenv("ELY_REGENERATE_DOCS") && start != std::string::npos) {
        text = text.substr(0, start) + generated;
        std::ofstream(path) << text;
    }
    EXPECT_NE(text.find(generated), std::string::npos)
        << "docs/config.md does not contain the current config_schema_markdown() text";
}
