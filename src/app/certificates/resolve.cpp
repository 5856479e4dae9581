#include "app/certificates/resolve.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>

#include "app/runs/resolve.hpp"
#include "core/errors.hpp"
#include "store/certificate_list.hpp"
#include "store/repository.hpp"

namespace plumb::app {

store::CertificateRecord resolve_certificate(store::Database& db, const std::string& selector) {
  if (selector == "LAST") {
    if (auto c = store::last_certificate(db.sql())) return *c;
    throw InputError("certificate LAST: no certificate has been issued yet.");
  }
  if (auto c = store::find_certificate(db.sql(), selector)) return *c;
  const bool digits = !selector.empty() && std::all_of(selector.begin(), selector.end(),
                                                       [](unsigned char ch) { return std::isdigit(ch) != 0; });
  if (digits) {
    const std::int64_t run_id = resolve_run(db, selector);
    if (auto c = store::certificate_for_run(db.sql(), run_id)) return *c;
    throw InputError(
        fmt::format("run {} has no certificate yet; issue one with `plumb certificate issue {}`.", run_id, run_id));
  }
  throw InputError(
      fmt::format("certificate \"{}\" does not exist; give a certificate number (see `plumb "
                  "certificate list`), LAST or a run number.",
                  selector));
}

}  // namespace plumb::app
