// Replays every file of the given directories through the fuzz target, without libFuzzer: the
// regression corpus of every crash found (tests/fuzz/regressions) and the seed corpus. CTest runs
// it in every build, so under scripts/sanitize each old crash is re-checked with ASan + UBSan.
// Usage: fuzz_regressions DIR...
#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <string>
#include <vector>

#include "fuzz_program.hpp"

int main(int argc, char** argv) {
    namespace fs = std::filesystem;
    int files = 0;
    for (int a = 1; a < argc; ++a) {
        std::vector<fs::path> paths;
        for (const auto& e : fs::directory_iterator(argv[a]))
            if (e.is_regular_file()) paths.push_back(e.path());
        std::sort(paths.begin(), paths.end());
        for (const auto& p : paths) {
            std::ifstream in(p, std::ios::binary);
            const std::string bytes((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
            std::printf("%s (%zu bytes)\n", p.c_str(), bytes.size());
            std::fflush(stdout);  // a crash names the file last printed
            fuzz_one_input(reinterpret_cast<const uint8_t*>(bytes.data()), bytes.size());
            ++files;
        }
    }
    std::printf("%d inputs replayed without a crash\n", files);
    return files > 0 ? 0 : 1;
}
