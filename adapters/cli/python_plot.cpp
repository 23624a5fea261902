// Plots through the elyblock Python package (python_plot.hpp).
#include "python_plot.hpp"

#include <fmt/format.h>
#include <fcntl.h>
#include <spawn.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cerrno>
#include <climits>
#include <cstdlib>
#include <cstring>

#include "errors.hpp"

extern char** environ;

namespace elycli {
namespace {

bool exists(const std::string& path) {
    struct stat st {};
    return ::stat(path.c_str(), &st) == 0;
}

std::string executable_dir() {
    char buffer[PATH_MAX];
    const ssize_t n = ::readlink("/proc/self/exe", buffer, sizeof buffer - 1);
    if (n <= 0) return {};
    std::string path(buffer, static_cast<std::size_t>(n));
    return path.substr(0, path.rfind('/'));
}

std::string interpreter() {
    if (const char* chosen = std::getenv("ELYBLOCK_PYTHON"); chosen && *chosen) return chosen;
    if (exists("/usr/bin/python3")) return "/usr/bin/python3";  // Debian's, with python3-matplotlib
    return "python3";
}

/// PYTHONPATH with the package's folders first: beside this program's install prefix, then the
/// build tree.
std::string python_path() {
    std::string path;
    const auto add = [&](const std::string& dir) {
        if (!dir.empty() && exists(dir + "/elyblock/__init__.py")) path += (path.empty() ? "" : ":") + dir;
    };
    const std::string here = executable_dir();
    if (!here.empty()) add(here + "/../" ELY_PYTHON_INSTALL_DIR);
#ifdef ELY_PYTHON_BUILD_DIR
    add(ELY_PYTHON_BUILD_DIR);
#endif
    if (const char* old = std::getenv("PYTHONPATH"); old && *old) path += (path.empty() ? "" : ":") + std::string(old);
    return path;
}

// Run by the interpreter: tells a missing matplotlib or package apart from a failed plot.
constexpr const char* kScript =
    "import sys\n"
    "try:\n"
    "    import matplotlib\n"
    "except ImportError:\n"
    "    sys.exit(5)\n"
    "try:\n"
    "    from elyblock import plots\n"
    "except ImportError as e:\n"
    "    sys.stderr.write(f'{e}\\n')\n"
    "    sys.exit(6)\n"
    "sys.exit(plots.main(sys.argv[1:]))\n";
constexpr int kNoMatplotlib = 5, kNoPackage = 6;

}  // namespace

void check_plot_files(const std::vector<std::string>& files, const char* option) {
    for (const auto& f : files) {
        const auto dot = f.rfind('.');
        const std::string suffix = dot == std::string::npos ? std::string() : f.substr(dot);
        if (suffix != ".png" && suffix != ".svg" && suffix != ".pdf")
            throw UsageError{fmt::format("{} {}: the file name ends in .png, .svg or .pdf (the format)", option, f), ""};
    }
}

TempFile::TempFile(const char* stem) {
    const char* dir = std::getenv("TMPDIR");
    std::string pattern = fmt::format("{}/{}-XXXXXX.csv", dir && *dir ? dir : "/tmp", stem);
    const int fd = ::mkstemps(pattern.data(), 4);
    if (fd < 0) throw Failure{fmt::format("cannot make a temporary file {}: {}", pattern, std::strerror(errno))};
    ::close(fd);
    path = pattern;
}

TempFile::~TempFile() {
    if (!path.empty()) ::unlink(path.c_str());
}

void plot_with_python(const std::string& command, const std::string& plot, const std::string& data,
                      const std::vector<std::string>& files, const std::vector<std::string>& extra) {
    const std::string python = interpreter();
    std::vector<std::string> args = {python, "-c", kScript, plot, data};
    for (const auto& f : files) {
        args.push_back("-o");
        args.push_back(f);
    }
    args.insert(args.end(), extra.begin(), extra.end());
    std::vector<char*> argv;
    for (auto& a : args) argv.push_back(a.data());
    argv.push_back(nullptr);

    // The environment with PYTHONPATH set; Python's standard output (the files it wrote, which the
    // command names itself) is dropped: the command's standard output holds its own results.
    std::vector<std::string> env_text;
    for (char** e = environ; *e; ++e)
        if (std::strncmp(*e, "PYTHONPATH=", 11) != 0) env_text.emplace_back(*e);
    env_text.push_back("PYTHONPATH=" + python_path());
    std::vector<char*> envp;
    for (auto& e : env_text) envp.push_back(e.data());
    envp.push_back(nullptr);

    posix_spawn_file_actions_t actions;
    posix_spawn_file_actions_init(&actions);
    posix_spawn_file_actions_addopen(&actions, STDOUT_FILENO, "/dev/null", O_WRONLY, 0);
    pid_t pid = 0;
    const int spawned = python.find('/') == std::string::npos
                            ? posix_spawnp(&pid, python.c_str(), &actions, nullptr, argv.data(), envp.data())
                            : posix_spawn(&pid, python.c_str(), &actions, nullptr, argv.data(), envp.data());
    posix_spawn_file_actions_destroy(&actions);
    const std::string what = fmt::format("{}: --plot", command);
    if (spawned != 0)
        throw Failure{fmt::format("{} needs Python 3 with matplotlib: cannot run {} ({}); on Debian: apt-get install "
                                  "python3 python3-matplotlib, or name an interpreter in ELYBLOCK_PYTHON",
                                  what, python, std::strerror(spawned))};
    int status = 0;
    while (::waitpid(pid, &status, 0) < 0 && errno == EINTR) {
    }
    const int code = WIFEXITED(status) ? WEXITSTATUS(status) : 128 + WTERMSIG(status);
    if (code == kNoMatplotlib)
        throw Failure{fmt::format("{} needs matplotlib, which {} cannot import (Debian: apt-get install "
                                  "python3-matplotlib)", what, python)};
    if (code == kNoPackage)
        throw Failure{fmt::format("{}: {} cannot load the elyblock Python package (install python3-elyblock, or "
                                  "put its folder on PYTHONPATH)", what, python)};
    if (code != 0) throw Failure{fmt::format("{}: the plot failed ({} exited with status {})", what, python, code)};
}

}  // namespace elycli
