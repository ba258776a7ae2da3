#include "io/plain_lines.h"

#include <cstring>

#include "io/byte_masks.h"
#include "io/lexer.h"
#include "io/statement_options.h"
#include "model/units.h"

namespace gradeline {
namespace {

// More fields than any plain node or pipe line has (a pipe has at most 12).
constexpr std::size_t kMaxFields = 16;

struct Fields {
  std::string_view field[kMaxFields];
  std::size_t equals[kMaxFields];  // the offset of the field's first '=', or npos
  std::size_t count = 0;
};

// Lines up to this long take the quick path (a node line with coordinates, or a pipe line
// with a few optional keys, is 40 to 90 bytes).
constexpr std::size_t kBlocks = 2;
constexpr std::size_t kPlainBytes = kBlocks * kMaskBytes;

// The position of the first set bit of `masks` (bit i of word w for byte 64 w + i) from
// `first` to `last`, or npos.
std::size_t first_bit(const std::uint64_t* masks, std::size_t first, std::size_t last) {
  for (std::size_t w = first / kMaskBytes; w <= last / kMaskBytes; ++w) {
    std::uint64_t m = masks[w];
    if (w == first / kMaskBytes) m &= ~std::uint64_t{0} << (first % kMaskBytes);
    if (w == last / kMaskBytes) m &= ~std::uint64_t{0} >> (kMaskBytes - 1 - last % kMaskBytes);
    if (m != 0) return w * kMaskBytes + static_cast<std::size_t>(__builtin_ctzll(m));
  }
  return std::string_view::npos;
}

// split_plain for a line shorter than Blocks * kMaskBytes.
template <std::size_t Blocks>
bool split_blocks(std::string_view line, Fields* out) {
  constexpr std::size_t kBlocks = Blocks;  // shadows the file's limit: this line's blocks
  constexpr std::size_t kPlainBytes = Blocks * kMaskBytes;
  // The line, padded with blanks, in a buffer whose every byte may be read.
  char padded[kPlainBytes];
  std::memset(padded, ' ', kPlainBytes);
  std::memcpy(padded, line.data(), line.size());
  std::uint64_t starts[kBlocks], ends[kBlocks], equals[kBlocks];
  std::uint64_t word[kBlocks];
  for (std::size_t w = 0; w < kBlocks; ++w) {
    const ByteMasks m = byte_masks(padded + w * kMaskBytes);
    if (m.special != 0) return false;
    word[w] = ~m.blank;
    equals[w] = m.equals;
  }
  // A field starts at a non-blank after a blank (or at the line's start) and ends at a
  // non-blank before a blank; the padding makes the last byte of all a blank.
  for (std::size_t w = 0; w < kBlocks; ++w) {
    const std::uint64_t before = w > 0 ? word[w - 1] >> (kMaskBytes - 1) : 0;
    const std::uint64_t after = w + 1 < kBlocks ? (word[w + 1] & 1) << (kMaskBytes - 1) : 0;
    starts[w] = word[w] & ~((word[w] << 1) | before);
    ends[w] = word[w] & ~((word[w] >> 1) | after);
  }
  std::size_t end_word = 0;
  for (std::size_t w = 0; w < kBlocks; ++w) {
    for (; starts[w] != 0; starts[w] &= starts[w] - 1) {
      if (out->count == kMaxFields) return false;
      while (ends[end_word] == 0) ++end_word;
      const std::size_t first =
          w * kMaskBytes + static_cast<std::size_t>(__builtin_ctzll(starts[w]));
      const std::size_t last =
          end_word * kMaskBytes + static_cast<std::size_t>(__builtin_ctzll(ends[end_word]));
      ends[end_word] &= ends[end_word] - 1;
      const std::size_t eq = first_bit(equals, first, last);
      out->equals[out->count] = eq == std::string_view::npos ? eq : eq - first;
      out->field[out->count++] = std::string_view(line.data() + first, last - first + 1);
    }
  }
  return true;
}

// Splits `line` at spaces and tabs; false on '#', any other control character (a CR included),
// too many fields or a line of kPlainBytes or more: the general lexer decides those.
bool split_plain(std::string_view line, Fields* out) {
  if (line.size() < kMaskBytes) return split_blocks<1>(line, out);
  return line.size() < kPlainBytes && split_blocks<kBlocks>(line, out);
}

// `text` as a quantity of `dimension` in SI within `range`, as StatementOptions::quantity reads
// it; false where that reports an error.
bool plain_quantity(std::string_view text, Dimension dimension, const Range& range,
                    UnitSystem units, double* value) {
  const UnitParse parsed = parse_quantity(text, dimension, units);
  if (!parsed.ok || !within(parsed.quantity.value, range)) return false;
  *value = parsed.quantity.value;
  return true;
}

// The number of a key read, or -1 where its value was not.
int read_as(bool read, int key) { return read ? key : -1; }

bool yes_no(std::string_view text, bool* value) {
  if (text != "yes" && text != "no") return false;
  *value = text == "yes";
  return true;
}

// The key=value fields from `first` on: false on a field without '=', with '=' first, or with
// a key seen before (bit `bit` of *seen for key number `bit`).
template <typename OnKey>
bool for_each_option(const Fields& f, std::size_t first, OnKey on_key) {
  unsigned seen = 0;
  for (std::size_t i = first; i < f.count; ++i) {
    const std::string_view field = f.field[i];
    const std::size_t eq = f.equals[i];
    if (eq == std::string_view::npos || eq == 0) return false;
    const int key = on_key(field.substr(0, eq), field.substr(eq + 1));
    if (key < 0 || (seen & (1u << key)) != 0) return false;
    seen |= 1u << key;
  }
  return true;
}

}  // namespace

bool read_plain_junction(std::string_view line, int line_number, const ReadContext& c, Node* n) {
  Fields f;
  if (!split_plain(line, &f) || f.count < 2 || f.field[0] != "node") return false;
  const std::string_view id = f.field[1];
  if (f.equals[1] != std::string_view::npos || !is_valid_id(id)) return false;
  bool has_elevation = false;
  const bool ok = for_each_option(f, 2, [&](std::string_view key, std::string_view value) -> int {
    if (key == "elevation") {
      has_elevation = true;
      return read_as(
          plain_quantity(value, Dimension::kLength, kElevationRange, c.units, &n->elevation_m), 0);
    }
    if (key == "demand") {
      // demand=FLOW or demand=FLOW:CATEGORY
      const std::size_t colon = value.find(':');
      std::string_view category;
      if (colon != std::string_view::npos) {
        category = value.substr(colon + 1);
        value = value.substr(0, colon);
        if (category.empty() || !is_valid_id(category)) return -1;
      }
      if (!plain_quantity(value, Dimension::kFlow, kDemandRange, c.units, &n->demand_m3s))
        return -1;
      n->demand_category = intern(category);
      return 1;
    }
    if (key == "at") {
      const std::size_t comma = value.find(',');
      Point p;
      if (comma == std::string_view::npos || !parse_number(value.substr(0, comma), &p.x) ||
          !parse_number(value.substr(comma + 1), &p.y)) {
        return -1;
      }
      n->at = p;
      return 2;
    }
    return -1;
  });
  if (!ok || !has_elevation) return false;
  n->id = id;
  n->where = {c.file_name, line_number};
  return true;
}

bool read_plain_pipe(std::string_view line, int line_number, const ReadContext& c, Pipe* p,
                     PipeEnds* ends) {
  Fields f;
  if (!split_plain(line, &f) || f.count < 4 || f.field[0] != "pipe") return false;
  for (std::size_t i = 1; i < 4; ++i) {
    if (f.equals[i] != std::string_view::npos || !is_valid_id(f.field[i])) return false;
  }
  if (f.field[2] == f.field[3]) return false;
  bool has_length = false, has_diameter = false;
  const bool ok = for_each_option(f, 4, [&](std::string_view key, std::string_view value) -> int {
    double v = 0.0;
    if (key == "length") {
      has_length = true;
      return read_as(plain_quantity(value, Dimension::kLength, kLengthRange, c.units, &p->length_m),
                     0);
    }
    if (key == "diameter") {
      has_diameter = true;
      return read_as(
          plain_quantity(value, Dimension::kDiameter, kDiameterRange, c.units, &p->diameter_m), 1);
    }
    if (key == "roughness") {
      if (!plain_quantity(value, Dimension::kRoughness, kRoughnessRange, c.units, &v)) return -1;
      p->roughness_m = v;
      ends->roughness_given = true;
      return 2;
    }
    if (key == "cfactor") {
      if (!plain_quantity(value, Dimension::kDimensionless, kCfactorRange, c.units, &v)) return -1;
      p->cfactor = v;
      ends->cfactor_given = true;
      return 3;
    }
    if (key == "minor") {
      if (!plain_quantity(value, Dimension::kDimensionless, kMinorRange, c.units, &p->minor_k)) {
        return -1;
      }
      ends->minor_given = true;
      return 4;
    }
    if (key == "status") {
      if (value != "open" && value != "closed") return -1;
      p->status = value == "open" ? LinkStatus::kOpen : LinkStatus::kClosed;
      return 5;
    }
    if (key == "check") return read_as(yes_no(value, &p->check_valve), 6);
    if (key == "resize") return read_as(yes_no(value, &p->resizable), 7);
    return -1;
  });
  if (!ok || !has_length || !has_diameter) return false;
  p->id = f.field[1];
  ends->from_id = f.field[2];
  ends->to_id = f.field[3];
  p->where = {c.file_name, line_number};
  return true;
}

}  // namespace gradeline
