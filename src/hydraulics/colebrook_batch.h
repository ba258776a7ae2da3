// The Colebrook-White friction factor of many turbulent pipes at once (see friction.h for the
// equation, its range and the Newton iteration on x = 1/sqrt(f)).
//
// colebrook_batch gives, for every i < n, what colebrook_friction(re[i], rr[i], &x[i]) gives:
// x[i] > 0 on entry is a warm start (a previous root of the same pipe) and the new root is
// stored back, f[i] = 1/x^2 and df_dre[i] its exact derivative. Where the processor has AVX2
// and FMA, four pipes are iterated together, each until its own step falls below 1e-8 x, with
// the vector logarithm and exponential of glibc's libmvec (within 4 ulp of the scalar
// functions, so f agrees with colebrook_friction's to about 1e-15 relative, not bit for bit);
// elsewhere the pipes are solved one by one by colebrook_friction. Either way the result for
// one pipe does not depend on the others in the batch.
// Valid for Re >= 4000 and 0 <= e/D <= 0.05, as colebrook_friction.
#pragma once

#include <cstddef>

namespace gradeline {

void colebrook_batch(std::size_t n, const double* re, const double* rr, double* x, double* f,
                     double* df_dre);

// Whether colebrook_batch takes the four-wide path on this processor.
bool colebrook_batch_is_vectorised();

}  // namespace gradeline
