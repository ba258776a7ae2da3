#include "hydraulics/colebrook_batch.h"

#include <algorithm>

#include "hydraulics/friction.h"

#if defined(__x86_64__) && defined(__GNUC__) && defined(GRADELINE_HAVE_MVEC)
#include <immintrin.h>
#define GRADELINE_VECTOR_COLEBROOK 1
// glibc's libmvec: log and exp of four doubles (AVX2), declared as AVX2 functions so that the
// vectors pass in registers as the library expects.
extern "C" __attribute__((target("avx2"))) __m256d _ZGVdN4v_log(__m256d);
extern "C" __attribute__((target("avx2"))) __m256d _ZGVdN4v_exp(__m256d);
#endif

namespace gradeline {
namespace {

void colebrook_one_by_one(std::size_t n, const double* re, const double* rr, double* x, double* f,
                          double* df_dre) {
  for (std::size_t i = 0; i < n; ++i) {
    const ColebrookSolution c = colebrook_friction(re[i], rr[i], &x[i]);
    f[i] = c.f;
    df_dre[i] = c.df_dre;
  }
}

#if defined(GRADELINE_VECTOR_COLEBROOK)
constexpr double kTwoOverLn10 = 2.0 / 2.302585092994045684;

// Four pipes: the iteration of colebrook_friction, lane by lane, each lane frozen once its
// step is small enough.
__attribute__((target("avx2,fma"))) void colebrook_four(const double* re_in, const double* rr_in,
                                                        double* x_io, double* f_out,
                                                        double* df_out) {
  const __m256d k = _mm256_set1_pd(kTwoOverLn10);
  const __m256d one = _mm256_set1_pd(1.0);
  const __m256d zero = _mm256_setzero_pd();
  const __m256d magnitude = _mm256_castsi256_pd(_mm256_set1_epi64x(0x7fffffffffffffffLL));
  const __m256d re = _mm256_loadu_pd(re_in);
  const __m256d a = _mm256_div_pd(_mm256_loadu_pd(rr_in), _mm256_set1_pd(3.7));
  const __m256d b = _mm256_div_pd(_mm256_set1_pd(2.51), re);
  const __m256d kb = _mm256_mul_pd(k, b);
  __m256d x = _mm256_loadu_pd(x_io);
  // Lanes without a warm start begin at Swamee-Jain: x = -k ln(a + 5.74 exp(-0.9 ln Re)).
  const __m256d cold = _mm256_cmp_pd(x, zero, _CMP_LE_OQ);
  if (!_mm256_testz_pd(cold, cold)) {
    const __m256d re_power = _ZGVdN4v_exp(_mm256_mul_pd(_mm256_set1_pd(-0.9), _ZGVdN4v_log(re)));
    const __m256d start = _mm256_mul_pd(
        _mm256_sub_pd(zero, k), _ZGVdN4v_log(_mm256_fmadd_pd(_mm256_set1_pd(5.74), re_power, a)));
    x = _mm256_blendv_pd(x, start, cold);
  }
  __m256d inner = _mm256_fmadd_pd(b, x, a);
  __m256d slope = _mm256_add_pd(one, _mm256_div_pd(kb, inner));  // F'(x)
  __m256d active = _mm256_castsi256_pd(_mm256_set1_epi64x(-1));
  for (int i = 0; i < 50; ++i) {
    const __m256d step = _mm256_div_pd(_mm256_fmadd_pd(k, _ZGVdN4v_log(inner), x), slope);
    const __m256d moved = _mm256_sub_pd(x, step);
    x = _mm256_blendv_pd(x, moved, active);
    inner = _mm256_blendv_pd(inner, _mm256_fmadd_pd(b, moved, a), active);
    slope = _mm256_blendv_pd(slope, _mm256_add_pd(one, _mm256_div_pd(kb, inner)), active);
    const __m256d done = _mm256_cmp_pd(_mm256_and_pd(step, magnitude),
                                       _mm256_mul_pd(_mm256_set1_pd(1e-8), moved), _CMP_LE_OQ);
    active = _mm256_andnot_pd(done, active);
    if (_mm256_testz_pd(active, active)) break;
  }
  _mm256_storeu_pd(x_io, x);
  // As colebrook_friction: dF/dRe = -k b x / (Re inner), dx/dRe = -dF/dRe / F'.
  const __m256d dF_dre =
      _mm256_div_pd(_mm256_mul_pd(_mm256_sub_pd(zero, kb), x), _mm256_mul_pd(re, inner));
  const __m256d dx_dre = _mm256_div_pd(_mm256_sub_pd(zero, dF_dre), slope);
  const __m256d x2 = _mm256_mul_pd(x, x);
  _mm256_storeu_pd(f_out, _mm256_div_pd(one, x2));
  _mm256_storeu_pd(
      df_out, _mm256_mul_pd(_mm256_div_pd(_mm256_set1_pd(-2.0), _mm256_mul_pd(x2, x)), dx_dre));
}

bool cpu_has_avx2() {
  static const bool has = __builtin_cpu_supports("avx2") && __builtin_cpu_supports("fma");
  return has;
}
#endif

}  // namespace

bool colebrook_batch_is_vectorised() {
#if defined(GRADELINE_VECTOR_COLEBROOK)
  return cpu_has_avx2();
#else
  return false;
#endif
}

void colebrook_batch(std::size_t n, const double* re, const double* rr, double* x, double* f,
                     double* df_dre) {
#if defined(GRADELINE_VECTOR_COLEBROOK)
  if (cpu_has_avx2()) {
    std::size_t i = 0;
    for (; i + 4 <= n; i += 4) colebrook_four(re + i, rr + i, x + i, f + i, df_dre + i);
    if (i < n) {
      // The last few in a batch of four, padded with copies of the last pipe, so every pipe
      // takes the same path wherever it falls in the batch.
      const std::size_t left = n - i;
      double re4[4], rr4[4], x4[4], f4[4], df4[4];
      for (std::size_t j = 0; j < 4; ++j) {
        const std::size_t from = i + std::min(j, left - 1);
        re4[j] = re[from];
        rr4[j] = rr[from];
        x4[j] = x[from];
      }
      colebrook_four(re4, rr4, x4, f4, df4);
      for (std::size_t j = 0; j < left; ++j) {
        x[i + j] = x4[j];
        f[i + j] = f4[j];
        df_dre[i + j] = df4[j];
      }
    }
    return;
  }
#endif
  colebrook_one_by_one(n, re, rr, x, f, df_dre);
}

}  // namespace gradeline
