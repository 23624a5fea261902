/* Compiled with -std=c99 -pedantic -Werror (and as C++) by CTest: the public header must
 * be clean in both languages. */
#include <elyblock/elyblock.h>

int main(void) {
    double p = 0.0;
    int32_t status = ely_water_saturation_pressure(353.15, &p);
    return (status == ELY_OK && ely_abi_version() == ELY_ABI_VERSION) ? 0 : 1;
}
