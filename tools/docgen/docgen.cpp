// The docs generator: docs/variables.md from the variable table and the technology registry,
// and the reference part of docs/config.md (from "## Keys" to the end) from the config key
// tables. A build target, not a test:
//   elyblock_docgen --write <source dir>   rewrites the files (cmake --build build --target docs)
//   elyblock_docgen --check <source dir>   exits 1, naming the file, when a committed file is out of date
#include <cstdio>
#include <fstream>
#include <sstream>
#include <string>

#include "config/config.hpp"
#include "unit/variables_docs.hpp"

namespace {

bool read(const std::string& path, std::string& text) {
    std::ifstream in(path, std::ios::binary);
    if (!in) return false;
    std::stringstream ss;
    ss << in.rdbuf();
    text = ss.str();
    return true;
}

bool write(const std::string& path, const std::string& text) {
    std::ofstream out(path, std::ios::binary | std::ios::trunc);
    out << text;
    out.close();
    return static_cast<bool>(out);
}

struct Doc {
    std::string path;
    std::string current;  // as committed
    std::string wanted;   // as generated
};

}  // namespace

int main(int argc, char** argv) {
    const std::string mode = argc == 3 ? argv[1] : "";
    if (mode != "--write" && mode != "--check") {
        std::fprintf(stderr, "usage: elyblock_docgen --write|--check <source dir>\n");
        return 2;
    }
    const std::string root = argv[2];
    Doc variables{root + "/docs/variables.md", "", ely::variables_markdown()};
    Doc config{root + "/docs/config.md", "", ""};
    if (!read(variables.path, variables.current)) variables.current.clear();
    if (!read(config.path, config.current)) {
        std::fprintf(stderr, "elyblock_docgen: cannot read %s\n", config.path.c_str());
        return 1;
    }
    // docs/config.md: the text above "## Keys" is written by hand; the rest is generated.
    const auto start = config.current.find("## Keys\n");
    if (start == std::string::npos) {
        std::fprintf(stderr, "elyblock_docgen: %s has no \"## Keys\" heading\n", config.path.c_str());
        return 1;
    }
    config.wanted = config.current.substr(0, start) + ely::config_schema_markdown();

    int status = 0;
    for (const Doc* d : {&variables, &config}) {
        if (d->current == d->wanted) continue;
        if (mode == "--write") {
            if (!write(d->path, d->wanted)) {
                std::fprintf(stderr, "elyblock_docgen: cannot write %s\n", d->path.c_str());
                status = 1;
            } else {
                std::printf("wrote %s\n", d->path.c_str());
            }
        } else {
            std::fprintf(stderr, "%s is out of date: its table changed; run cmake --build build --target docs\n",
                         d->path.c_str());
            status = 1;
        }
    }
    return status;
}
