#include <iostream>
#include <string>
#include <vector>

#include "cli/run.hpp"

int main(int argc, char** argv) {
  std::vector<std::string> args(argv, argv + argc);
  return coursewarden::cli::run(args, std::cout, std::cerr);
}
