#include "unit/plant.hpp"

namespace ely {

PlantDesign::PlantDesign() {
    for (int i = 0; i < kVarCount; ++i) configured[static_cast<std::size_t>(i)] = variable_info(static_cast<Var>(i)).start;
}

}  // namespace ely
