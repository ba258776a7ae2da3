// A catalogue of commercial pipe sizes for `gradeline size`:
//
//   units SI                                               # bare-number defaults, as networks
//   catalogue DN150 diameter=150mm roughness=0.0015mm cost=95/m
//   catalogue D18   diameter=18in cfactor=130 cost=130/m
//   mobilisation cost=2500                                 # optional: per pipe changed
//
// Currency is unitless. A cost per length takes `/m` or `/ft`; a bare number is per metre (SI)
// or per foot (US). Items are kept sorted by diameter.
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "gradeline/network.h"
#include "io/diagnostics.h"

namespace gradeline {

struct CatalogueItem {
  std::string id;
  double diameter_m = 0.0;
  std::optional<double> roughness_m;
  std::optional<double> cfactor;
  double cost_per_m = 0.0;
  SourceLocation where;
};

struct Catalogue {
  std::vector<CatalogueItem> items;  // by increasing diameter
  double mobilisation_cost = 0.0;    // per changed pipe
};

struct CatalogueResult {
  Catalogue catalogue;
  std::vector<Diagnostic> errors;
  bool ok() const { return errors.empty(); }
};

CatalogueResult parse_catalogue_text(std::string_view text, const std::string& file_name,
                                     HeadlossLaw law);
CatalogueResult parse_catalogue_file(const std::string& path, HeadlossLaw law);

}  // namespace gradeline
