// Prints the project's IAPWS-IF97 values on a grid, one state per line, for check_if97_iapws.py to
// compare with an independent implementation (Debian's python3-iapws). SI units: K, Pa, m3/kg, J/kg.
#include <cstdio>

#include "thermo/if97.hpp"

int main() {
    using namespace ely::if97;
    for (double t = 275.0; t <= 645.0; t += 10.0) std::printf("sat %.17g %.17g\n", t, saturation_pressure(t));
    for (double p : {1e3, 1e4, 1e5, 1e6, 5e6, 2e7}) std::printf("tsat %.17g %.17g\n", p, saturation_temperature(p));
    for (double t = 280.0; t <= 620.0; t += 20.0)
        for (double p : {1e6, 2e7, 5e7, 1e8}) {
            if (p < saturation_pressure(t)) continue;
            const auto s = region1(t, p);
            std::printf("r1 %.17g %.17g %.17g %.17g %.17g %.17g\n", t, p, s.v, s.h, s.s, s.cp);
        }
    for (double t = 300.0; t <= 1070.0; t += 35.0)
        for (double p : {1e3, 3.5e3, 1e5, 1e6, 1e7}) {
            if (t <= 623.15 && p > saturation_pressure(t)) continue;
            if (t > 623.15 && t <= 863.15 && p > boundary23_pressure(t)) continue;
            const auto s = region2(t, p);
            std::printf("r2 %.17g %.17g %.17g %.17g %.17g %.17g\n", t, p, s.v, s.h, s.s, s.cp);
        }
}
