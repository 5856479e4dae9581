#pragma once
// Readers for the NIST StRD files in shared/reference-data (read in place, never copied).
#include <filesystem>
#include <map>
#include <string>
#include <vector>

namespace plumb::test {

struct NistUnivariate {
  std::vector<std::string> values;  ///< data exactly as printed in the file
  double certified_mean = 0, certified_sd = 0;
};
/// Original NIST layout: certified values on lines 41-43, data from line 61.
NistUnivariate read_nist_univariate(const std::filesystem::path& file);

struct NistLinear {
  std::map<std::string, double> certified;  ///< from "# certified NAME = VALUE" lines
  std::vector<double> x, y;
};
NistLinear read_nist_linear(const std::filesystem::path& file);

}  // namespace plumb::test
