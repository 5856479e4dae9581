// The drawing back end linked in (the test program): no module to load.
#include "report/chart/cairo_backend.hpp"

namespace plumb::report {

const DrawingBackend& drawing_backend() {
  return cairo_drawing_backend();
}

}  // namespace plumb::report
