#pragma once
// Lends a value to a slot for a scope: the block's evaluation reads the stack temperature, the
// operating hours, the pressures from its inputs, and the plant in time lends them its own values
// for a call; the slot gets its value back whatever happens.
namespace ely {

class Lend {
public:
    Lend(double& slot, double value) : slot_(slot), saved_(slot) { slot_ = value; }
    ~Lend() { slot_ = saved_; }
    Lend(const Lend&) = delete;
    Lend& operator=(const Lend&) = delete;

private:
    double& slot_;
    double saved_;
};

}  // namespace ely
