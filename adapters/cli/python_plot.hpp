#pragma once
// Plots from the command line: the data go to a CSV file in SI, and the elyblock Python package
// draws them with matplotlib (python3 -m elyblock.plots). The interpreter is $ELYBLOCK_PYTHON, else
// Debian's /usr/bin/python3, else python3 on the PATH; the package is looked for beside this
// program (its install prefix, then the build tree it was built in) before Python's own path.
#include <string>
#include <vector>

namespace elycli {

/// Refuses (UsageError) a plot file whose name does not end in .png, .svg or .pdf.
void check_plot_files(const std::vector<std::string>& files, const char* option);

/// A temporary CSV file, removed when the object goes.
struct TempFile {
    std::string path;
    explicit TempFile(const char* stem);
    ~TempFile();
    TempFile(const TempFile&) = delete;
    TempFile& operator=(const TempFile&) = delete;
};

/// Runs `python3 -m elyblock.plots <plot> <data> -o FILE ... <extra>`; Failure with a clear
/// message when Python, matplotlib or the package is missing or the plot fails. Python's errors
/// go to standard error.
void plot_with_python(const std::string& command, const std::string& plot, const std::string& data,
                      const std::vector<std::string>& files, const std::vector<std::string>& extra);

}  // namespace elycli
