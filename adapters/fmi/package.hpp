#pragma once
// Packs an FMU (a zip archive, through libarchive): modelDescription.xml, the Linux binary under
// binaries/linux64 (FMI 2) or binaries/x86_64-linux (FMI 3), optionally the Windows binary under
// binaries/win64 (FMI 2) or binaries/x86_64-windows (FMI 3), and the plant under resources/.
#include <string>

namespace elyfmi {

struct PackageOptions {
    int fmi_version = 2;
    std::string plant_path;   // the plant description (JSON)
    std::string binary_path;  // the FMU binary of that FMI version (elyblock-fmi2.so / elyblock-fmi3.so)
    std::string windows_binary_path;  // its Windows build (elyblock-fmi2.dll / elyblock-fmi3.dll); empty: none
    std::string output_path;  // the .fmu to write
    std::string model_identifier;  // empty: from the plant file's name
};

/// Writes the FMU; returns the model identifier used. Throws std::runtime_error with a message
/// naming the file or the problem; nothing is left at output_path then.
std::string package_fmu(const PackageOptions& options);

/// The folders of binaries of an FMI version, 64-bit x86 Linux and Windows. FMI 3.0, section 2.5
/// "FMU Distribution" (modelica/fmi-standard, docs/2_5_fmu_distribution.adoc): folders are named by
/// the platform tuple <arch>-<sys>, "x86_64-linux" and "x86_64-windows"; its table "Platform Tuple
/// Examples" gives the FMI 2.0 names of the same platforms, "linux64" and "win64". FMI 2.0.x,
/// section 2.3 "FMU Distribution" (docs/2_3_fmu_distribution.adoc): "The following names are
/// standardized: for Windows: win32, win64 - for Linux: linux32, linux64, for Macintosh: darwin32,
/// darwin64".
const char* platform_folder(int fmi_version);
const char* windows_platform_folder(int fmi_version);

}  // namespace elyfmi
