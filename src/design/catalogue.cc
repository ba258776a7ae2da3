#include "design/catalogue.h"

#include <algorithm>

#include "io/element_reader.h"
#include "io/lexer.h"
#include "io/parser.h"
#include "io/statement_options.h"

namespace gradeline {
namespace {

const Range kCostRange{0.0, 1e9, true, "1e9"};

// "95/m", "29/ft" or "95": a cost per metre.
std::optional<double> cost_per_m(StatementOptions& o, const std::string& text, UnitSystem units) {
  std::string number = text;
  double per = units == UnitSystem::kSI ? 1.0 : 0.3048;  // length of the unit, m
  std::size_t slash = text.find('/');
  if (slash != std::string::npos) {
    std::string unit = text.substr(slash + 1);
    number = text.substr(0, slash);
    if (unit == "m") {
      per = 1.0;
    } else if (unit == "ft") {
      per = 0.3048;
    } else {
      o.error("cost must be NUMBER/m or NUMBER/ft, got '" + text + "'");
      return std::nullopt;
    }
  }
  std::optional<double> v = o.parse("cost", number, Dimension::kDimensionless, kCostRange);
  if (!v) return std::nullopt;
  return *v / per;
}

}  // namespace

CatalogueResult parse_catalogue_text(std::string_view text, const std::string& file,
                                     HeadlossLaw law) {
  CatalogueResult out;
  Diagnostics d;
  UnitSystem units = UnitSystem::kSI;
  bool seen_item = false;
  Statement s;
  const InternedString file_name = intern(file);
  std::vector<std::string_view> lines = split_lines(text);
  for (std::size_t i = 0; i < lines.size() && !d.full(); ++i) {
    const int line = static_cast<int>(i) + 1;
    LexResult lexed = lex_line(lines[i], line, &s);
    if (!lexed.error.empty()) d.error(file, line, lexed.error);
    if (!lexed.error.empty() || lexed.empty) continue;
    if (s.keyword == "title") continue;
    if (s.keyword == "units" && s.positional.size() == 1 && !seen_item &&
        (s.positional[0] == "SI" || s.positional[0] == "US")) {
      units = s.positional[0] == "SI" ? UnitSystem::kSI : UnitSystem::kUS;
      continue;
    }
    if (s.keyword == "mobilisation") {
      StatementOptions o(s, {"cost"}, file, units, &d);
      if (auto v = o.quantity("cost", Dimension::kDimensionless, kCostRange)) {
        out.catalogue.mobilisation_cost = *v;
      }
      continue;
    }
    if (s.keyword != "catalogue") {
      d.error(file, line, "unknown statement '" + std::string(s.keyword) +
                              "' (a catalogue holds title, units, catalogue and mobilisation)");
      continue;
    }
    seen_item = true;
    StatementOptions o(s, {"diameter", "roughness", "cfactor", "cost"}, file, units, &d);
    ReadContext c{file, file_name, units, &d};
    if (!read_ids(s, 1, "an ID", c)) continue;
    CatalogueItem item;
    item.id = s.positional[0];
    item.where = {file_name, line};
    for (const char* key : {"diameter", "cost"}) {
      if (!o.has(key)) o.error("catalogue '" + item.id + "': missing required key '" + key + "'");
    }
    if (auto v = o.quantity("diameter", Dimension::kDiameter, kDiameterRange)) item.diameter_m = *v;
    item.roughness_m = o.quantity("roughness", Dimension::kRoughness, kRoughnessRange);
    item.cfactor = o.quantity("cfactor", Dimension::kDimensionless, kCfactorRange);
    if (const std::string_view* cost = o.find("cost")) {
      if (auto v = cost_per_m(o, std::string(*cost), units)) item.cost_per_m = *v;
    }
    if (law == HeadlossLaw::kDarcyWeisbach && !o.has("roughness")) {
      o.error("catalogue '" + item.id + "': missing roughness (the network uses darcy-weisbach)");
    }
    if (law == HeadlossLaw::kHazenWilliams && !o.has("cfactor")) {
      o.error("catalogue '" + item.id + "': missing cfactor (the network uses hazen-williams)");
    }
    for (const CatalogueItem& other : out.catalogue.items) {
      if (other.id == item.id) o.error("duplicate catalogue item '" + item.id + "'");
    }
    out.catalogue.items.push_back(item);
  }
  if (out.catalogue.items.empty() && d.empty()) {
    d.error(file, std::max<int>(1, static_cast<int>(lines.size())), "the catalogue has no items");
  }
  std::stable_sort(out.catalogue.items.begin(), out.catalogue.items.end(),
                   [](const CatalogueItem& a, const CatalogueItem& b) {
                     return a.diameter_m < b.diameter_m;
                   });
  out.errors = d.errors();
  return out;
}

CatalogueResult parse_catalogue_file(const std::string& path, HeadlossLaw law) {
  FileText text;
  std::string why;
  if (!read_text_file(path, &text, &why)) {
    CatalogueResult r;
    r.errors.push_back({path, 0, "cannot read file: " + why});
    return r;
  }
  return parse_catalogue_text(text.view(), path, law);
}

}  // namespace gradeline
