#pragma once
// A bash completion script for plumb, written from the command table (plumb --print-bash-completion), so
// that it completes exactly the nouns, verbs and options the binary accepts. The build installs it as
// share/bash-completion/completions/plumb.
#include <iosfwd>

namespace plumb::cli {

void write_bash_completion(std::ostream& out);

}  // namespace plumb::cli
