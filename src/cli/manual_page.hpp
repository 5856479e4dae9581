#pragma once
// plumb(1), written in roff (man(7) macros) from the command table and the help texts, so that the installed
// manual says exactly what `plumb --help` and `plumb NOUN VERB --help` say. The build runs
// `plumb --print-man` to produce it.
#include <iosfwd>
#include <string>
#include <string_view>

namespace plumb::cli {

void write_manual_page(std::ostream& out);

/// Text made safe for one roff text line: backslashes and hyphens escaped, a leading '.' or '\'' guarded,
/// characters beyond ASCII written as \[uXXXX].
std::string roff_escape(std::string_view text);

}  // namespace plumb::cli
