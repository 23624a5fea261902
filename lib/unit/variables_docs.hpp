#pragma once
// docs/variables.md, generated from the variable table, the technology registry (which
// variables each technology has, its cell parameters, the outputs its cell adds, its summary
// layout). The generator program (tools/docgen) writes it; a test checks the committed file.
#include <string>

namespace ely {

std::string variables_markdown();

}  // namespace ely
