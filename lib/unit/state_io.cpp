// Saving and restoring a block: everything a later result depends on — inputs, parameters (the
// cell model's included), spec, outputs, the warm start of the spec solve, the rollback state and
// the dynamic run with its integrator history — as bytes, so that a restored block continues bit
// for bit as the saved one would.
//
// Layout (little-endian): "ELYSTATE", format (u32), producer (u32 length + text), the plant's
// fingerprint (u64), the payload length (u64), the payload, and an FNV-1a hash (u64) of all that
// precedes it. Numbers are stored as their IEEE-754 bits.
#include <cstring>
#include <fmt/format.h>
#include <string>
#include <type_traits>

#include "base/error.hpp"
#include "base/excerpt.hpp"
#include "unit/block.hpp"

namespace ely {

namespace {

constexpr char kMagic[8] = {'E', 'L', 'Y', 'S', 'T', 'A', 'T', 'E'};
constexpr uint32_t kFormat = 1;

/// FNV-1a, 64 bits (Fowler, Noll, Vo; the public-domain reference parameters).
class Hash {
public:
    void bytes(const void* data, std::size_t n) {
        const auto* p = static_cast<const unsigned char*>(data);
        for (std::size_t i = 0; i < n; ++i) h_ = (h_ ^ p[i]) * 0x100000001b3ull;
    }
    template <class T>
    void value(T x) {
        static_assert(std::is_arithmetic_v<T>);
        bytes(&x, sizeof x);
    }
    void text(std::string_view s) {
        value(static_cast<uint64_t>(s.size()));
        bytes(s.data(), s.size());
    }
    uint64_t get() const { return h_; }

private:
    uint64_t h_ = 0xcbf29ce484222325ull;
};

class Writer {
public:
    template <class T>
    void value(T x) {
        static_assert(std::is_arithmetic_v<T>);
        unsigned char b[sizeof(T)];
        std::memcpy(b, &x, sizeof x);
        for (std::size_t i = 0; i < sizeof x; ++i) out_.push_back(static_cast<char>(b[little(i, sizeof x)]));
    }
    void doubles(const std::vector<double>& v) {
        value(static_cast<uint32_t>(v.size()));
        for (double x : v) value(x);
    }
    void text(std::string_view s) {
        value(static_cast<uint32_t>(s.size()));
        out_.append(s.data(), s.size());
    }
    std::string& str() { return out_; }

