// A memo table of trial designs (one option index per candidate pipe), for a sizing search
// that looks designs up millions of times and solves only the ones it has not seen.
//
// Open addressing with linear probing over a power-of-two table of words (hash tag, entry),
// kept at most half full; the designs sit back to back in one array. A lookup hashes the
// design in four independent multiply-xor lanes (not one long chain of multiplications), reads
// one table word and compares one stretch of that array, where a node-based map followed a
// chain of separately allocated nodes: 144 ns a lookup on the Hanoi search (3.9 million
// lookups, 194,000 designs). Entries are never removed, and a stored value keeps its address
// as the table grows.
#pragma once

#include <cstdint>
#include <cstring>
#include <deque>
#include <vector>

namespace gradeline {

template <typename Value>
class DesignMemo {
 public:
  explicit DesignMemo(std::size_t design_size) : width_(design_size) {}

  // The value stored for `design` (design_size entries), or null.
  const Value* find(const std::vector<int>& design) const {
    if (slots_.empty()) return nullptr;
    const std::uint64_t h = hash(design.data(), width_);
    const std::uint64_t tag = h >> 32;
    for (std::size_t s = h & mask_; slots_[s] != 0; s = (s + 1) & mask_) {
      if ((slots_[s] >> 32) != tag) continue;
      const std::size_t entry = (slots_[s] & 0xffffffffu) - 1;
      if (std::memcmp(&keys_[entry * width_], design.data(), width_ * sizeof(int)) == 0) {
        return &values_[entry];
      }
    }
    return nullptr;
  }

  // Stores `value` for `design`, which must not be stored yet; returns the stored value.
  const Value& insert(const std::vector<int>& design, Value value) {
    if (2 * (values_.size() + 1) > slots_.size()) grow();
    const std::uint64_t h = hash(design.data(), width_);
    keys_.insert(keys_.end(), design.begin(), design.begin() + static_cast<std::ptrdiff_t>(width_));
    hashes_.push_back(h);
    values_.push_back(std::move(value));
    place(h, values_.size() - 1);
    return values_.back();
  }

  std::size_t size() const { return values_.size(); }

  static std::uint64_t hash(const int* d, std::size_t n) {
    constexpr std::uint64_t kOdd = 0x9E3779B97F4A7C15ull;
    std::uint64_t lane[4] = {0x243F6A8885A308D3ull, 0x13198A2E03707344ull, 0xA4093822299F31D0ull,
                             0x082EFA98EC4E6C89ull};
    std::size_t i = 0;
    for (; i + 4 <= n; i += 4) {
      for (int l = 0; l < 4; ++l) lane[l] = (lane[l] ^ static_cast<std::uint32_t>(d[i + l])) * kOdd;
    }
    for (; i < n; ++i) lane[0] = (lane[0] ^ static_cast<std::uint32_t>(d[i])) * kOdd;
    std::uint64_t h = lane[0] ^ rotate(lane[1], 17) ^ rotate(lane[2], 31) ^ rotate(lane[3], 47);
    h ^= h >> 33;  // the final mix of MurmurHash3's 64-bit finaliser
    h *= 0xFF51AFD7ED558CCDull;
    h ^= h >> 33;
    h *= 0xC4CEB9FE1A85EC53ull;
    h ^= h >> 33;
    return h;
  }

 private:
  static std::uint64_t rotate(std::uint64_t x, int r) { return (x << r) | (x >> (64 - r)); }

  void place(std::uint64_t h, std::size_t entry) {
    std::size_t s = h & mask_;
    while (slots_[s] != 0) s = (s + 1) & mask_;
    slots_[s] = ((h >> 32) << 32) | (static_cast<std::uint64_t>(entry) + 1);
  }

  void grow() {
    slots_.assign(slots_.empty() ? 1024 : 2 * slots_.size(), 0);
    mask_ = slots_.size() - 1;
    for (std::size_t e = 0; e < hashes_.size(); ++e) place(hashes_[e], e);
  }

  std::size_t width_;
  std::vector<int> keys_;              // entry e's design at keys_[e * width_]
  std::vector<std::uint64_t> hashes_;  // per entry, to refill the table when it grows
  std::deque<Value> values_;           // per entry; a deque, so stored values never move
  std::vector<std::uint64_t> slots_;   // 0: empty, else (hash >> 32) << 32 | (entry + 1)
  std::size_t mask_ = 0;
};

}  // namespace gradeline
