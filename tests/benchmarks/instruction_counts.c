/* Fixed loops of one operation through the public header, for instruction counts under callgrind
 * (tests/benchmarks/instruction_counts.sh runs each at two loop lengths and divides the difference of
 * the counts by the difference of the lengths; counts are steady where timings on a shared machine
 * are not). Usage: instruction_counts OPERATION N. Never run by a test. */
#include <elyblock/elyblock.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

static const char* const kPem =
    "{\"technology\":\"pem\",\"stack\":{\"cells\":100,\"active_area\":0.1},\"operating\":{\"spec\":\"current_density\"}}";
static const char* const kPemPower =
    "{\"technology\":\"pem\",\"stack\":{\"cells\":100,\"active_area\":0.1},\"operating\":{\"spec\":\"power\",\"power\":1e5}}";

static int32_t idx(ely_block* b, const char* name) {
    int32_t i = -1;
    if (ely_block_find(b, name, &i) != ELY_OK) {
        fprintf(stderr, "%s\n", ely_last_error());
        exit(2);
    }
    return i;
}

/* A reproducible sequence in [0, 1) (a linear congruential generator; no libc state). */
static double next_uniform(unsigned long long* s) {
    *s = *s * 6364136223846793005ULL + 1442695040888963407ULL;
    return (double)(*s >> 11) * (1.0 / 9007199254740992.0);
}

int main(int argc, char** argv) {
    if (argc != 3) {
        fprintf(stderr, "usage: instruction_counts single|single_temperature|power_profile|batch|batch_temperature|"
                        "batch_peer|batch_peer_power N\n");
        return 2;
    }
    const char* op = argv[1];
    const size_t n = (size_t)strtoull(argv[2], NULL, 10);
    const int power = strcmp(op, "power_profile") == 0 || strcmp(op, "batch_peer_power") == 0;
    ely_block* b = NULL;
    if (ely_block_create(power ? kPemPower : kPem, &b) != ELY_OK) {
        fprintf(stderr, "%s\n", ely_last_error());
        return 2;
    }
    const int32_t ij = idx(b, "in.current_density"), it = idx(b, "in.temperature"), ip = idx(b, "in.power");
    const int32_t ipc = idx(b, "in.pressure_cathode"), ipa = idx(b, "in.pressure_anode");
    const int32_t iv = idx(b, "cell.voltage"), ih = idx(b, "product.hydrogen"), iq = idx(b, "heat.duty");
    double v = 0, sum = 0;
    unsigned long long seed = 20261201ULL;
    if (strcmp(op, "single") == 0 || strcmp(op, "single_temperature") == 0) {
        const int temperature = strcmp(op, "single_temperature") == 0;
        for (size_t k = 0; k < n; ++k) {
            ely_block_set(b, ij, 1000.0 + (double)(k % 24000));
            if (temperature) ely_block_set(b, it, 333.15 + 0.0137 * (double)(k % 1000));
            ely_block_solve(b);
            ely_block_get(b, iv, &v);
            sum += v;
        }
    } else if (strcmp(op, "power_profile") == 0) {
        double p = 40e3;
        for (size_t k = 0; k < n; ++k) {
            ely_block_set(b, ip, p);
            ely_block_solve(b);
            ely_block_get(b, iv, &v);
            sum += v;
            p = p < 400e3 ? p * 1.013 : 40e3;
        }
    } else {
        /* batch, batch_temperature: a current-density sweep (and temperature); batch_peer, batch_peer_power:
         * the shared peer's ranges per point (j or P, T, p_c, p_a), three outputs. */
        const int peer = strncmp(op, "batch_peer", 10) == 0, temperature = strcmp(op, "batch_temperature") == 0;
        const int32_t n_in = peer ? 4 : (temperature ? 2 : 1);
        const int32_t in_idx[4] = {power ? ip : ij, peer ? it : it, ipc, ipa};
        const int32_t out_idx[3] = {iv, ih, iq};
        double* in = malloc(sizeof(double) * 4 * (n ? n : 1));
        double* out = malloc(sizeof(double) * 3 * (n ? n : 1));
        int32_t* st = malloc(sizeof(int32_t) * (n ? n : 1));
        for (size_t k = 0; k < n; ++k) {
            double* row = in + k * (size_t)n_in;
            if (peer) {
                const double j = 500.0 + 29500.0 * next_uniform(&seed);
                row[1] = 303.15 + 60.0 * next_uniform(&seed);
                row[2] = 1e5 + 39e5 * next_uniform(&seed);
                row[3] = 1e5 + 2e5 * next_uniform(&seed);
                row[0] = power ? 100 * 0.1 * j * (1.5 + 0.2 * j / 1e4) : j; /* about the power at j */
            } else {
                row[0] = 1000.0 + 24000.0 * (double)k / (double)(n ? n : 1);
                if (temperature) row[1] = 323.15 + 30.0 * (double)(k % 97) / 97.0;
            }
        }
        ely_block_solve_batch(b, n, n_in, in_idx, in, 3, out_idx, out, st, NULL, NULL);
        for (size_t k = 0; k < n; ++k) sum += out[3 * k];
        free(in);
        free(out);
        free(st);
    }
    printf("%s %zu %.17g\n", op, n, sum);
    ely_block_destroy(b);
    return 0;
}
