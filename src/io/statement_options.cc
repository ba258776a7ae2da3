#include "io/statement_options.h"

#include <algorithm>

namespace gradeline {

StatementOptions::StatementOptions(const Statement& statement,
                                   const std::vector<std::string>& allowed,
                                   const std::string& file, UnitSystem units,
                                   Diagnostics* diagnostics,
                                   const std::vector<std::string>& repeatable)
    : statement_(statement), file_(file), units_(units), diagnostics_(diagnostics) {
  auto admitted = [&](std::string_view key) {
    for (const std::string& a : allowed) {
      if (a == key) return true;
      if (!a.empty() && a.back() == '.' && key.size() > a.size() && key.substr(0, a.size()) == a)
        return true;
    }
    return false;
  };
  for (std::size_t i = 0; i < statement.options.size(); ++i) {
    const std::string_view key = statement.options[i].first;
    if (!admitted(key)) {
      std::string message =
          "unknown key '" + std::string(key) + "' for " + std::string(statement.keyword);
      std::string near = nearest_word(std::string(key), allowed);
      if (!near.empty()) message += " (did you mean '" + near + "'?)";
      error(message);
      continue;
    }
    const bool may_repeat = std::find(repeatable.begin(), repeatable.end(), key) != repeatable.end();
    for (std::size_t j = 0; j < i && !may_repeat; ++j) {
      if (statement.options[j].first == key) {
        error("key '" + std::string(key) + "' given twice");
        break;
      }
    }
  }
}

const std::string_view* StatementOptions::find(std::string_view key) const {
  for (const auto& [k, v] : statement_.options) {
    if (k == key) return &v;
  }
  return nullptr;
}

std::vector<std::string> StatementOptions::all(std::string_view key) const {
  std::vector<std::string> out;
  for (const auto& [k, v] : statement_.options) {
    if (k == key) out.emplace_back(v);
  }
  return out;
}

std::vector<std::pair<std::string, std::string>> StatementOptions::with_prefix(
    std::string_view prefix) const {
  std::vector<std::pair<std::string, std::string>> out;
  for (const auto& [k, v] : statement_.options) {
    if (k.size() > prefix.size() && k.substr(0, prefix.size()) == prefix) {
      out.emplace_back(std::string(k.substr(prefix.size())), std::string(v));
    }
  }
  return out;
}

void StatementOptions::error(std::string message) {
  diagnostics_->error(file_, statement_.line, std::move(message));
}

std::optional<Quantity> StatementOptions::raw_quantity(std::string_view key, Dimension dimension) {
  const std::string_view* text = find(key);
  if (text == nullptr) return std::nullopt;
  UnitParse parsed = parse_quantity(*text, dimension, units_);
  if (!parsed.ok) {
    error(std::string(key) + ": " + parsed.error);
    return std::nullopt;
  }
  return parsed.quantity;
}

std::optional<double> StatementOptions::quantity(std::string_view key, Dimension dimension,
                                                 const Range& range) {
  const std::string_view* text = find(key);
  if (text == nullptr) return std::nullopt;
  return parse(key, *text, dimension, range);
}

std::optional<double> StatementOptions::parse(std::string_view key_view, std::string_view text_view,
                                              Dimension dimension, const Range& range) {
  UnitParse parsed = parse_quantity(text_view, dimension, units_);
  if (!parsed.ok) {
    error(std::string(key_view) + ": " + parsed.error);
    return std::nullopt;
  }
  const double v = parsed.quantity.value;
  if (within(v, range)) return v;
  const bool below = range.min_inclusive ? v < range.min : v <= range.min;
  const std::string key(key_view), text(text_view);  // for the messages below
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
  error(key + " '" + text + "' is out of range: at most " + range.max_text);
  return std::nullopt;
}

}  // namespace gradeline
