// What the generated docs must say (the generator, tools/docgen, writes them; the CTest test
// docs.current checks that the committed files are current): every variable and every
// technology is documented, and the words users rely on are right.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include <fmt/format.h>
#include <string>

#include "config/config.hpp"
#include "unit/variables.hpp"
#include "unit/variables_docs.hpp"

using namespace ely;
using ::testing::HasSubstr;

TEST(Docs, VariablesMarkdownListsEveryVariableAndTechnology) {
    const std::string md = variables_markdown();
    for (int i = 0; i < kVarCount; ++i) EXPECT_THAT(md, HasSubstr(fmt::format("| `{}` |", variable_info(Var(i)).name)));
    for (const auto& t : technologies()) {
        EXPECT_THAT(md, HasSubstr(fmt::format("- **{}**:", t.name)));
        for (const auto& v : cell_parameter_variables(t)) EXPECT_THAT(md, HasSubstr(fmt::format("| `{}` |", v.name)));
    }
    EXPECT_THAT(md, HasSubstr("`stream.brine_feed.mass_flow`"));  // an output the brine cell adds
    EXPECT_THAT(md, HasSubstr("`reaction.cathode_1.product_rate`"));  // and the custom cell
}

TEST(Docs, PowerAndCurrentAreTotalsOverAllStacks) {
    // The config keys operating.power and operating.current set in.power and in.current,
    // which are totals over all stacks (issue: the reference once said "per stack").
    const std::string md = config_schema_markdown();
    const auto row = [&](const char* key) {
        const auto at = md.find(fmt::format("| `{}` |", key));
        EXPECT_NE(at, std::string::npos) << key;
        return md.substr(at, md.find('\n', at) - at);
    };
    EXPECT_THAT(row("power"), HasSubstr("all stacks together"));
    EXPECT_THAT(row("power"), HasSubstr("`in.power`"));
    EXPECT_THAT(row("current"), HasSubstr("all stacks together"));
    EXPECT_THAT(row("current"), HasSubstr("`in.current`"));
    EXPECT_THAT(row("power"), ::testing::Not(HasSubstr("per stack")));
}
