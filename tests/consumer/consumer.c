/* Built against the installed package; checks the library answers through its header. */
#include <elyblock/elyblock.h>
#include <math.h>
#include <stdio.h>

int main(void) {
    double p = 0.0;
    if (ely_abi_version() != ELY_ABI_VERSION) {
        fprintf(stderr, "ABI mismatch: library %d, header %d\n", (int)ely_abi_version(), ELY_ABI_VERSION);
        return 1;
    }
    /* IAPWS R7-97(2012) Table 35: p_sat(300 K) = 3.53658941 kPa */
    if (ely_water_saturation_pressure(300.0, &p) != ELY_OK || fabs(p / 3536.58941 - 1.0) > 1e-8) {
        fprintf(stderr, "saturation pressure wrong: %.9g (%s)\n", p, ely_last_error());
        return 1;
    }
    printf("elyblock %s: p_sat(300 K) = %.6f Pa\n", ely_version(), p);
    return 0;
}
