// Boost.JSON's implementation, compiled once for the command line (header-only mode): `run`
// reads the library's run summary with it.
#include <boost/json/src.hpp>
