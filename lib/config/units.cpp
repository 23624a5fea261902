#include "config/units.hpp"

#include <charconv>
#include <cmath>
#include <cstdlib>
#include <fmt/format.h>
#include <optional>

#include "base/error.hpp"
#include "base/excerpt.hpp"

namespace ely {
namespace {

// Unit definitions. SI Brochure, 9th ed. (BIPM 2019): coherent derived units with special
// names (table 4), prefixes (table 7), min, h, d, L, t accepted for use with the SI (table 8),
// t/°C = T/K − 273.15 (section 2.3.1); 1 bar = 1e5 Pa and 1 atm = 101325 Pa exactly (NIST SP
// 811, 2008 ed., appendix B); 1 Wh = 3600 J by definition. (Table numbers from memory.)
// Dimensions over (m, kg, s, A, K, mol).
struct Symbol {
    std::string_view name;
    double numerator;
    int exponent10;
    double offset;
    Dimension dimension;
    bool prefixable;
};

constexpr Dimension kLength{1, 0, 0, 0, 0, 0};
constexpr Dimension kMass{0, 1, 0, 0, 0, 0};
constexpr Dimension kTime{0, 0, 1, 0, 0, 0};
constexpr Dimension kCurrent{0, 0, 0, 1, 0, 0};
constexpr Dimension kTemperature{0, 0, 0, 0, 1, 0};
constexpr Dimension kAmount{0, 0, 0, 0, 0, 1};
constexpr Dimension kPressure{-1, 1, -2, 0, 0, 0};
constexpr Dimension kPower{2, 1, -3, 0, 0, 0};
constexpr Dimension kEnergy{2, 1, -2, 0, 0, 0};
constexpr Dimension kVoltage{2, 1, -3, -1, 0, 0};
constexpr Dimension kResistance{2, 1, -3, -2, 0, 0};
constexpr Dimension kConductance{-2, -1, 3, 2, 0, 0};
constexpr Dimension kCharge{0, 0, 1, 1, 0, 0};
constexpr Dimension kVolume{3, 0, 0, 0, 0, 0};
constexpr Dimension kOne{0, 0, 0, 0, 0, 0};

constexpr Symbol kSymbols[] = {
    {"m", 1, 0, 0, kLength, true},
    {"g", 1, -3, 0, kMass, true},  // the kilogram is the base unit: 1 g = 1e-3 kg
    {"s", 1, 0, 0, kTime, true},
    {"A", 1, 0, 0, kCurrent, true},
    {"K", 1, 0, 0, kTemperature, true},
    {"mol", 1, 0, 0, kAmount, true},
    {"Pa", 1, 0, 0, kPressure, true},
    {"bar", 1, 5, 0, kPressure, true},  // 1 bar = 1e5 Pa exactly
    {"atm", 101325, 0, 0, kPressure, false},
    {"W", 1, 0, 0, kPower, true},
    {"Wh", 3600, 0, 0, kEnergy, true},  // 1 kWh = 3.6e6 J exactly
    {"J", 1, 0, 0, kEnergy, true},
    {"V", 1, 0, 0, kVoltage, true},
    {"ohm", 1, 0, 0, kResistance, true},
    {"\xCE\xA9", 1, 0, 0, kResistance, true},      // Ω (Greek capital omega)
    {"\xE2\x84\xA6", 1, 0, 0, kResistance, true},  // Ω (ohm sign)
    {"S", 1, 0, 0, kConductance, true},
    {"C", 1, 0, 0, kCharge, true},
    {"Ah", 3600, 0, 0, kCharge, true},
    {"L", 1, -3, 0, kVolume, true},  // 1 L = 1 dm3
    {"l", 1, -3, 0, kVolume, true},
    {"h", 3600, 0, 0, kTime, false},
    {"min", 60, 0, 0, kTime, false},
    {"d", 86400, 0, 0, kTime, false},
    {"t", 1, 3, 0, kMass, false},  // tonne
    {"degC", 1, 0, 273.15, kTemperature, false},
    {"\xC2\xB0" "C", 1, 0, 273.15, kTemperature, false},  // °C
    {"\xE2\x84\x83", 1, 0, 273.15, kTemperature, false},  // ℃
    {"%", 1, -2, 0, kOne, false},
    {"wt%", 1, -2, 0, kOne, false},
    {"mol%", 1, -2, 0, kOne, false},
    {"vol%", 1, -2, 0, kOne, false},
    {"ppm", 1, -6, 0, kOne, false},
};

struct Prefix {
    std::string_view name;
    int exponent10;
};
constexpr Prefix kPrefixes[] = {
    {"n", -9}, {"u", -6}, {"\xC2\xB5", -6} /* µ micro sign */, {"\xCE\xBC", -6} /* μ Greek mu */,
    {"m", -3}, {"c", -2}, {"k", 3},       {"M", 6},  {"G", 9},
};

constexpr std::string_view kKnownList =
    "m g s A K mol Pa bar atm W Wh J V ohm S C Ah L h min d t degC 1 % wt% mol% vol% ppm; "
    "prefixes n u m c k M G";

// ASCII white space (a value pasted from a spreadsheet may end in a line break).
bool is_space(char c) { return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\v' || c == '\f'; }

double power_of_ten(int n) {
    // Exact for |n| <= 22 (10^22 < 2^53 · 2^22 is representable); divide for negative n so
    // that "178 um" gives the double nearest to 1.78e-4.
    static constexpr double kPowers[] = {1e0,  1e1,  1e2,  1e3,  1e4,  1e5,  1e6,  1e7,
                                         1e8,  1e9,  1e10, 1e11, 1e12, 1e13, 1e14, 1e15,
                                         1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22};
    if (n >= 0 && n <= 22) return kPowers[n];
    return std::pow(10.0, n);
}

double scale_by_ten(double value, int n) {
    if (n == 0) return value;
    if (n > 0) return value * power_of_ten(n);
    if (n >= -22) return value / power_of_ten(-n);
    return value * std::pow(10.0, n);
}

// User text in messages: a unit expression is at most kMaxUnitLength bytes when it is parsed;
// longer texts (the limit's own message, a whole quantity) are cut.
std::string shown(std::string_view text) { return excerpt(text, kMaxUnitLength); }

[[noreturn]] void fail_unit(const std::string& message) { throw Error(ErrorKind::config, message); }

// Every intermediate result of the parser stays within these limits, so that the integer
// arithmetic of multiply() and raise() cannot overflow: |exponent| <= 24 times at most 99
// in raise() and sums of two in multiply() are far inside int.
void check_ranges(const Unit& u, std::string_view text) {
    static constexpr const char* kBase[] = {"m", "kg", "s", "A", "K", "mol"};
    for (std::size_t i = 0; i < u.dimension.size(); ++i) {
        if (u.dimension[i] > kMaxUnitExponent || u.dimension[i] < -kMaxUnitExponent)
            fail_unit(fmt::format("unit '{}' raises {} to the power {}, beyond the limit of {} to {}", shown(text),
                                  kBase[i], u.dimension[i], -kMaxUnitExponent, kMaxUnitExponent));
    }
    if (u.exponent10 > kMaxUnitPowerOfTen || u.exponent10 < -kMaxUnitPowerOfTen)
        fail_unit(fmt::format("unit '{}' has a factor of 1e{}, beyond the limit of 1e-{} to 1e{}", shown(text),
                              u.exponent10, kMaxUnitPowerOfTen, kMaxUnitPowerOfTen));
    if (!std::isfinite(u.numerator) || !std::isfinite(u.denominator))
        fail_unit(fmt::format("unit '{}' has a conversion factor too large for a double", shown(text)));
}

Unit multiply(const Unit& a, const Unit& b) {
    Unit r;
    r.numerator = a.numerator * b.numerator;
    r.denominator = a.denominator * b.denominator;
    r.exponent10 = a.exponent10 + b.exponent10;
    for (std::size_t i = 0; i < r.dimension.size(); ++i) r.dimension[i] = a.dimension[i] + b.dimension[i];
    return r;
}

Unit inverse(const Unit& a) {
    Unit r;
    r.numerator = a.denominator;
    r.denominator = a.numerator;
    r.exponent10 = -a.exponent10;
    for (std::size_t i = 0; i < r.dimension.size(); ++i) r.dimension[i] = -a.dimension[i];
    return r;
}

Unit raise(const Unit& a, int n) {
    Unit base = n < 0 ? inverse(a) : a;
    const int m = n < 0 ? -n : n;
    Unit r;
    for (int k = 0; k < m; ++k) r = multiply(r, base);
    return r;
}

std::string quoted_context(std::string_view text, std::string_view part) {
    if (part == text) return fmt::format("'{}'", shown(text));
    return fmt::format("'{}' (in '{}')", shown(part), shown(text));
}

class UnitParser {
public:
    explicit UnitParser(std::string_view text) : text_(text) {}

    Unit parse() {
        if (text_.size() > kMaxUnitLength)
            fail(fmt::format("unit '{}' is longer than the limit of {} bytes", shown(text_), kMaxUnitLength));
        skip_space();
        if (pos_ == text_.size()) fail("unit '' is empty");
        Unit u = expression();
        skip_space();
        if (pos_ != text_.size()) unexpected();
        return u;
    }

private:
    // a/b c/d = a/(b c)/d: everything after a solidus up to the next one is the denominator
    // (engineering habit "W/m2 K"; SI Brochure 5.4.6 asks for parentheses, which also work).
    Unit expression() {
        Unit u = product();
        for (;;) {
            skip_space();
            if (!at("/")) return u;
            ++pos_;
            skip_space();
            u = multiply(u, inverse(product()));
            check_ranges(u, text_);
        }
    }

    Unit product() {
        Unit u = power();
        for (;;) {
            const std::size_t before = pos_;
            skip_space();
            const bool spaced = pos_ != before;
            if (at("*") || at(".")) {
                ++pos_;
            } else if (at("\xC2\xB7")) {  // · middle dot
                pos_ += 2;
            } else if (at("\xE2\x8B\x85")) {  // ⋅ dot operator
                pos_ += 3;
            } else if (!spaced || pos_ == text_.size() || at("/") || at(")")) {
                return u;
            }
            skip_space();
            u = multiply(u, power());
            check_ranges(u, text_);
        }
    }

    Unit power() {
        Unit u = atom();
        const int n = exponent();
        if (n == 1) return u;
        u = raise(u, n);
        check_ranges(u, text_);
        return u;
    }

    Unit atom() {
        if (at("(")) {
            // Each level costs a few stack frames: the bound keeps a parse within a small stack
            // (a worker thread's) whatever the text.
            if (depth_ == kMaxUnitDepth)
                fail(fmt::format("unit '{}' nests parentheses deeper than the limit of {} levels", shown(text_),
                                 kMaxUnitDepth));
            ++depth_;
            ++pos_;
            skip_space();
            Unit u = expression();
            skip_space();
            if (!at(")")) fail(fmt::format("unit '{}' has an unclosed '('", shown(text_)));
            ++pos_;
            --depth_;
            return u;
        }
        if (at("1") && !(pos_ + 1 < text_.size() && is_digit(text_[pos_ + 1]))) {
            ++pos_;
            return Unit{};
        }
        const std::size_t start = pos_;
        while (pos_ < text_.size()) {
            const std::size_t n = symbol_char_length();
            if (n == 0) break;
            pos_ += n;
        }
        if (pos_ == start) unexpected();
        return lookup(text_.substr(start, pos_ - start));
    }

    int exponent() {
        if (at("^")) {
            ++pos_;
            int sign = 1;
            if (at("-")) sign = -1, ++pos_;
            else if (at("+")) ++pos_;
            if (pos_ == text_.size() || !is_digit(text_[pos_]))
                fail(fmt::format("unit '{}' has no exponent after '^'", shown(text_)));
            return sign * digits();
        }
        if ((at("-") || at("+")) && pos_ + 1 < text_.size() && is_digit(text_[pos_ + 1])) {
            const int sign = at("-") ? -1 : 1;
            ++pos_;
            return sign * digits();
        }
        if (pos_ < text_.size() && is_digit(text_[pos_])) return digits();
        // Superscripts: ⁻ ⁺ then ⁰¹²³⁴⁵⁶⁷⁸⁹.
        int sign = 1;
        const std::size_t start = pos_;
        if (at("\xE2\x81\xBB")) sign = -1, pos_ += 3;
        else if (at("\xE2\x81\xBA")) pos_ += 3;
        int value = 0, count = 0, d = 0;
        while ((d = superscript_digit()) >= 0) {
            value = value * 10 + d;
            if (++count > 2) fail(fmt::format("unit '{}' has an exponent out of range", shown(text_)));
        }
        if (count == 0) {
            if (pos_ != start) fail(fmt::format("unit '{}' has no digit after the superscript sign", shown(text_)));
            return 1;
        }
        return sign * value;
    }

    int digits() {
        int value = 0, count = 0;
        while (pos_ < text_.size() && is_digit(text_[pos_])) {
            value = value * 10 + (text_[pos_++] - '0');
            if (++count > 2) fail(fmt::format("unit '{}' has an exponent out of range", shown(text_)));
        }
        return value;
    }

    int superscript_digit() {
        if (at("\xC2\xB2")) return pos_ += 2, 2;
        if (at("\xC2\xB3")) return pos_ += 2, 3;
        if (at("\xC2\xB9")) return pos_ += 2, 1;
        if (at("\xE2\x81\xB0")) return pos_ += 3, 0;
        if (pos_ + 2 < text_.size() && text_.compare(pos_, 2, "\xE2\x81") == 0) {
            const auto c = static_cast<unsigned char>(text_[pos_ + 2]);
            if (c >= 0xB4 && c <= 0xB9) return pos_ += 3, c - 0xB0;
        }
        return -1;
    }

    // Length in bytes of the symbol character at pos_, 0 if none: ASCII letters, %, and µ μ
    // Ω Ω ° ℃ in UTF-8.
    std::size_t symbol_char_length() const {
        const char c = text_[pos_];
        if ((c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z') || c == '%') return 1;
        for (std::string_view s : {"\xC2\xB5", "\xCE\xBC", "\xCE\xA9", "\xC2\xB0"})
            if (at(s)) return 2;
        for (std::string_view s : {"\xE2\x84\xA6", "\xE2\x84\x83"})
            if (at(s)) return 3;
        return 0;
    }

    Unit lookup(std::string_view name) {
        const Symbol* found = nullptr;
        int prefix = 0;
        for (const auto& s : kSymbols)
            if (s.name == name) found = &s;
        if (!found) {
            for (const auto& p : kPrefixes) {
                if (name.size() <= p.name.size() || name.substr(0, p.name.size()) != p.name) continue;
                const auto rest = name.substr(p.name.size());
                for (const auto& s : kSymbols)
                    if (s.prefixable && s.name == rest) found = &s, prefix = p.exponent10;
                if (found) break;
            }
        }
        if (!found) {
            if (name == "Nm" || name == "Sm")
                fail(fmt::format("unit '{}': normal or standard cubic metres ({}3) depend on a reference "
                                 "state and are not accepted; give the mass rate, e.g. in kg/s or kg/h",
                                 shown(text_), name));
            fail(fmt::format("unit {} is not known; known units: {}", quoted_context(text_, name), kKnownList));
        }
        if (found->offset != 0) {
            if (name != text_) {
                fail(fmt::format("unit '{}': {} stands only on its own as a temperature; use K in "
                                 "compound units and for differences (e.g. 'K/h')",
                                 shown(text_), found->name));
            }
            offset_ = found->offset;
        }
        Unit u;
        u.numerator = found->numerator;
        u.exponent10 = found->exponent10 + prefix;
        u.dimension = found->dimension;
        return u;
    }

public:
    double offset() const { return offset_; }

private:
    static bool is_digit(char c) { return c >= '0' && c <= '9'; }
    bool at(std::string_view s) const { return text_.compare(pos_, s.size(), s) == 0 && pos_ < text_.size(); }
    void skip_space() {
        while (pos_ < text_.size() && is_space(text_[pos_])) ++pos_;
    }
    [[noreturn]] void unexpected() const {
        fail(fmt::format("unit '{}' has an unexpected '{}' at character {}", shown(text_), shown(text_.substr(pos_, 1)),
                         pos_ + 1));
    }
    [[noreturn]] static void fail(const std::string& message) { throw Error(ErrorKind::config, message); }

    std::string_view text_;
    std::size_t pos_ = 0;
    int depth_ = 0;  // parentheses open at pos_
    double offset_ = 0;
};

std::string_view trim(std::string_view s) {
    while (!s.empty() && is_space(s.front())) s.remove_prefix(1);
    while (!s.empty() && is_space(s.back())) s.remove_suffix(1);
    return s;
}

// The one conversion of a value between two parsed units (every entry point comes here):
// value_to = (value · f_from + offset_from − offset_to) / f_to with f = numerator/denominator · 10^e;
// the rational parts are combined first so that exact conversions stay exact, and equal offsets
// (degC to degC) cancel exactly.
double apply(double value, const Unit& from, std::string_view from_text, const Unit& to, std::string_view to_text) {
    if (from.dimension != to.dimension) {
        // "C" is the coulomb; written for a temperature it is nearly always meant as degrees Celsius.
        const bool celsius_meant = from_text == "C" && to.dimension == kTemperature;
        throw Error(ErrorKind::config,
                    fmt::format("expected a quantity in {}, got '{}' ({} instead of {}){}", shown(to_text), shown(from_text),
                                dimension_text(from.dimension), dimension_text(to.dimension),
                                celsius_meant ? "; did you mean degC?" : ""));
    }
    double v = value;
    const double numerator = from.numerator * to.denominator;
    const double denominator = from.denominator * to.numerator;
    if (numerator != 1) v *= numerator;
    if (denominator != 1) v /= denominator;
    v = scale_by_ten(v, from.exponent10 - to.exponent10);
    if (from.offset != to.offset) v += (from.offset - to.offset) / to.factor();
    return v;
}

}  // namespace

std::string units_markdown() {
    std::string out =
        "| symbol | value in SI base units | prefixes |\n|---|---|---|\n";
    for (const auto& s : kSymbols) {
        std::string value;
        if (s.offset != 0) {
            value = fmt::format("T/K = t/degC + {:g}", s.offset);
        } else {
            const std::string dim = dimension_text(s.dimension);
            // The kilogram is the base unit of mass: quote g and t against it.
            std::string factor;
            if (s.numerator != 1 || s.exponent10 != 0) {
                factor = s.numerator != 1 ? fmt::format("{:g}", s.numerator) : "";
                if (s.exponent10 != 0) factor += (factor.empty() ? "" : "·") + fmt::format("1e{}", s.exponent10);
            }
            value = factor.empty() ? dim : (dim == "1" ? factor : factor + " " + dim);
        }
        out += fmt::format("| `{}` | {} | {} |\n", s.name, value, s.prefixable ? "yes" : "no");
    }
    out += "\nPrefixes: ";
    bool first = true;
    for (const auto& p : kPrefixes) {
        out += fmt::format("{}`{}` 1e{}", first ? "" : ", ", p.name, p.exponent10);
        first = false;
    }
    out += ".\n";
    return out;
}

double Unit::factor() const { return scale_by_ten(numerator / denominator, exponent10); }

Unit parse_unit(std::string_view text) {
    const auto t = trim(text);
    UnitParser parser(t);
    Unit u = parser.parse();
    u.offset = parser.offset();
    return u;
}

std::string dimension_text(const Dimension& dimension) {
    static constexpr const char* kNames[] = {"m", "kg", "s", "A", "K", "mol"};
    std::string out;
    for (std::size_t i = 0; i < dimension.size(); ++i) {
        if (dimension[i] == 0) continue;
        if (!out.empty()) out += ' ';
        out += kNames[i];
        if (dimension[i] != 1) out += std::to_string(dimension[i]);
    }
    return out.empty() ? "1" : out;
}

double convert_unit(double value, std::string_view from, std::string_view to) {
    if (!std::isfinite(value)) throw Error(ErrorKind::config, fmt::format("value {} is not a finite number", value));
    const auto from_text = trim(from), to_text = trim(to);
    const double v = apply(value, parse_unit(from_text), from_text, parse_unit(to_text), to_text);
    if (!std::isfinite(v))
        throw Error(ErrorKind::config, fmt::format("{:g} {} is out of range in {}", value, shown(from_text), shown(to_text)));
    return v;
}

namespace {

struct LeadingNumber {
    double value;
    std::string_view rest;  // the text after the number, trimmed
};

// The number at the start of a trimmed quantity text; throws config errors naming the text.
LeadingNumber leading_number(std::string_view t) {
    std::string_view rest = t;
    bool negative = false;
    if (!rest.empty() && (rest.front() == '+' || rest.front() == '-')) {
        negative = rest.front() == '-';
        rest.remove_prefix(1);
    }
    double number = 0;
    const auto r = std::from_chars(rest.data(), rest.data() + rest.size(), number);
    if (r.ec != std::errc() || rest.empty() || rest.front() == '+' || rest.front() == '-') {
        if (r.ec == std::errc::result_out_of_range)
            throw Error(ErrorKind::config, fmt::format("the number in '{}' is out of range", shown(t)));
        throw Error(ErrorKind::config,
                    fmt::format("expected a number followed by a unit (e.g. '80 degC'), got '{}'", shown(t)));
    }
    if (negative) number = -number;
    if (!std::isfinite(number))
        throw Error(ErrorKind::config, fmt::format("'{}' is not a finite number", shown(t)));
    return {number, trim(rest.substr(static_cast<std::size_t>(r.ptr - rest.data())))};
}

}  // namespace

double parse_plain_number(std::string_view text) {
    const auto t = trim(text);
    const LeadingNumber n = leading_number(t);
    if (!n.rest.empty())
        throw Error(ErrorKind::config, fmt::format("expected a plain number, got '{}'", shown(t)));
    return n.value;
}

double parse_quantity(std::string_view text, std::string_view expected_unit) {
    const auto t = trim(text), to_text = trim(expected_unit);
    // The expected unit first: one with an offset (degC) is refused whatever the text, since a
    // caller wants the value in a unit that scales (an SI unit of the variable table).
    std::optional<Unit> to;
    try {
        to = parse_unit(to_text);
    } catch (const Error&) {
        // A unit outside the grammar, e.g. "(A/m2)^-n" of an empirical fit: bare numbers only.
    }
    if (to && to->offset != 0)
        throw Error(ErrorKind::config,
                    fmt::format("unit '{}' has an offset; give a unit without one (K, not degC)", shown(to_text)));
    const LeadingNumber n = leading_number(t);
    if (n.rest.empty()) return n.value;  // a bare number is already in the expected unit
    if (!to)
        throw Error(ErrorKind::config, fmt::format("values in '{}' take no unit conversion; give a plain number "
                                                   "in {}, got '{}'",
                                                   shown(to_text), shown(to_text), shown(t)));
    const double v = apply(n.value, parse_unit(n.rest), n.rest, *to, to_text);
    if (!std::isfinite(v))
        throw Error(ErrorKind::config, fmt::format("'{}' is out of range in {}", shown(t), shown(to_text)));
    return v;
}

}  // namespace ely
