/*
 * check.h: the small check framework and vector helpers shared by the C test
 * programs (test_*.c). Each test program includes it once; run.sh builds and runs
 * every bindings/c/test_*.c. End main() with `return check_summary();`.
 */
#ifndef FLATRAY_CHECK_H
#define FLATRAY_CHECK_H

#include <float.h>
#include <math.h>
#include <stdarg.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>

#include "flatray.h"

/* ------------------------------------------------------------------------ */
/* Check machinery                                                          */
/* ------------------------------------------------------------------------ */

static unsigned long checks_run;
static unsigned long checks_failed;
static char context[256]; /* what a loop is currently testing, printed on failure */

static const double PI = 3.14159265358979323846;
static const double SENTINEL = -12345.678; /* pre-filled into outputs */
static const int32_t STATUS_SENTINEL = -77;

static inline void set_context(const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(context, sizeof context, fmt, ap);
    va_end(ap);
}

static inline void clear_context(void) { context[0] = '\0'; }

static inline const char *status_name(int code)
{
    switch (code) {
    case FLATRAY_OK: return "FLATRAY_OK";
    case FLATRAY_ERR_NULL_POINTER: return "FLATRAY_ERR_NULL_POINTER";
    case FLATRAY_ERR_INVALID_ARGUMENT: return "FLATRAY_ERR_INVALID_ARGUMENT";
    case FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION: return "FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION";
    case FLATRAY_ERR_MISSES_INTERFACE: return "FLATRAY_ERR_MISSES_INTERFACE";
    case FLATRAY_ERR_WRONG_SIDE: return "FLATRAY_ERR_WRONG_SIDE";
    case FLATRAY_ERR_NOT_CONVERGED: return "FLATRAY_ERR_NOT_CONVERGED";
    case FLATRAY_ERR_OUT_OF_RANGE: return "FLATRAY_ERR_OUT_OF_RANGE";
    case FLATRAY_ERR_BUFFER_TOO_SMALL: return "FLATRAY_ERR_BUFFER_TOO_SMALL";
    case FLATRAY_ERR_INTERNAL: return "FLATRAY_ERR_INTERNAL";
    case FLATRAY_ERR_DEGENERATE: return "FLATRAY_ERR_DEGENERATE";
    default: return "(unknown code)";
    }
}

/* Record one check; on failure print the location, the message and the context. */
static inline int record(int ok, const char *file, int line, const char *fmt, ...)
{
    checks_run++;
    if (!ok) {
        va_list ap;
        checks_failed++;
        fprintf(stderr, "%s:%d: FAILED: ", file, line);
        va_start(ap, fmt);
        vfprintf(stderr, fmt, ap);
        va_end(ap);
        if (context[0] != '\0')
            fprintf(stderr, "  [while testing: %s]", context);
        fputc('\n', stderr);
    }
    return ok;
}

static inline int check_true(int cond, const char *expr, const char *file, int line)
{
    return record(cond, file, line, "%s", expr);
}

static inline int check_status(int got, int want, const char *expr, const char *file, int line)
{
    return record(got == want, file, line, "%s returned %d (%s), expected %d (%s)", expr, got,
                  status_name(got), want, status_name(want));
}

static inline int check_near(double got, double want, double tol, const char *expr, const char *file,
                      int line)
{
    double diff = fabs(got - want);
    return record(diff <= tol, file, line, "%s = %.17g, expected %.17g (difference %.3g > %.3g)",
                  expr, got, want, diff, tol);
}

static inline int check_nan(double got, const char *expr, const char *file, int line)
{
    return record(isnan(got), file, line, "%s = %.17g, expected NaN", expr, got);
}

static inline double vdist(FlatrayVec3 a, FlatrayVec3 b);

static inline int check_vec_near(FlatrayVec3 got, FlatrayVec3 want, double tol, const char *expr,
                          const char *file, int line)
{
    double d = vdist(got, want);
    return record(d <= tol, file, line,
                  "%s = (%.17g, %.17g, %.17g), expected (%.17g, %.17g, %.17g) (distance %.3g > %.3g)",
                  expr, got.x, got.y, got.z, want.x, want.y, want.z, d, tol);
}

static inline int check_vec_nan(FlatrayVec3 v, const char *expr, const char *file, int line)
{
    return record(isnan(v.x) && isnan(v.y) && isnan(v.z), file, line,
                  "%s = (%.17g, %.17g, %.17g), expected all NaN", expr, v.x, v.y, v.z);
}

