// The one translation unit that compiles Boost.JSON (used header-only: Debian's static
// libboost_json is not position-independent, and the shared library must not depend on the
// Boost runtime libraries). Every other file includes <boost/json.hpp>.
//
// Boost 1.81's JSON memory resources derive from boost::container::pmr::memory_resource,
// whose members used here are all inline in the headers; Boost.JSON never calls the compiled
// parts of Boost.Container (new_delete_resource(), the global default resource), so neither
// -lboost_json nor -lboost_container is needed (checked with nm on the linked tests).
#include <boost/json/src.hpp>
