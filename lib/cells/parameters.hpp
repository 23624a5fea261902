#pragma once
// Named model parameters: every technology describes its parameters once (key, SI unit,
// default, limits, meaning, source of the default). The config layer validates JSON
// against these descriptions and the docs list them; the cell models read values by key.
#include <string>
#include <vector>

namespace ely {

struct ParameterInfo {
    const char* key;          // JSON key inside the "cell" object, snake_case
    const char* unit;         // SI unit of the value ("1" for dimensionless)
    double default_value;
    double min, max;          // inclusive validity limits of the value
    const char* description;
    const char* source;       // published source of the default, or "typical value, from memory"
};

/// Values for a list of ParameterInfo, defaults unless set. Unknown keys and values outside
/// [min, max] are errors naming the key and the limit.
class ParameterValues {
public:
    explicit ParameterValues(const std::vector<ParameterInfo>& infos);
    void set(const std::string& key, double value);  // checks the limits
    double get(const std::string& key) const;        // throws unknown_name for a key not described
    const std::vector<ParameterInfo>& infos() const { return *infos_; }
    const std::vector<double>& values() const { return values_; }

private:
    const std::vector<ParameterInfo>* infos_;
    std::vector<double> values_;
};

}  // namespace ely
