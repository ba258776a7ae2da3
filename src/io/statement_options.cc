#include "io/statement_options.h"

#include <algorithm>

namespace gradeline {

StatementOptions::StatementOptions(const Statement& statement,
                                   const std::vector<std::string>& allowed,
                                   const std::string& file, UnitSystem units,
                                   Diagnostics* diagnostics,
                                   const std::vector<std::string>& repeatable)
    : statement_(statement), file_(file), units_(units), diagnostics_(diagnostics) {
  auto admitted = [&](const std::string& key) {
    for (const std::string& a : allowed) {
      if (a == key) return true;
      if (!a.empty() && a.back() == '.' && key.size() > a.size() && key.compare(0, a.size(), a) == 0)
        return true;
    }
    return false;
  };
  for (std::size_t i = 0; i < statement.options.size(); ++i) {
    const std::string& key = statement.options[i].first;
    if (!admitted(key)) {
      std::string message = "unknown key '" + key + "' for " + statement.keyword;
      std::string near = nearest_word(key, allowed);
      if (!near.empty()) message += " (did you mean '" + near + "'?)";
      error(message);
      continue;
    }
    const bool may_repeat = std::find(repeatable.begin(), repeatable.end(), key) != repeatable.end();
    for (std::size_t j = 0; j < i && !may_repeat; ++j) {
      if (statement.options[j].first == key) {
        error("key '" + key + "' given twice");
        break;
      }
    }
  }
}

const std::string* StatementOptions::find(const std::string& key) const {
  for (const auto& [k, v] : statement_.options) {
    if (k == key) return &v;
  }
  return nullptr;
}

std::vector<std::string> StatementOptions::all(const std::string& key) const {
  std::vector<std::string> out;
  for (const auto& [k, v] : statement_.options) {
    if (k == key) out.push_back(v);
  }
  return out;
}

std::vector<std::pair<std::string, std::string>> StatementOptions::with_prefix(
    const std::string& prefix) const {
  std::vector<std::pair<std::string, std::string>> out;
  for (const auto& [k, v] : statement_.options) {
    if (k.size() > prefix.size() && k.compare(0, prefix.size(), prefix) == 0) {
      out.emplace_back(k.substr(prefix.size()), v);
    }
  }
  return out;
}

void StatementOptions::error(std::string message) {
  diagnostics_->error(file_, statement_.line, std::move(message));
}

std::optional<Quantity> StatementOptions::raw_quantity(const std::string& key,
                                                       Dimension dimension) {
  const std::string* text = find(key);
  if (text == nullptr) return std::nullopt;
  UnitParse parsed = parse_quantity(*text, dimension, units_);
  if (!parsed.ok) {
    error(key + ": " + parsed.error);
    return std::nullopt;
  }
  return parsed.quantity;
}

std::optional<double> StatementOptions::quantity(const std::string& key, Dimension dimension,
                                                 const Range& range) {
  const std::string* text = find(key);
  if (text == nullptr) return std::nullopt;
  return parse(key, *text, dimension, range);
}

std::optional<double> StatementOptions::parse(const std::string& key, const std::string& text,
                                              Dimension dimension, const Range& range) {
  UnitParse parsed = parse_quantity(text, dimension, units_);
  if (!parsed.ok) {
    error(key + ": " + parsed.error);
    return std::nullopt;
  }
  const double v = parsed.quantity.value;
  const bool below = range.min_inclusive ? v < range.min : v <= range.min;
  if (below) {
    if (range.min == 0.0 && !range.min_inclusive) {
      error(key + " must be positive, got '" + text + "'");
    } else if (range.min == 0.0) {
      error(key + " must not be negative, got '" + text + "'");
    } else {
      error(key + " '" + text + "' is out of range");
    }
    return std::nullopt;
  }
  if (v > range.max) {
    error(key + " '" + text + "' is out of range: at most " + range.max_text);
    return std::nullopt;
  }
  return v;
}

}  // namespace gradeline
