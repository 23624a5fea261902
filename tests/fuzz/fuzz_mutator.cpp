// Structure-aware mutations for fuzz_config (libFuzzer's custom mutator). Byte flips alone take
// minutes to build a deeply nested unit, an object of hundreds of keys or a batch call with a
// zero count and a NULL array; these mutations write such structures in one step, and leave
// the rest to libFuzzer's own mutations. Linked only into the libFuzzer build.
#include <cstddef>
#include <cstdint>
#include <cstring>
#include <random>
#include <string>

extern "C" size_t LLVMFuzzerMutate(uint8_t* data, size_t size, size_t max_size);

namespace {

using Rng = std::minstd_rand;

size_t below(Rng& rng, size_t n) { return n == 0 ? 0 : rng() % n; }

template <class T, size_t N>
const T& one_of(Rng& rng, const T (&table)[N]) {
    return table[below(rng, N)];
}

// Counts near the limits of the library and far beyond them.
size_t count(Rng& rng) {
    static const size_t kCounts[] = {0, 1, 2, 15, 16, 17, 31, 32, 33, 127, 128, 129, 255, 256, 257,
                                     800, 1023, 1024, 1025, 2000, 5000, 20000};
    return one_of(rng, kCounts);
}

// A random unit expression: symbols with prefixes and exponents, products, quotients and
// parentheses, nested as deep as the budget allows.
void unit(Rng& rng, std::string& out, int depth) {
    static const char* const kSymbols[] = {"K", "m", "kg", "s", "A", "mol", "Pa", "bar", "kWh", "h", "ppm", "%",
                                           "degC", "cm", "MW", "ohm", "\xCE\xA9", "\xC2\xB5m", "t", "1", "Nm"};
    static const char* const kExponents[] = {"", "", "2", "-1", "99", "^3", "^-99", "\xC2\xB2", "\xE2\x81\xBB\xC2\xB9", "^"};
    static const char* const kOperators[] = {" ", "*", "/", ".", "\xC2\xB7", " / "};
    const size_t kind = depth > 6 ? 0 : below(rng, 4);
    if (kind == 0) {
        out += one_of(rng, kSymbols);
        out += one_of(rng, kExponents);
    } else if (kind == 1) {
        out += '(';
        unit(rng, out, depth + 1);
        out += ')';
        out += one_of(rng, kExponents);
    } else {
        unit(rng, out, depth + 1);
        out += one_of(rng, kOperators);
        unit(rng, out, depth + 1);
    }
}

std::string quantity(Rng& rng) {
    static const char* const kNumbers[] = {"1 ", "80 ", "353.15 ", "-1 ", "1e300 ", "5e-324 ", "0 ", "2", ""};
    std::string text = one_of(rng, kNumbers);
    std::string u;
    unit(rng, u, 0);
    const size_t levels = below(rng, 3) == 0 ? count(rng) : 0;  // wrap in many parentheses
    text += std::string(levels, '(') + u + std::string(levels, ')');
    if (below(rng, 4) == 0) text += one_of(rng, {" ", "\\n", "\\t", " \\r\\n", "\\u0000"});
    return text;
}

// Positions just after a '"' that opens a string value (after ':' or '[' or ',').
size_t string_value_start(Rng& rng, const std::string& s) {
    size_t found = std::string::npos, seen = 0;
    for (size_t i = 1; i < s.size(); ++i) {
        if (s[i] != '"') continue;
        size_t j = i;
        while (j > 0 && (s[j - 1] == ' ' || s[j - 1] == '\n')) --j;
        if (j == 0 || (s[j - 1] != ':' && s[j - 1] != '[')) continue;
        if (below(rng, ++seen) == 0) found = i + 1;  // reservoir sampling: any one, evenly
    }
    return found;
}

void replace_string_value(Rng& rng, std::string& s, const std::string& with) {
    const size_t start = string_value_start(rng, s);
    if (start == std::string::npos) {
        s = R"({"technology":"pem","stack":{"cells":100,"active_area":0.1},)"
            R"("operating":{"spec":"current_density","temperature":")" + with + R"("}})";
        return;
    }
    const size_t end = s.find('"', start);
    s.replace(start, end == std::string::npos ? 0 : end - start, with);
}

size_t random_position_of(Rng& rng, const std::string& s, char c) {
    size_t found = std::string::npos, seen = 0;
    for (size_t i = 0; i < s.size(); ++i)
        if (s[i] == c && below(rng, ++seen) == 0) found = i;
    return found;
}

void many_keys(Rng& rng, std::string& s) {
    const size_t at = random_position_of(rng, s, '{');
    if (at == std::string::npos) return;
    const size_t n = count(rng);
    std::string keys;
    for (size_t k = 0; k < n; ++k) keys += "\"k" + std::to_string(k) + "\":0,";
    if (below(rng, 2) == 0) keys += "\"k0\":1,";  // a duplicate, last
    s.insert(at + 1, keys);
}

void long_array(Rng& rng, std::string& s) {
    const size_t at = random_position_of(rng, s, ':');
    if (at == std::string::npos) return;
    const size_t n = count(rng);
    std::string array = "[";
    for (size_t k = 0; k < n; ++k) array += k ? ",0" : "0";
    array += "]";
    s.insert(at + 1, array + (below(rng, 2) ? "," : ""));  // before the old value: often malformed, often not
}

void deep_nesting(Rng& rng, std::string& s) {
    const size_t at = random_position_of(rng, s, ':');
    if (at == std::string::npos) return;
    const size_t n = count(rng);
    const bool objects = below(rng, 2);
    std::string open, close;
    for (size_t k = 0; k < n; ++k) {
        open += objects ? "{\"a\":" : "[";
        close += objects ? "}" : "]";
    }
    s.insert(at + 1, open + "0" + close + ",");
}

void special_number(Rng& rng, std::string& s) {
    static const char* const kNumbers[] = {"1e300", "-1e300", "5e-324", "1e-320", "-0", "1e400", "0", "1e6", "10001",
                                           "2147483648", "-1", "0.5", "99999999999999999999", "3.0"};
    size_t found = std::string::npos, seen = 0;
    for (size_t i = 0; i < s.size(); ++i)
        if (s[i] >= '0' && s[i] <= '9' && (i == 0 || s[i - 1] == ':' || s[i - 1] == ' ') && below(rng, ++seen) == 0)
            found = i;
    if (found == std::string::npos) return;
    size_t end = found;
    while (end < s.size() && (std::strchr("0123456789.eE+-", s[end]) != nullptr)) ++end;
    s.replace(found, end - found, one_of(rng, kNumbers));
}

// Call programs (see fuzz_config.cpp, run_program): a batch op with independent counts and
// NULLs, water functions with extreme arguments, clones, sets of special values.
void program(Rng& rng, std::string& prog) {
    const size_t ops = 1 + below(rng, 6);
    for (size_t k = 0; k < ops; ++k) {
        const uint8_t op = static_cast<uint8_t>(below(rng, 12));
        prog += static_cast<char>(op);
        const size_t args = op == 4 ? 40 : 12;  // a batch reads many argument bytes
        for (size_t a = 0; a < args; ++a) prog += static_cast<char>(below(rng, 8) == 0 ? rng() : below(rng, 8));
    }
}

}  // namespace

extern "C" size_t LLVMFuzzerCustomMutator(uint8_t* data, size_t size, size_t max_size, unsigned int seed) {
    Rng rng(seed);
    const size_t kind = below(rng, 10);
    if (kind >= 7) return LLVMFuzzerMutate(data, size, max_size);
    const std::string input(reinterpret_cast<const char*>(data), size);
    const size_t nul = input.find('\0');
    std::string config = input.substr(0, nul);
    std::string prog = nul == std::string::npos ? std::string() : input.substr(nul + 1);
    switch (kind) {
        case 0: replace_string_value(rng, config, quantity(rng)); break;
        case 1: many_keys(rng, config); break;
        case 2: long_array(rng, config); break;
        case 3: deep_nesting(rng, config); break;
        case 4: special_number(rng, config); break;
        case 5: program(rng, prog); break;
        default:  // the bundled configs with a program only
            config.clear();
            program(rng, prog);
            break;
    }
    std::string out = config;
    if (!prog.empty()) {
        out += '\0';
        out += prog;
    }
    if (out.size() > max_size) return LLVMFuzzerMutate(data, size, max_size);
    std::memcpy(data, out.data(), out.size());
    return out.size();
}
