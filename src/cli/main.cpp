#include <iostream>

#include "cli/command.hpp"

int main(int argc, char** argv) { return plumb::cli::run(argc, argv, std::cout, std::cerr); }
