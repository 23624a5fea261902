#pragma once
// Factory functions of the technologies; cell.cpp dispatches on Technology to these.
// Adding a technology: one folder lib/cells/<name>/ implementing these two functions, an
// entry in the Technology enum and in cell.cpp's switch, defaults with sources, tests.
#include <memory>
#include <vector>

#include "cells/cell.hpp"

namespace ely {

const std::vector<ParameterInfo>& pem_parameters();
std::unique_ptr<Cell> make_pem_cell(const ParameterValues& values);

const std::vector<ParameterInfo>& alkaline_parameters();
std::unique_ptr<Cell> make_alkaline_cell(const ParameterValues& values);

const std::vector<ParameterInfo>& solid_oxide_parameters();
std::unique_ptr<Cell> make_solid_oxide_cell(const ParameterValues& values);

const std::vector<ParameterInfo>& brine_parameters();
std::unique_ptr<Cell> make_brine_cell(const ParameterValues& values);

}  // namespace ely