static inline int check_vec_same(FlatrayVec3 got, FlatrayVec3 want, const char *expr, const char *file,
                          int line)
{
    return record(memcmp(&got, &want, sizeof got) == 0, file, line,
                  "%s = (%.17g, %.17g, %.17g), expected exactly (%.17g, %.17g, %.17g)", expr,
                  got.x, got.y, got.z, want.x, want.y, want.z);
}

#define CHECK(cond) check_true((cond) != 0, #cond, __FILE__, __LINE__)
#define CHECK_STATUS(got, want) check_status((int)(got), (int)(want), #got, __FILE__, __LINE__)
#define CHECK_NEAR(got, want, tol) check_near((got), (want), (tol), #got, __FILE__, __LINE__)
#define CHECK_NAN(x) check_nan((x), #x, __FILE__, __LINE__)
#define CHECK_VEC_NEAR(got, want, tol) check_vec_near((got), (want), (tol), #got, __FILE__, __LINE__)
#define CHECK_VEC_NAN(v) check_vec_nan((v), #v, __FILE__, __LINE__)
#define CHECK_VEC_SAME(got, want) check_vec_same((got), (want), #got, __FILE__, __LINE__)

/* ------------------------------------------------------------------------ */
/* Small vector helpers (the test's own, independent of the library)         */
/* ------------------------------------------------------------------------ */

static inline FlatrayVec3 v3(double x, double y, double z)
{
    FlatrayVec3 v;
    v.x = x;
    v.y = y;
    v.z = z;
    return v;
}
static inline FlatrayVec3 vadd(FlatrayVec3 a, FlatrayVec3 b) { return v3(a.x + b.x, a.y + b.y, a.z + b.z); }
static inline FlatrayVec3 vsub(FlatrayVec3 a, FlatrayVec3 b) { return v3(a.x - b.x, a.y - b.y, a.z - b.z); }
static inline FlatrayVec3 vscale(FlatrayVec3 a, double s) { return v3(a.x * s, a.y * s, a.z * s); }
static inline double vdot(FlatrayVec3 a, FlatrayVec3 b) { return a.x * b.x + a.y * b.y + a.z * b.z; }
static inline double vlen(FlatrayVec3 a) { return sqrt(vdot(a, a)); }
static inline double vdist(FlatrayVec3 a, FlatrayVec3 b) { return vlen(vsub(a, b)); }
static inline FlatrayVec3 vunit(FlatrayVec3 a) { return vscale(a, 1.0 / vlen(a)); }
static inline FlatrayVec3 vcross(FlatrayVec3 a, FlatrayVec3 b)
{
    return v3(a.y * b.z - a.z * b.y, a.z * b.x - a.x * b.z, a.x * b.y - a.y * b.x);
}
static inline FlatrayRay mkray(FlatrayVec3 origin, FlatrayVec3 direction)
{
    FlatrayRay r;
    r.origin = origin;
    r.direction = direction;
    return r;
}

/* Pointer to component i (0, 1, 2) of a vector, to poison one at a time. */
static inline double *component(FlatrayVec3 *v, int i)
{
    return i == 0 ? &v->x : (i == 1 ? &v->y : &v->z);
}

static const char *const AXIS[3] = { "x", "y", "z" };

/* The non-finite values every floating argument is tried with. */
static inline double poison(int i)
{
    return i == 0 ? (double)NAN : (i == 1 ? (double)INFINITY : -(double)INFINITY);
}
static const char *const POISON_NAME[3] = { "NaN", "+inf", "-inf" };
#define POISON_COUNT 3

static inline FlatrayVec3 sentinel_vec(void) { return v3(SENTINEL, SENTINEL, SENTINEL); }

/* Distance from p to the half-line origin + s*dir, s >= 0 (dir unit). */
static inline double distance_to_ray(FlatrayVec3 p, FlatrayVec3 origin, FlatrayVec3 dir)
{
    FlatrayVec3 v = vsub(p, origin);
    double s = vdot(v, dir);
    if (s < 0.0)
        s = 0.0;
    return vlen(vsub(v, vscale(dir, s)));
}

/* Print the summary line; the process exit code (0 when every check passed). */
static inline int check_summary(void)
{
    if (checks_failed > 0) {
        printf("%lu of %lu checks FAILED\n", checks_failed, checks_run);
        return 1;
    }
    printf("%lu checks passed\n", checks_run);
    return 0;
}

#endif /* FLATRAY_CHECK_H */
