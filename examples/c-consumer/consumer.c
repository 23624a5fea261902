/* A program of someone else's, built against the installed elyblock package. It loads a
 * plant configuration, solves it, sweeps a polarization curve in one batch call and checks
 * Faraday's law on every point: hydrogen = (j·A·cells·stacks / 2F)·η_F·M_H2.
 * Usage: elyblock_consumer <config.json> */
#include <elyblock/elyblock.h>
#include <math.h>
#include <stdio.h>

#define POINTS 12

static int fail(const char* what, int32_t status) {
    fprintf(stderr, "%s: %s (%s)\n", what, ely_last_error(), ely_status_text(status));
    return 1;
}

int main(int argc, char** argv) {
    /* CODATA 2018 Faraday constant; IUPAC 2016 molar mass of H2 */
    const double faraday = 96485.33212, molar_mass_h2 = 2.016e-3;
    ely_block* block = NULL;
    int32_t s, i_j, i_h2, i_fe, i_cells, i_stacks, i_area;
    int32_t out_idx[2], status[POINTS];
    double j[POINTS], out[2 * POINTS], cells, stacks, area, p = 0.0;
    int k, bad = 0;

    if (ely_abi_version() != ELY_ABI_VERSION) {
        fprintf(stderr, "ABI mismatch: library %d, header %d\n", (int)ely_abi_version(), ELY_ABI_VERSION);
        return 1;
    }
    /* IAPWS R7-97(2012) Table 35: p_sat(300 K) = 3.53658941 kPa */
    if (ely_water_saturation_pressure(300.0, &p) != ELY_OK || fabs(p / 3536.58941 - 1.0) > 1e-8) {
        fprintf(stderr, "saturation pressure wrong: %.9g\n", p);
        return 1;
    }
    if (argc < 2) {
        fprintf(stderr, "usage: %s <config.json>\n", argv[0]);
        return 2;
    }
    if ((s = ely_block_create_from_file(argv[1], &block)) != ELY_OK) return fail("create", s);
    if ((s = ely_block_solve(block)) < 0) return fail("solve", s);
    if (ely_block_find(block, "in.current_density", &i_j) || ely_block_find(block, "product.hydrogen", &i_h2) ||
        ely_block_find(block, "cell.faraday_efficiency", &i_fe) || ely_block_find(block, "param.cells", &i_cells) ||
        ely_block_find(block, "param.stacks", &i_stacks) || ely_block_find(block, "param.active_area", &i_area))
        return fail("find", ELY_ERR_UNKNOWN_NAME);
    ely_block_get(block, i_cells, &cells);
    ely_block_get(block, i_stacks, &stacks);
    ely_block_get(block, i_area, &area);
    out_idx[0] = i_h2;
    out_idx[1] = i_fe;
    for (k = 0; k < POINTS; ++k) j[k] = 2000.0 + 1500.0 * k;
    s = ely_block_solve_batch(block, POINTS, 1, &i_j, j, 2, out_idx, out, status, NULL, NULL);
    if (s < 0) return fail("batch", s);
    printf("elyblock %s — polarization sweep\n   j [A/m2]   H2 [kg/h]   Faraday eff.\n", ely_version());
    for (k = 0; k < POINTS; ++k) {
        const double expected = j[k] * area * cells * stacks / (2.0 * faraday) * out[2 * k + 1] * molar_mass_h2;
        if (status[k] < 0) { printf("  %8.0f   failed: %s\n", j[k], ely_status_text(status[k])); bad = 1; continue; }
        printf("  %8.0f   %9.3f   %.6f\n", j[k], out[2 * k] * 3600.0, out[2 * k + 1]);
        if (fabs(out[2 * k] / expected - 1.0) > 1e-9) { fprintf(stderr, "Faraday's law broken at %g\n", j[k]); bad = 1; }
    }
    ely_block_destroy(block);
    return bad;
}
