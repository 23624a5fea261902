#include "si_units.hpp"

#include <cctype>
#include <stdexcept>

namespace elyfmi {
namespace {

struct Symbol {
    const char* name;
    BaseUnit unit;
};

// SI base units and the coherent derived units with special names (SI Brochure, 9th edition,
// BIPM 2019, tables 2 and 4), and the non-SI units accepted for use with the SI that the table
// uses (table 8: h, min).
const Symbol kSymbols[] = {
    {"kg", {{1, 0, 0, 0, 0, 0, 0, 0}, 1}},     {"m", {{0, 1, 0, 0, 0, 0, 0, 0}, 1}},
    {"s", {{0, 0, 1, 0, 0, 0, 0, 0}, 1}},      {"A", {{0, 0, 0, 1, 0, 0, 0, 0}, 1}},
    {"K", {{0, 0, 0, 0, 1, 0, 0, 0}, 1}},      {"mol", {{0, 0, 0, 0, 0, 1, 0, 0}, 1}},
    {"cd", {{0, 0, 0, 0, 0, 0, 1, 0}, 1}},     {"rad", {{0, 0, 0, 0, 0, 0, 0, 1}, 1}},
    {"g", {{1, 0, 0, 0, 0, 0, 0, 0}, 1e-3}},   {"Hz", {{0, 0, -1, 0, 0, 0, 0, 0}, 1}},
    {"N", {{1, 1, -2, 0, 0, 0, 0, 0}, 1}},     {"Pa", {{1, -1, -2, 0, 0, 0, 0, 0}, 1}},
    {"J", {{1, 2, -2, 0, 0, 0, 0, 0}, 1}},     {"W", {{1, 2, -3, 0, 0, 0, 0, 0}, 1}},
    {"C", {{0, 0, 1, 1, 0, 0, 0, 0}, 1}},      {"V", {{1, 2, -3, -1, 0, 0, 0, 0}, 1}},
    {"F", {{-1, -2, 4, 2, 0, 0, 0, 0}, 1}},    {"ohm", {{1, 2, -3, -2, 0, 0, 0, 0}, 1}},
    {"S", {{-1, -2, 3, 2, 0, 0, 0, 0}, 1}},    {"h", {{0, 0, 1, 0, 0, 0, 0, 0}, 3600}},
    {"min", {{0, 0, 1, 0, 0, 0, 0, 0}, 60}},   {"1", {{0, 0, 0, 0, 0, 0, 0, 0}, 1}},
};

class Reader {
public:
    explicit Reader(const std::string& text) : text_(text) {}

    BaseUnit read() {
        BaseUnit u = product();
        skip_spaces();
        if (pos_ != text_.size()) fail("unexpected '" + std::string(1, text_[pos_]) + "'");
        return u;
    }

private:
    [[noreturn]] void fail(const std::string& why) const {
        throw std::runtime_error("unit " + text_ + ": " + why);
    }
    void skip_spaces() {
        while (pos_ < text_.size() && text_[pos_] == ' ') ++pos_;
    }
    static void combine(BaseUnit& into, const BaseUnit& u, int power) {
        for (std::size_t i = 0; i < into.exponents.size(); ++i) into.exponents[i] += power * u.exponents[i];
        for (int k = 0; k < (power < 0 ? -power : power); ++k) into.factor = power < 0 ? into.factor / u.factor : into.factor * u.factor;
    }
    BaseUnit product() {
        BaseUnit u;
        bool first = true;
        for (;;) {
            skip_spaces();
            if (pos_ >= text_.size() || text_[pos_] == ')') {
                if (first) fail("a unit is missing");
                return u;
            }
            int sign = 1;
            if (text_[pos_] == '/') {
                sign = -1;
                ++pos_;
            } else if (text_[pos_] == '*') {
                ++pos_;
            } else if (!first && text_[pos_ - 1] != ' ') {
                fail("unexpected '" + std::string(1, text_[pos_]) + "'");
            }
            skip_spaces();
            combine(u, factor(), sign);
            first = false;
        }
    }
    BaseUnit factor() {
        BaseUnit u;
        if (pos_ < text_.size() && text_[pos_] == '(') {
            ++pos_;
            u = product();
            if (pos_ >= text_.size() || text_[pos_] != ')') fail("')' is missing");
            ++pos_;
        } else {
            const std::size_t start = pos_;
            while (pos_ < text_.size() && (std::isalpha(static_cast<unsigned char>(text_[pos_])) ||
                                           (pos_ == start && text_[pos_] == '1')))
                ++pos_;
            const std::string name = text_.substr(start, pos_ - start);
            const Symbol* found = nullptr;
            for (const Symbol& s : kSymbols)
                if (name == s.name) found = &s;
            if (!found) fail("symbol '" + name + "' is not an SI unit this table knows");
            u = found->unit;
        }
        if (pos_ < text_.size() && text_[pos_] == '^') ++pos_;
        const std::size_t start = pos_;
        if (pos_ < text_.size() && text_[pos_] == '-') ++pos_;
        while (pos_ < text_.size() && std::isdigit(static_cast<unsigned char>(text_[pos_]))) ++pos_;
        if (pos_ > start) {
            const int power = std::stoi(text_.substr(start, pos_ - start));
            BaseUnit raised;
            combine(raised, u, power);
            return raised;
        }
        return u;
    }

    const std::string& text_;
    std::size_t pos_ = 0;
};

}  // namespace

BaseUnit base_unit(const std::string& unit) { return Reader(unit).read(); }

}  // namespace elyfmi
