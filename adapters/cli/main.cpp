// elyblock command line. Uses only the public C interface.
#include <elyblock/elyblock.h>
#include <fmt/format.h>

#include <cstdlib>
#include <cstring>
#include <string>

namespace {

const char* const kCautions =
    "CAUTION: electrolyzers handle hydrogen/oxygen mixtures (flammable from about 4 % H2),\n"
    "high DC currents, caustic electrolytes, chlorine and hot stacks. These results are model\n"
    "estimates for study work only; design, operation and safety follow local codes, standards\n"
    "and licensed engineering practice.\n";

int usage(int code) {
    fmt::print(code == 0 ? stdout : stderr,
               "usage: elyblock thermo <temperature K> <anode pressure Pa> <cathode pressure Pa>\n"
               "       elyblock version\n");
    return code;
}

bool parse_number(const char* text, double& out) {
    char* end = nullptr;
    out = std::strtod(text, &end);
    return end != text && *end == '\0';
}

int command_thermo(int argc, char** argv) {
    if (argc != 5) return usage(2);
    double t = 0, pa = 0, pc = 0;
    if (!parse_number(argv[2], t) || !parse_number(argv[3], pa) || !parse_number(argv[4], pc)) {
        fmt::print(stderr, "elyblock: arguments must be numbers in K and Pa\n");
        return 2;
    }
    double p_sat = 0, e_rev = 0, e_tn = 0;
    int32_t s = ely_water_saturation_pressure(t, &p_sat);
    if (s == ELY_OK) s = ely_water_electrolysis_voltages(t, pa, pc, &e_rev, &e_tn);
    if (s < 0) {
        fmt::print(stderr, "elyblock: {} ({})\n", ely_last_error(), ely_status_text(s));
        return 1;
    }
    fmt::print("Water electrolysis, liquid feed — thermodynamic state\n");
    fmt::print("  stack temperature        {:10.2f} K   ({:.2f} degC)\n", t, t - 273.15);
    fmt::print("  anode / cathode pressure {:10.4g} Pa / {:.4g} Pa\n", pa, pc);
    fmt::print("  water vapour pressure    {:10.1f} Pa\n", p_sat);
    fmt::print("  reversible voltage       {:10.4f} V\n", e_rev);
    fmt::print("  thermoneutral voltage    {:10.4f} V   (HHV basis)\n\n", e_tn);
    fmt::print("{}", kCautions);
    return 0;
}

}  // namespace

int main(int argc, char** argv) {
    if (ely_abi_version() != ELY_ABI_VERSION) {
        fmt::print(stderr, "elyblock: library ABI {} does not match header ABI {}\n", ely_abi_version(), ELY_ABI_VERSION);
        return 1;
    }
    if (argc < 2) return usage(2);
    if (std::strcmp(argv[1], "thermo") == 0) return command_thermo(argc, argv);
    if (std::strcmp(argv[1], "version") == 0) {
        fmt::print("elyblock {} (ABI {})\n", ely_version(), ely_abi_version());
        return 0;
    }
    if (std::strcmp(argv[1], "--help") == 0 || std::strcmp(argv[1], "help") == 0) return usage(0);
    return usage(2);
}
