// Classes of the bytes of a short text, 64 at a time, as bit masks (bit i for byte i): the
// lexers' quick paths find fields and lines by bit operations on these instead of a branch per
// byte. SSE2 (every x86-64) where available, else a plain loop with the same result.
#pragma once

#include <cstddef>
#include <cstdint>
#include <cstring>

#if defined(__SSE2__)
#include <emmintrin.h>
#endif

namespace gradeline {

inline constexpr std::size_t kMaskBytes = 64;

struct ByteMasks {
  std::uint64_t blank = 0;    // ' ' or '\t'
  std::uint64_t special = 0;  // any other byte up to 0x20, '#' or 0x7F
  std::uint64_t equals = 0;   // '='
};

// The masks of the 64 bytes at `p`, all of which must be readable.
inline ByteMasks byte_masks(const char* p) {
  ByteMasks m;
#if defined(__SSE2__)
  for (int part = 0; part < 4; ++part) {
    const __m128i b = _mm_loadu_si128(reinterpret_cast<const __m128i*>(p + 16 * part));
    const __m128i blank =
        _mm_or_si128(_mm_cmpeq_epi8(b, _mm_set1_epi8(' ')), _mm_cmpeq_epi8(b, _mm_set1_epi8('\t')));
    const __m128i low = _mm_cmpeq_epi8(_mm_min_epu8(b, _mm_set1_epi8(0x20)), b);  // b <= 0x20
    const __m128i special = _mm_or_si128(_mm_andnot_si128(blank, low),
                                         _mm_or_si128(_mm_cmpeq_epi8(b, _mm_set1_epi8('#')),
                                                      _mm_cmpeq_epi8(b, _mm_set1_epi8(0x7F))));
    const int shift = 16 * part;
    m.blank |= static_cast<std::uint64_t>(static_cast<std::uint16_t>(_mm_movemask_epi8(blank)))
               << shift;
    m.special |= static_cast<std::uint64_t>(static_cast<std::uint16_t>(_mm_movemask_epi8(special)))
                 << shift;
    m.equals |= static_cast<std::uint64_t>(static_cast<std::uint16_t>(
                    _mm_movemask_epi8(_mm_cmpeq_epi8(b, _mm_set1_epi8('=')))))
                << shift;
  }
#else
  for (std::size_t i = 0; i < kMaskBytes; ++i) {
    const unsigned char c = static_cast<unsigned char>(p[i]);
    const std::uint64_t bit = std::uint64_t{1} << i;
    const bool blank = c == ' ' || c == '\t';
    if (blank) m.blank |= bit;
    if ((!blank && c <= 0x20) || c == '#' || c == 0x7F) m.special |= bit;
    if (c == '=') m.equals |= bit;
  }
#endif
  return m;
}

// Bit i set where byte i of the 64 at `p` is '\n'.
inline std::uint64_t newline_mask(const char* p) {
#if defined(__SSE2__)
  std::uint64_t m = 0;
  for (int part = 0; part < 4; ++part) {
    const __m128i b = _mm_loadu_si128(reinterpret_cast<const __m128i*>(p + 16 * part));
    m |= static_cast<std::uint64_t>(
             static_cast<std::uint16_t>(_mm_movemask_epi8(_mm_cmpeq_epi8(b, _mm_set1_epi8('\n')))))
         << (16 * part);
  }
  return m;
#else
  std::uint64_t m = 0;
  for (std::size_t i = 0; i < kMaskBytes; ++i) {
    if (p[i] == '\n') m |= std::uint64_t{1} << i;
  }
  return m;
#endif
}

}  // namespace gradeline