    static std::size_t little(std::size_t i, std::size_t n) {
        const uint16_t probe = 1;
        unsigned char first;
        std::memcpy(&first, &probe, 1);
        return first == 1 ? i : n - 1 - i;
    }

private:
    std::string out_;
};

[[noreturn]] void refuse(const std::string& why) {
    throw Error(ErrorKind::invalid_argument, "saved state refused: " + why);
}

class Reader {
public:
    explicit Reader(std::string_view in) : in_(in) {}
    template <class T>
    T value() {
        static_assert(std::is_arithmetic_v<T>);
        if (in_.size() - pos_ < sizeof(T)) refuse("it is cut short");
        unsigned char b[sizeof(T)];
        for (std::size_t i = 0; i < sizeof(T); ++i)
            b[Writer::little(i, sizeof(T))] = static_cast<unsigned char>(in_[pos_ + i]);
        pos_ += sizeof(T);
        T x;
        std::memcpy(&x, b, sizeof x);
        return x;
    }
    std::vector<double> doubles(std::size_t limit) {
        const auto n = value<uint32_t>();
        if (n > limit) refuse("a list is longer than this block's");
        std::vector<double> v(n);
        for (auto& x : v) x = value<double>();
        return v;
    }
    std::string_view text() {
        const auto n = value<uint32_t>();
        if (in_.size() - pos_ < n) refuse("it is cut short");
        const std::string_view s = in_.substr(pos_, n);
        pos_ += n;
        return s;
    }
    std::size_t position() const { return pos_; }
    std::size_t left() const { return in_.size() - pos_; }

private:
    std::string_view in_;
    std::size_t pos_ = 0;
};

/// Every field of a run's state, in one order, for writing and for reading.
template <class F>
void visit(RunState& s, F&& f) {
    f(s.running);
    f(s.start_time);
    f(s.time);
    for (auto& x : s.y) f(x);
    f(s.current_density);
    f(s.mode);
    f(s.ramp);
    f(s.mode_since);
    f(s.hours);
    f(s.starts);
    f(s.start_temperature_reached);
    for (auto& x : s.alarm) f(x);
    f(s.at_minimum_load);
    f(s.request);
    f(s.open);
    f(s.pending_event);
    f(s.pending_time);
    RunSegment& g = s.segment;
    for (double* x : {&g.t0, &g.j0, &g.hours0, &g.temperature0, &g.ramp_speed, &g.target, &g.setpoint, &g.quantity_scale,
                      &g.j_lo, &g.j_hi, &g.j_rated, &g.j_floor, &g.heater_target, &g.t_ramp_end, &g.t_mode_end,
                      &g.separator_moles, &g.guess_current, &g.guess_per_kelvin, &g.guess_slope})
        f(*x);
    for (int32_t* x : {&g.mode, &g.ramp, &g.follows_temperature, &g.below_minimum, &g.current_flows, &g.auxiliaries_on,
                       &g.heater_on, &g.coolant_on, &g.valve_controlled})
        f(*x);
    for (auto& x : g.scale) f(x);
    RunStep& st = s.step;
    f(st.t_a);
    f(st.t_b);
    for (auto* v : {&st.x_a, &st.f_a, &st.x_b, &st.f_b})
        for (auto& x : *v) f(x);
    f(s.integrator.next_step);
    f(s.integrator.error_old);
    f(s.integrator.step_old);
    f(s.integrator.first_step);
    f(s.integrator.last_rejected);
    for (auto& x : s.totals.seconds_in_mode) f(x);
    f(s.totals.seconds_at_minimum_load);
    f(s.totals.seconds_operating);
    for (auto& x : s.totals.seconds_alarm) f(x);
    for (auto& x : s.totals.alarm_onsets) f(x);
    f(s.totals.starts_cold);
    f(s.totals.starts_warm);
    f(s.totals.first_trip_time);
    f(s.temperature_at_start);
    f(s.rated_voltage_new);
}

void hash_reaction(Hash& h, const HalfReaction& r) {
    h.text(r.name);
    h.text(r.product);
    h.value(r.electrons);
    h.value(r.standard_potential);
    h.value(r.standard_potential_temperature_coefficient);
    h.value(static_cast<uint64_t>(r.species.size()));
    for (const auto& term : r.species) {
        h.text(term.species.name);
        h.value(static_cast<int>(term.species.phase));
        h.value(term.coefficient);
    }
    h.value(r.reactant_activity);
    h.value(r.product_activity);
    h.value(r.kinetics.exchange_current_density);
    h.value(r.kinetics.activation_energy);
    h.value(r.kinetics.reference_temperature);
    h.value(r.kinetics.alpha_forward);
    h.value(r.kinetics.alpha_backward);
    h.value(r.limiting_current_density);
    h.value(r.product_molar_mass);
}

}  // namespace

uint64_t Block::fingerprint_of(const PlantDesign& d, std::size_t own_count) {
    Hash h;
    h.value(static_cast<uint64_t>(kVarCount));
    h.value(static_cast<uint64_t>(own_count));
    h.text(d.technology->name);
    h.text(d.name);
    h.value(static_cast<int>(d.spec));
    for (double x : d.configured) h.value(x);
    h.value(d.drag_water_returned ? 1 : 0);
    if (d.cell_parameters)
        for (double x : d.cell_parameters->values()) h.value(x);
    if (d.custom) {
        const CustomCellSpec& c = *d.custom;
        for (const auto* side : {&c.anode, &c.cathode}) {
            h.value(static_cast<uint64_t>(side->size()));
            for (const auto& r : *side) hash_reaction(h, r);
        }
        h.value(c.area_specific_resistance);
        const Envelope& e = c.envelope;
        for (double x : {e.temperature_min, e.temperature_max, e.pressure_min, e.pressure_max, e.current_density_max,
                         e.temperature_fit_min, e.temperature_fit_max})
            h.value(x);
        h.value(c.thermoneutral_voltage);
    }
    return h.get();
}

std::string Block::save_state(std::string_view producer) const {
    Writer w;
    for (char c : kMagic) w.value(c);
    w.value(kFormat);
    w.text(producer);
    w.value(fingerprint_);
    Writer p;
    p.value(static_cast<int32_t>(spec_));
    p.doubles(v_);
    p.doubles(cell_values_ ? cell_values_->values() : std::vector<double>{});
    p.value(rectifier_rated_power_);
    p.value(last_current_density_);
    p.value(static_cast<uint8_t>(has_solution_));
    p.value(static_cast<uint8_t>(outputs_current_));
    p.value(static_cast<int32_t>(last_good_spec_));
    p.doubles(last_good_);
    p.doubles(last_good_cell_values_ ? last_good_cell_values_->values() : std::vector<double>{});
    p.value(last_good_rating_);
    p.text(automatic_.to_string());
    RunState run = run_;
    visit(run, [&](auto& x) { p.value(x); });
    w.value(static_cast<uint64_t>(p.str().size()));
    w.str() += p.str();
    Hash h;
    h.bytes(w.str().data(), w.str().size());
    w.value(h.get());
    return std::move(w.str());
}

void Block::restore_state(std::string_view bytes, std::string_view producer) {
    Reader r(bytes);
    for (char c : kMagic)
        if (r.value<char>() != c) refuse("it is not an elyblock state");
    const auto format = r.value<uint32_t>();
    const std::string_view saved_by = r.text();
    if (format != kFormat || saved_by != producer)
        refuse(fmt::format("it was saved by '{}' (format {}); this is '{}' (format {})", excerpt(saved_by), format,
                           producer, kFormat));
    if (r.value<uint64_t>() != fingerprint_)
        refuse("it belongs to another plant description (fingerprints differ)");
    const auto payload = r.value<uint64_t>();
    if (payload != r.left() - sizeof(uint64_t)) refuse("its length does not match its header");
    {
        Hash h;
        h.bytes(bytes.data(), bytes.size() - sizeof(uint64_t));
        Reader tail(bytes.substr(bytes.size() - sizeof(uint64_t)));
        if (tail.value<uint64_t>() != h.get()) refuse("its check sum does not match (the bytes were changed)");
    }
    const std::size_t n = v_.size();
    const auto spec = r.value<int32_t>();
    std::vector<double> v = r.doubles(n);
    std::vector<double> cell_values = r.doubles(1024);
    const double rating = r.value<double>(), last_j = r.value<double>();
    const bool has_solution = r.value<uint8_t>() != 0, outputs_current = r.value<uint8_t>() != 0;
    const auto good_spec = r.value<int32_t>();
    std::vector<double> good = r.doubles(n);
    std::vector<double> good_cell_values = r.doubles(1024);
    const double good_rating = r.value<double>();
    const std::string_view automatic = r.text();
    if (automatic.size() != automatic_.size() || automatic.find_first_not_of("01") != std::string_view::npos)
        refuse("its list of automatic values does not match this block's");
    RunState run;
    visit(run, [&](auto& x) { x = r.value<std::remove_reference_t<decltype(x)>>(); });
    if (r.left() != sizeof(uint64_t)) refuse("it has bytes this version does not know");
    const auto spec_ok = [](int32_t s) { return s >= 0 && s < static_cast<int32_t>(specs().size()); };
    if (v.size() != n || good.size() != n || !spec_ok(spec) || !spec_ok(good_spec))
        refuse("its variables do not match this block's");

    // The cell models the saved values describe: shared with this block or its design when equal,
    // else rebuilt (which checks the values).
    const auto cell_for = [&](const std::vector<double>& values, std::shared_ptr<const Cell>& cell,
                              std::shared_ptr<const ParameterValues>& parameters) {
        parameters = nullptr;
        cell = design_.cell;
        if (!design_.cell_parameters) {
            if (!values.empty()) refuse("it has cell parameters this technology does not have");
            return;
        }
        if (values == design_.cell_parameters->values()) {
            parameters = design_.cell_parameters;
            return;
        }
        if (cell_values_ && values == cell_values_->values()) {
            parameters = cell_values_;
            cell = cell_;
            return;
        }
        auto rebuilt = std::make_shared<ParameterValues>(*design_.cell_parameters);
        if (values.size() != rebuilt->values().size()) refuse("its cell parameters do not match this technology's");
        for (std::size_t k = 0; k < values.size(); ++k) rebuilt->set(rebuilt->infos()[k].key, values[k]);
        cell = make_cell(*design_.technology, *rebuilt);
        parameters = std::move(rebuilt);
    };
    std::shared_ptr<const Cell> cell, good_cell;
    std::shared_ptr<const ParameterValues> parameters, good_parameters;
    cell_for(cell_values, cell, parameters);
    cell_for(good_cell_values, good_cell, good_parameters);

    // Everything checked: take it over.
    spec_ = static_cast<Spec>(spec);
    v_ = std::move(v);
    cell_ = std::move(cell);
    cell_values_ = std::move(parameters);
    rectifier_rated_power_ = rating;
    last_current_density_ = last_j;
    has_solution_ = has_solution;
    outputs_current_ = outputs_current;
    last_good_spec_ = static_cast<Spec>(good_spec);
    last_good_ = std::move(good);
    last_good_cell_ = std::move(good_cell);
    last_good_cell_values_ = std::move(good_parameters);
    last_good_rating_ = good_rating;
    automatic_ = std::bitset<kVarCount>(std::string(automatic));
    run_ = run;
    forget_rates();
}

}  // namespace ely
