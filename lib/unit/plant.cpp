#include "unit/plant.hpp"

namespace ely {

const char* spec_name(Spec spec) {
    switch (spec) {
        case Spec::current_density: return "current_density";
        case Spec::current: return "current";
        case Spec::power: return "power";
        case Spec::hydrogen_rate: return "hydrogen_rate";
        case Spec::voltage: return "voltage";
    }
    return "?";
}

}  // namespace ely
