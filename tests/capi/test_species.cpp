// ely_molar_mass: the molar masses hosts convert the kg/s outputs with.
#include <gmock/gmock.h>
#include <gtest/gtest.h>

#include "elyblock/elyblock.h"

using ::testing::HasSubstr;

namespace {

// IUPAC standard atomic weights, conventional values (Meija et al., Pure Appl. Chem. 88, 265,
// 2016, table 3): H 1.008, O 15.999, N 14.007, Na 22.98976928, Cl 35.45, K 39.0983 g/mol.
TEST(Species, MolarMassesFromIupacAtomicWeights) {
    const struct {
        const char* formula;
        double g_per_mol;
    } cases[] = {{"H2", 2.016},           {"O2", 31.998},         {"H2O", 18.015},   {"N2", 28.014},
                 {"Cl2", 70.9},           {"NaCl", 58.43976928}, {"NaOH", 39.99676928}, {"KOH", 56.1053}};
    for (const auto& c : cases) {
        double m = 0.0;
        ASSERT_EQ(ely_molar_mass(c.formula, &m), ELY_OK) << c.formula;
        EXPECT_NEAR(m, c.g_per_mol * 1e-3, 1e-12 * c.g_per_mol * 1e-3) << c.formula;
    }
}

TEST(Species, UnknownFormulaAndNullArguments) {
    double m = -1.0;
    EXPECT_EQ(ely_molar_mass("CH4", &m), ELY_ERR_UNKNOWN_NAME);
    EXPECT_THAT(ely_last_error(), HasSubstr("CH4"));
    EXPECT_THAT(ely_last_error(), HasSubstr("H2O"));
    EXPECT_EQ(m, -1.0);
    EXPECT_EQ(ely_molar_mass(nullptr, &m), ELY_ERR_INVALID_ARGUMENT);
    EXPECT_EQ(ely_molar_mass("H2", nullptr), ELY_ERR_INVALID_ARGUMENT);
}

}  // namespace
