#pragma once
// Packs an FMU (a zip archive, through libarchive): modelDescription.xml, the binary under
// binaries/linux64 (FMI 2) or binaries/x86_64-linux (FMI 3) and the plant under resources/.
#include <string>

namespace elyfmi {

struct PackageOptions {
    int fmi_version = 2;
    std::string plant_path;   // the plant description (JSON)
    std::string binary_path;  // the FMU binary of that FMI version (elyblock-fmi2.so / elyblock-fmi3.so)
    std::string output_path;  // the .fmu to write
    std::string model_identifier;  // empty: from the plant file's name
};

/// Writes the FMU; returns the model identifier used. Throws std::runtime_error with a message
/// naming the file or the problem; nothing is left at output_path then.
std::string package_fmu(const PackageOptions& options);

/// The folder of binaries of an FMI version: "linux64" (FMI 2), "x86_64-linux" (FMI 3).
const char* platform_folder(int fmi_version);

}  // namespace elyfmi
