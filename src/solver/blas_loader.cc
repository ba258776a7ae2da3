// The BLAS, LAPACK and METIS routines that CHOLMOD calls, for a CHOLMOD linked statically
// (GRADELINE_STATIC_CHOLMOD): each is looked up in the system's shared library the first time
// it is called.
//
// Only CHOLMOD's supernodal factorisation (large grid-like networks) calls the BLAS and LAPACK,
// and gradeline never asks CHOLMOD for a METIS ordering. Linked as shared libraries (through
// libcholmod.so), the three cost every run about 2.9 ms of dynamic loading, of a start of
// 4.5 ms (measured with an empty program linked to them); looked up on first use, they cost
// nothing to a run that never factorises supernodally, and what such a run computes is
// unchanged. The libraries are those libcholmod.so names (libblas.so.3, liblapack.so.3 and
// libmetis.so.5), so the system's choice of BLAS (OpenBLAS where installed) still applies.
//
// Every argument of these routines is a pointer (Fortran passes by reference, METIS takes
// idx_t*), so each forwarder hands its pointers on unchanged whatever they point to. A
// library or routine that cannot be found ends the process with a message naming it: a
// factorisation cannot go on without it.
#include <dlfcn.h>

#include <cstdio>
#include <cstdlib>

namespace {

constexpr int kExitMissingLibrary = 70;  // EX_SOFTWARE: the installation is incomplete

void* routine(const char* library, const char* name) {
  // dlopen counts references: every routine of a library gets the same handle.
  void* handle = dlopen(library, RTLD_NOW | RTLD_LOCAL);
  void* found = handle != nullptr ? dlsym(handle, name) : nullptr;
  if (found == nullptr) {
    const char* why = dlerror();
    std::fprintf(stderr, "gradeline: error: cannot load %s from %s: %s\n", name, library,
                 why != nullptr ? why : "not found");
    // Possibly on a worker thread inside a factorisation: end at once, without running the
    // destructors of objects other threads may still be using.
    std::fflush(stderr);
    std::_Exit(kExitMissingLibrary);
  }
  return found;
}

using P = void*;

}  // namespace

// One forwarder per routine: the real one is found once (a function-local static is
// initialised once, even with several threads), then called with the same arguments.
#define GRADELINE_FORWARD(library, result, name, params, args)                     \
  extern "C" result name params {                                                  \
    using Routine = result(*) params;                                              \
    static const Routine real = reinterpret_cast<Routine>(routine(library, #name)); \
    return real args;                                                              \
  }

#define GRADELINE_ARGS5 (P a, P b, P c, P d, P e)
#define GRADELINE_ARGS7 (P a, P b, P c, P d, P e, P f, P g)
#define GRADELINE_ARGS8 (P a, P b, P c, P d, P e, P f, P g, P h)
#define GRADELINE_ARGS10 (P a, P b, P c, P d, P e, P f, P g, P h, P i, P j)
#define GRADELINE_ARGS11 (P a, P b, P c, P d, P e, P f, P g, P h, P i, P j, P k)
#define GRADELINE_ARGS13 (P a, P b, P c, P d, P e, P f, P g, P h, P i, P j, P k, P l, P m)

// BLAS level 3: C = alpha op(A) op(B) + beta C; triangular solves with many right-hand sides;
// C = alpha A A^T + beta C (A A^H for complex).
GRADELINE_FORWARD("libblas.so.3", void, dgemm_, GRADELINE_ARGS13,
                  (a, b, c, d, e, f, g, h, i, j, k, l, m))
GRADELINE_FORWARD("libblas.so.3", void, zgemm_, GRADELINE_ARGS13,
                  (a, b, c, d, e, f, g, h, i, j, k, l, m))
GRADELINE_FORWARD("libblas.so.3", void, dtrsm_, GRADELINE_ARGS11, (a, b, c, d, e, f, g, h, i, j, k))
GRADELINE_FORWARD("libblas.so.3", void, ztrsm_, GRADELINE_ARGS11, (a, b, c, d, e, f, g, h, i, j, k))
GRADELINE_FORWARD("libblas.so.3", void, dsyrk_, GRADELINE_ARGS10, (a, b, c, d, e, f, g, h, i, j))
GRADELINE_FORWARD("libblas.so.3", void, zherk_, GRADELINE_ARGS10, (a, b, c, d, e, f, g, h, i, j))
// BLAS level 2: y = alpha op(A) x + beta y; one triangular solve.
GRADELINE_FORWARD("libblas.so.3", void, dgemv_, GRADELINE_ARGS11, (a, b, c, d, e, f, g, h, i, j, k))
GRADELINE_FORWARD("libblas.so.3", void, zgemv_, GRADELINE_ARGS11, (a, b, c, d, e, f, g, h, i, j, k))
GRADELINE_FORWARD("libblas.so.3", void, dtrsv_, GRADELINE_ARGS8, (a, b, c, d, e, f, g, h))
GRADELINE_FORWARD("libblas.so.3", void, ztrsv_, GRADELINE_ARGS8, (a, b, c, d, e, f, g, h))
// LAPACK: dense Cholesky of a supernode's diagonal block.
GRADELINE_FORWARD("liblapack.so.3", void, dpotrf_, GRADELINE_ARGS5, (a, b, c, d, e))
GRADELINE_FORWARD("liblapack.so.3", void, zpotrf_, GRADELINE_ARGS5, (a, b, c, d, e))
// METIS orderings (CHOLMOD's nested dissection; unused by gradeline, present for the linker).
GRADELINE_FORWARD("libmetis.so.5", int, METIS_NodeND, GRADELINE_ARGS7, (a, b, c, d, e, f, g))
GRADELINE_FORWARD("libmetis.so.5", int, METIS_ComputeVertexSeparator, GRADELINE_ARGS7,
                  (a, b, c, d, e, f, g))
