#include "package.hpp"

#include <archive.h>
#include <archive_entry.h>
#include <boost/json.hpp>
#include <elyblock/elyblock.h>

#include <cstdio>
#include <cstdlib>
#include <ctime>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <memory>
#include <stdexcept>

#include "model_description.hpp"
#include "variables.hpp"

namespace elyfmi {
namespace {

std::string read_file(const std::string& path, const char* what) {
    std::ifstream in(path, std::ios::binary);
    if (!in) throw std::runtime_error(std::string("cannot read ") + what + " " + path);
    return std::string(std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>());
}

// UTC now, or SOURCE_DATE_EPOCH when set (reproducible builds), as xs:dateTime.
std::string generation_time() {
    std::time_t t = std::time(nullptr);
    if (const char* epoch = std::getenv("SOURCE_DATE_EPOCH")) t = static_cast<std::time_t>(std::strtoll(epoch, nullptr, 10));
    std::tm utc{};
    gmtime_r(&t, &utc);
    char text[32];
    std::strftime(text, sizeof text, "%Y-%m-%dT%H:%M:%SZ", &utc);
    return text;
}

struct ArchiveDeleter {
    void operator()(archive* a) const { archive_write_free(a); }
};

void add_entry(archive* a, const std::string& name, const std::string& data, int mode, std::time_t mtime) {
    std::unique_ptr<archive_entry, void (*)(archive_entry*)> entry(archive_entry_new(), archive_entry_free);
    archive_entry_set_pathname(entry.get(), name.c_str());
    archive_entry_set_size(entry.get(), static_cast<la_int64_t>(data.size()));
    archive_entry_set_filetype(entry.get(), AE_IFREG);
    archive_entry_set_perm(entry.get(), mode);
    archive_entry_set_mtime(entry.get(), mtime, 0);
    if (archive_write_header(a, entry.get()) != ARCHIVE_OK ||
        archive_write_data(a, data.data(), data.size()) != static_cast<la_ssize_t>(data.size()))
        throw std::runtime_error("cannot write " + name + " into the FMU: " + archive_error_string(a));
}

}  // namespace

const char* platform_folder(int fmi_version) { return fmi_version == 3 ? "x86_64-linux" : "linux64"; }
const char* windows_platform_folder(int fmi_version) { return fmi_version == 3 ? "x86_64-windows" : "win64"; }

std::string package_fmu(const PackageOptions& o) {
    namespace fs = std::filesystem;
    if (o.fmi_version != 2 && o.fmi_version != 3) throw std::runtime_error("the FMI version must be 2 or 3");
    const std::string plant_text = read_file(o.plant_path, "the plant description");
    const std::string binary = read_file(o.binary_path, "the FMU binary");
    const std::string windows_binary =
        o.windows_binary_path.empty() ? std::string() : read_file(o.windows_binary_path, "the FMU's Windows binary");
    if (!o.windows_binary_path.empty() && windows_binary.compare(0, 2, "MZ") != 0)
        throw std::runtime_error(o.windows_binary_path + " is not a Windows DLL");

    ely_block* raw = nullptr;
    if (ely_block_create(plant_text.c_str(), &raw) < 0)
        throw std::runtime_error(o.plant_path + ": " + ely_last_error());
    std::unique_ptr<ely_block, void (*)(ely_block*)> block(raw, ely_block_destroy);

    DescriptionOptions d;
    d.fmi_version = o.fmi_version;
    d.model_identifier =
        o.model_identifier.empty() ? model_identifier_from(fs::path(o.plant_path).stem().string()) : o.model_identifier;
    if (model_identifier_from(d.model_identifier) != d.model_identifier)
        throw std::runtime_error("model identifier " + d.model_identifier + " is not a C identifier");
    d.plant_text = plant_text;
    d.generation_time = generation_time();
    std::string technology = "electrolysis";
    d.model_name = d.model_identifier;
    try {
        const boost::json::value parsed = boost::json::parse(plant_text);
        const boost::json::object& plant = parsed.as_object();
        if (auto* name = plant.if_contains("name"); name && name->is_string()) d.model_name = name->as_string().c_str();
        if (auto* t = plant.if_contains("technology"); t && t->is_string()) technology = t->as_string().c_str();
    } catch (const std::exception&) {
        // The library read it; a plant without a name keeps the identifier as its name.
    }
    d.description = "elyblock electrolyzer plant (" + technology +
                    "), co-simulation: stack temperature, modes, ramps and gas purity in time; the plant "
                    "description is resources/plant.json";
    const std::string xml = model_description(block.get(), d);

    const fs::path output(o.output_path);
    const fs::path partial = output.string() + ".partial";
    std::unique_ptr<archive, ArchiveDeleter> a(archive_write_new());
    if (!a || archive_write_set_format_zip(a.get()) != ARCHIVE_OK)
        throw std::runtime_error("libarchive cannot write zip archives");
    if (archive_write_open_filename(a.get(), partial.c_str()) != ARCHIVE_OK)
        throw std::runtime_error("cannot write " + output.string() + ": " + archive_error_string(a.get()));
    const std::time_t mtime = std::time(nullptr);
    try {
        add_entry(a.get(), "modelDescription.xml", xml, 0644, mtime);
        add_entry(a.get(), std::string("binaries/") + platform_folder(o.fmi_version) + "/" + d.model_identifier + ".so",
                  binary, 0755, mtime);
        if (!o.windows_binary_path.empty())
            add_entry(a.get(),
                      std::string("binaries/") + windows_platform_folder(o.fmi_version) + "/" + d.model_identifier + ".dll",
                      windows_binary, 0755, mtime);
        add_entry(a.get(), "resources/plant.json", plant_text, 0644, mtime);
        if (archive_write_close(a.get()) != ARCHIVE_OK)
            throw std::runtime_error("cannot finish " + partial.string() + ": " + archive_error_string(a.get()));
    } catch (...) {
        a.reset();
        std::error_code ignored;
        fs::remove(partial, ignored);
        throw;
    }
    a.reset();
    std::error_code ec;
    fs::rename(partial, output, ec);
    if (ec) {
        fs::remove(partial, ec);
        throw std::runtime_error("cannot write " + output.string());
    }
    return d.model_identifier;
}

}  // namespace elyfmi
