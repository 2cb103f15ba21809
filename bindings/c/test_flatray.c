/*
 * test_flatray.c: C test program for the flatray C ABI (include/flatray.h).
 *
 * Calls every function of the header, on success values (each reference value
 * names its source, or says "common practice") and on every error path the
 * contract in DESIGN.md describes. Plain C99; no test framework.
 *
 * Each check prints file:line and the values involved when it fails. A check
 * The program prints "N checks passed" and exits non-zero if any check failed.
 */

#include "check.h"

/* ------------------------------------------------------------------------ */
/* Stacks used throughout (invented scenarios)                                */
/* ------------------------------------------------------------------------ */

/* A pond seen from 0.5 m above: air (1.0) over water (1.333), z up, surface z = 0. */
static FlatrayStack pond_stack(void)
{
    FlatrayStack s;
    memset(&s, 0, sizeof s);
    s.origin = v3(0.0, 0.0, 0.0);
    s.normal = v3(0.0, 0.0, -1.0);
    s.n_observer = 1.0;
    s.layer_count = 0;
    s.n_object = 1.333;
    return s;
}

/* The same surface seen from below: a diver (water, 1.333) looking up into air. */
static FlatrayStack surface_from_below_stack(void)
{
    FlatrayStack s;
    memset(&s, 0, sizeof s);
    s.origin = v3(0.0, 0.0, 0.0);
    s.normal = v3(0.0, 0.0, 1.0);
    s.n_observer = 1.333;
    s.layer_count = 0;
    s.n_object = 1.0;
    return s;
}

/* A camera housing: air inside, a 10 mm glass port (1.52) 20 mm in front of the
   camera, sea water (1.34) outside; the camera looks along +z. */
static FlatrayStack port_stack(void)
{
    FlatrayStack s;
    memset(&s, 0, sizeof s);
    s.origin = v3(0.0, 0.0, 0.02);
    s.normal = v3(0.0, 0.0, 1.0);
    s.n_observer = 1.0;
    s.layer_count = 1;
    s.thickness[0] = 0.010;
    s.n_layer[0] = 1.52;
    s.n_object = 1.34;
    return s;
}

/* A tilted tank with three layers and a normal of length 4.5 (it is normalised by
   the library); slots past layer_count hold junk on purpose (they are ignored). */
static FlatrayStack tank_stack(void)
{
    FlatrayStack s;
    int i;
    memset(&s, 0, sizeof s);
    s.origin = v3(1.0, 2.0, 3.0);
    s.normal = v3(3.0, -1.5, 3.0);
    s.n_observer = 1.000293;
    s.layer_count = 3;
    s.thickness[0] = 0.025; /* acrylic wall */
    s.n_layer[0] = 1.49;
    s.thickness[1] = 0.30; /* water gap */
    s.n_layer[1] = 1.333;
    s.thickness[2] = 0.008; /* inner glass */
    s.n_layer[2] = 1.52;
    for (i = 3; i < FLATRAY_MAX_LAYERS; i++) {
        s.thickness[i] = (i % 2) ? (double)NAN : -1.0;
        s.n_layer[i] = (i % 2) ? -(double)INFINITY : 0.0;
    }
    s.n_object = 1.345;
    return s;
}

/* Eight layers: the most a stack may hold. */
static FlatrayStack eight_layer_stack(void)
{
    FlatrayStack s;
    int i;
    memset(&s, 0, sizeof s);
    s.origin = v3(0.0, 0.0, 0.0);
    s.normal = v3(0.0, 0.0, 1.0);
    s.n_observer = 1.0;
    s.layer_count = FLATRAY_MAX_LAYERS;
    for (i = 0; i < FLATRAY_MAX_LAYERS; i++) {
        s.thickness[i] = 0.001 * (i + 1);
        s.n_layer[i] = 1.3 + 0.05 * i;
    }
    s.n_object = 1.333;
    return s;
}

static double total_thickness(const FlatrayStack *s)
{
    double t = 0.0;
    uint32_t i;
    for (i = 0; i < s->layer_count; i++)
        t += s->thickness[i];
    return t;
}

/* ------------------------------------------------------------------------ */
/* Independent reference computations (Snell's law and Fresnel, in C)         */
/* ------------------------------------------------------------------------ */

/* Fresnel power coefficients, Hecht, Optics, §4.6 (Fresnel equations):
   r_s = (n1 cos i - n2 cos t)/(n1 cos i + n2 cos t),
   r_p = (n2 cos i - n1 cos t)/(n2 cos i + n1 cos t), R = r^2, T = 1 - R
   (below the critical angle). */
static void ref_fresnel(double cos_i, double n1, double n2, double *rs, double *rp)
{
    double sin_i2 = 1.0 - cos_i * cos_i;
    double sin_t2 = (n1 / n2) * (n1 / n2) * sin_i2;
    double cos_t = sqrt(1.0 - sin_t2);
    double as = (n1 * cos_i - n2 * cos_t) / (n1 * cos_i + n2 * cos_t);
    double ap = (n2 * cos_i - n1 * cos_t) / (n2 * cos_i + n1 * cos_t);
    *rs = as * as;
    *rp = ap * ap;
}

/*
 * A path built forward from Snell's law: an observer `height` metres before the
 * first interface looks at angle theta0 from the normal; the ray crosses every
 * layer and goes `depth` metres (along the normal) into the object medium, where
 * the object is placed. Expected images (DESIGN.md, "Apparent position"):
 *   sagittal depth   z_s = sum_k h_k (n0/n_k) cos(t0)/cos(t_k)
 *   tangential depth z_t = sum_k h_k (n0/n_k) cos^3(t0)/cos^3(t_k)
 * over the layers and the object medium (h = the object's depth below the last
 * interface there), both measured below the first interface; the sagittal image
 * lies on the normal through the object, the tangential one on the line of sight.
 */
typedef struct Scenario {
    FlatrayVec3 normal;  /* unit */
    FlatrayVec3 lateral; /* unit, perpendicular to normal: the plane of incidence */
    FlatrayVec3 observer, entry, exit, object;
    FlatrayVec3 sight;   /* unit direction at the observer */
    FlatrayVec3 object_dir; /* unit direction in the object medium */
    FlatrayVec3 sagittal, tangential;
    double geometric, optical, transmittance;
} Scenario;

static Scenario build_scenario(const FlatrayStack *s, double height, double theta0, double depth)
{
    Scenario sc;
    FlatrayVec3 helper, side;
    double n0 = s->n_observer;
    double p = n0 * sin(theta0); /* ray parameter n sin(theta), constant (Snell) */
    double c0 = cos(theta0), t0 = tan(theta0);
    double zs = 0.0, zt = 0.0, ts = 1.0, tp = 1.0, prev_n = n0, prev_c = c0;
    double n, c, tn, rs, rp;
    uint32_t k;

    sc.normal = vunit(s->normal);
    helper = fabs(sc.normal.x) < 0.9 ? v3(1.0, 0.0, 0.0) : v3(0.0, 1.0, 0.0);
    sc.lateral = vunit(vcross(sc.normal, helper));
    side = vcross(sc.normal, sc.lateral);
    /* Put the observer off the origin, sideways, to make the geometry general. */
    sc.observer = vadd(vadd(s->origin, vscale(sc.normal, -height)),
                       vadd(vscale(side, 0.37), vscale(sc.lateral, -0.21)));
    sc.sight = vadd(vscale(sc.normal, c0), vscale(sc.lateral, sin(theta0)));
    sc.entry = vadd(sc.observer, vscale(vadd(sc.normal, vscale(sc.lateral, t0)), height));
    sc.geometric = height / c0;
    sc.optical = n0 * height / c0;
    sc.exit = sc.entry;
    for (k = 0; k <= s->layer_count; k++) {
        int last = (k == s->layer_count);
        double h = last ? depth : s->thickness[k];
        n = last ? s->n_object : s->n_layer[k];
        c = sqrt(1.0 - (p / n) * (p / n));
        tn = (p / n) / c;
        zs += h * (n0 / n) * (c0 / c);
        zt += h * (n0 / n) * (c0 * c0 * c0) / (c * c * c);
        sc.geometric += h / c;
        sc.optical += n * h / c;
        ref_fresnel(prev_c, prev_n, n, &rs, &rp);
        ts *= 1.0 - rs;
        tp *= 1.0 - rp;
        prev_n = n;
        prev_c = c;
        if (last) {
            sc.object = vadd(sc.exit, vscale(vadd(sc.normal, vscale(sc.lateral, tn)), h));
            sc.object_dir = vunit(vadd(sc.normal, vscale(sc.lateral, tn)));
        } else {
            sc.exit = vadd(sc.exit, vscale(vadd(sc.normal, vscale(sc.lateral, tn)), h));
        }
    }
    sc.transmittance = 0.5 * (ts + tp);
    sc.sagittal = vadd(sc.object, vscale(sc.normal, zs - (total_thickness(s) + depth)));
    sc.tangential = vadd(sc.entry, vscale(vadd(sc.normal, vscale(sc.lateral, t0)), zt));
    return sc;
}

/* ------------------------------------------------------------------------ */
/* Error-path helpers: call, check the status, check every output is NaN      */
/* ------------------------------------------------------------------------ */

static void expect_refract_error(FlatrayVec3 d, FlatrayVec3 n, double n1, double n2, int want,
                                 const char *file, int line)
{
    FlatrayVec3 out = sentinel_vec();
    check_status(flatray_refract(d, n, n1, n2, &out), want, "flatray_refract", file, line);
    check_vec_nan(out, "refract output on error", file, line);
}

static void expect_fresnel_error(double c, double n1, double n2, int want, const char *file,
                                 int line)
{
    FlatrayFresnel f;
    f.rs = f.rp = f.ts = f.tp = f.r = f.t = SENTINEL;
    check_status(flatray_fresnel(c, n1, n2, &f), want, "flatray_fresnel", file, line);
    record(isnan(f.rs) && isnan(f.rp) && isnan(f.ts) && isnan(f.tp) && isnan(f.r) && isnan(f.t),
           file, line, "fresnel output on error not all NaN: %g %g %g %g %g %g", f.rs, f.rp, f.ts,
           f.tp, f.r, f.t);
}

static void expect_critical_error(double n1, double n2, int want, const char *file, int line)
{
    double out = SENTINEL;
    check_status(flatray_critical_angle(n1, n2, &out), want, "flatray_critical_angle", file, line);
    check_nan(out, "critical angle output on error", file, line);
}

static void expect_trace_error(const FlatrayStack *s, FlatrayRay r, int want, const char *file,
                               int line)
{
    FlatrayRay out;
    double t = SENTINEL;
    out.origin = out.direction = sentinel_vec();
    check_status(flatray_trace(s, r, &out, &t), want, "flatray_trace", file, line);
    check_vec_nan(out.origin, "trace output origin on error", file, line);
    check_vec_nan(out.direction, "trace output direction on error", file, line);
    check_nan(t, "trace transmittance on error", file, line);
    out.origin = out.direction = sentinel_vec();
    check_status(flatray_trace(s, r, &out, NULL), want, "flatray_trace (no transmittance)", file,
                 line);
    check_vec_nan(out.origin, "trace output origin on error", file, line);
}

static void expect_los_error(const FlatrayStack *s, FlatrayVec3 obs, FlatrayVec3 obj, int want,
                             const char *file, int line)
{
    FlatrayPath p;
    p.direction = p.entry = p.exit = sentinel_vec();
    p.geometric_length = p.optical_length = p.transmittance = SENTINEL;
    check_status(flatray_line_of_sight(s, obs, obj, &p), want, "flatray_line_of_sight", file, line);
    check_vec_nan(p.direction, "path.direction on error", file, line);
    check_vec_nan(p.entry, "path.entry on error", file, line);
    check_vec_nan(p.exit, "path.exit on error", file, line);
    check_nan(p.geometric_length, "path.geometric_length on error", file, line);
    check_nan(p.optical_length, "path.optical_length on error", file, line);
    check_nan(p.transmittance, "path.transmittance on error", file, line);
}

static void expect_apparent_error(const FlatrayStack *s, FlatrayVec3 obs, FlatrayVec3 obj,
                                  int32_t image, int want, const char *file, int line)
{
    FlatrayVec3 out = sentinel_vec();
    check_status(flatray_apparent_position(s, obs, obj, image, &out), want,
                 "flatray_apparent_position", file, line);
    check_vec_nan(out, "apparent position on error", file, line);
}

static void expect_true_error(const FlatrayStack *s, FlatrayVec3 obs, FlatrayVec3 app,
                              int32_t image, int want, const char *file, int line)
{
    FlatrayVec3 out = sentinel_vec();
    check_status(flatray_true_position(s, obs, app, image, &out), want, "flatray_true_position",
                 file, line);
    check_vec_nan(out, "true position on error", file, line);
}

static void expect_depth_error(int which_true, double depth, double angle, double n0, double n1,
                               int32_t image, int want, const char *file, int line)
{
    double out = SENTINEL;
    if (which_true)
        check_status(flatray_true_depth(depth, angle, n0, n1, image, &out), want,
                     "flatray_true_depth", file, line);
    else
        check_status(flatray_apparent_depth(depth, angle, n0, n1, image, &out), want,
                     "flatray_apparent_depth", file, line);
    check_nan(out, "depth output on error", file, line);
}

#define EXPECT_REFRACT_ERROR(d, n, n1, n2, want) \
    expect_refract_error((d), (n), (n1), (n2), (want), __FILE__, __LINE__)
#define EXPECT_FRESNEL_ERROR(c, n1, n2, want) \
    expect_fresnel_error((c), (n1), (n2), (want), __FILE__, __LINE__)
#define EXPECT_CRITICAL_ERROR(n1, n2, want) \
    expect_critical_error((n1), (n2), (want), __FILE__, __LINE__)
#define EXPECT_TRACE_ERROR(s, r, want) expect_trace_error((s), (r), (want), __FILE__, __LINE__)
#define EXPECT_LOS_ERROR(s, o, x, want) expect_los_error((s), (o), (x), (want), __FILE__, __LINE__)
#define EXPECT_APPARENT_ERROR(s, o, x, img, want) \
    expect_apparent_error((s), (o), (x), (img), (want), __FILE__, __LINE__)
#define EXPECT_TRUE_ERROR(s, o, a, img, want) \
    expect_true_error((s), (o), (a), (img), (want), __FILE__, __LINE__)
/* Both images, for errors that do not depend on the image. */
#define EXPECT_APPARENT_ERROR_BOTH(s, o, x, want)                          \
    do {                                                                   \
        EXPECT_APPARENT_ERROR(s, o, x, FLATRAY_IMAGE_SAGITTAL, want);      \
        EXPECT_APPARENT_ERROR(s, o, x, FLATRAY_IMAGE_TANGENTIAL, want);    \
    } while (0)
#define EXPECT_TRUE_ERROR_BOTH(s, o, a, want)                              \
    do {                                                                   \
        EXPECT_TRUE_ERROR(s, o, a, FLATRAY_IMAGE_SAGITTAL, want);          \
        EXPECT_TRUE_ERROR(s, o, a, FLATRAY_IMAGE_TANGENTIAL, want);        \
    } while (0)
#define EXPECT_APPARENT_DEPTH_ERROR(d, a, n0, n1, img, want) \
    expect_depth_error(0, (d), (a), (n0), (n1), (img), (want), __FILE__, __LINE__)
#define EXPECT_TRUE_DEPTH_ERROR(d, a, n0, n1, img, want) \
    expect_depth_error(1, (d), (a), (n0), (n1), (img), (want), __FILE__, __LINE__)

/* ------------------------------------------------------------------------ */
/* Invalid stacks: every field poisoned, and each structural error            */
/* ------------------------------------------------------------------------ */

typedef struct BadStack {
    FlatrayStack stack;
    char what[80];
} BadStack;

#define MAX_BAD_STACKS 64

static size_t make_bad_stacks(BadStack *out)
{
    size_t n = 0;
    int f, p;
    /* Poison each floating field of a one-layer stack with NaN, +inf and -inf. */
    for (f = 0; f < 10; f++) {
        for (p = 0; p < POISON_COUNT; p++) {
            FlatrayStack s = port_stack();
            double *field;
            const char *name;
            switch (f) {
            case 0: field = &s.origin.x; name = "origin.x"; break;
            case 1: field = &s.origin.y; name = "origin.y"; break;
            case 2: field = &s.origin.z; name = "origin.z"; break;
            case 3: field = &s.normal.x; name = "normal.x"; break;
            case 4: field = &s.normal.y; name = "normal.y"; break;
            case 5: field = &s.normal.z; name = "normal.z"; break;
            case 6: field = &s.n_observer; name = "n_observer"; break;
            case 7: field = &s.thickness[0]; name = "thickness[0]"; break;
            case 8: field = &s.n_layer[0]; name = "n_layer[0]"; break;
            default: field = &s.n_object; name = "n_object"; break;
            }
            *field = poison(p);
            out[n].stack = s;
            snprintf(out[n].what, sizeof out[n].what, "stack %s = %s", name, POISON_NAME[p]);
            n++;
        }
    }
#define ADD_BAD(assignment, text)                                          \
    do {                                                                   \
        FlatrayStack s = port_stack();                                     \
        assignment;                                                        \
        out[n].stack = s;                                                  \
        snprintf(out[n].what, sizeof out[n].what, "%s", text);             \
        n++;                                                               \
    } while (0)
    ADD_BAD(s.normal = v3(0.0, 0.0, 0.0), "zero normal");
    ADD_BAD(s.normal = v3(1e-310, 0.0, 0.0), "subnormal-length normal");
    ADD_BAD(s.thickness[0] = -0.010, "negative thickness");
    ADD_BAD(s.thickness[0] = 0.0, "zero thickness");
    ADD_BAD(s.n_layer[0] = 0.0, "layer index 0");
    ADD_BAD(s.n_layer[0] = -1.52, "negative layer index");
    ADD_BAD(s.n_observer = 0.0, "n_observer 0");
    ADD_BAD(s.n_observer = -1.0, "negative n_observer");
    ADD_BAD(s.n_object = 0.0, "n_object 0");
    ADD_BAD(s.n_object = -1.34, "negative n_object");
    ADD_BAD(s.layer_count = FLATRAY_MAX_LAYERS + 1, "layer_count 9");
    ADD_BAD(s.layer_count = UINT32_MAX, "layer_count UINT32_MAX");
    ADD_BAD((s.layer_count = 2, s.thickness[0] = DBL_MAX, s.thickness[1] = DBL_MAX,
             s.n_layer[1] = 1.5),
            "total thickness overflows");
#undef ADD_BAD
    return n;
}

/* ------------------------------------------------------------------------ */
/* Tests                                                                      */
/* ------------------------------------------------------------------------ */

static void test_constants_and_version(void)
{
    char buf[64];
    const char *v = flatray_version();

    /* The enum values are fixed by the ABI contract (DESIGN.md). */
    CHECK(FLATRAY_OK == 0);
    CHECK(FLATRAY_ERR_NULL_POINTER == 1);
    CHECK(FLATRAY_ERR_INVALID_ARGUMENT == 2);
    CHECK(FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION == 3);
    CHECK(FLATRAY_ERR_MISSES_INTERFACE == 4);
    CHECK(FLATRAY_ERR_WRONG_SIDE == 5);
    CHECK(FLATRAY_ERR_NOT_CONVERGED == 6);
    CHECK(FLATRAY_ERR_OUT_OF_RANGE == 7);
    CHECK(FLATRAY_ERR_BUFFER_TOO_SMALL == 8);
    CHECK(FLATRAY_ERR_INTERNAL == 9);
    CHECK(FLATRAY_IMAGE_SAGITTAL == 0);
    CHECK(FLATRAY_IMAGE_TANGENTIAL == 1);
    CHECK(FLATRAY_MAX_LAYERS == 8);

    CHECK(v != NULL);
    if (v != NULL) {
        record(strcmp(v, FLATRAY_VERSION_STRING) == 0, __FILE__, __LINE__,
               "flatray_version() = \"%s\", header says \"%s\"", v, FLATRAY_VERSION_STRING);
        CHECK(flatray_version() == v); /* a static string: the same pointer each time */
    }
    snprintf(buf, sizeof buf, "%d.%d.%d", FLATRAY_VERSION_MAJOR, FLATRAY_VERSION_MINOR,
             FLATRAY_VERSION_PATCH);
    record(strcmp(buf, FLATRAY_VERSION_STRING) == 0, __FILE__, __LINE__,
           "version macros give \"%s\", FLATRAY_VERSION_STRING is \"%s\"", buf,
           FLATRAY_VERSION_STRING);
}

static void test_status_messages(void)
{
    const char *msgs[11];
    const int32_t unknown[] = { -1, 11, 100, 12345, INT32_MIN, INT32_MAX };
    int i, j;
    for (i = 0; i <= 10; i++) {
        set_context("status code %d", i);
        msgs[i] = flatray_status_message(i);
        CHECK(msgs[i] != NULL);
        if (msgs[i] == NULL)
            msgs[i] = "";
        CHECK(strlen(msgs[i]) > 0);
    }
    /* Every defined code has its own message. */
    for (i = 0; i <= 10; i++)
        for (j = i + 1; j <= 10; j++) {
            set_context("status codes %d and %d", i, j);
            CHECK(strcmp(msgs[i], msgs[j]) != 0);
        }
    for (i = 0; i < (int)(sizeof unknown / sizeof unknown[0]); i++) {
        const char *m = flatray_status_message(unknown[i]);
        set_context("unknown status code %ld", (long)unknown[i]);
        CHECK(m != NULL);
        if (m != NULL) {
            CHECK(strlen(m) > 0);
            CHECK(strcmp(m, msgs[FLATRAY_OK]) != 0); /* an unknown code is not "success" */
        }
    }
    clear_context();
}

static void test_refract(void)
{
    const double degrees[] = { 0.0, 10.0, 30.0, 60.0, 89.0 };
    FlatrayVec3 out, other, z = v3(0.0, 0.0, 1.0);
    int i, c, p;

    /* Snell's law n1 sin t1 = n2 sin t2 (Hecht, Optics, §4.4), air to water. */
    for (i = 0; i < 5; i++) {
        double a = degrees[i] * PI / 180.0;
        set_context("refract air->water at %g deg", degrees[i]);
        out = sentinel_vec();
        CHECK_STATUS(flatray_refract(v3(sin(a), 0.0, cos(a)), z, 1.0, 1.333, &out), FLATRAY_OK);
        CHECK_NEAR(vlen(out), 1.0, 1e-15);
        CHECK_NEAR(1.333 * out.x, sin(a), 1e-15);
        CHECK(out.y == 0.0);
        CHECK(out.z > 0.0);
    }
    clear_context();
    /* Along the normal: unchanged. */
    CHECK_STATUS(flatray_refract(v3(0.0, 0.0, -2.0), v3(0.0, 0.0, 1.0), 1.0, 1.5, &out), FLATRAY_OK);
    CHECK_VEC_NEAR(out, v3(0.0, 0.0, -1.0), 1e-15);
    /* Neither input need be unit length; the normal's orientation does not matter. */
    CHECK_STATUS(flatray_refract(v3(0.9, 0.3, 3.0), v3(0.0, 0.0, 0.25), 1.0, 1.52, &out),
                 FLATRAY_OK);
    CHECK_STATUS(flatray_refract(v3(0.3, 0.1, 1.0), v3(0.0, 0.0, -7.0), 1.0, 1.52, &other),
                 FLATRAY_OK);
    CHECK_VEC_NEAR(other, out, 1e-15);
    /* Huge and tiny (but normal-length) inputs are fine too. */
    CHECK_STATUS(flatray_refract(v3(0.3e300, 0.1e300, 1e300), v3(0.0, 0.0, 1e-300), 1.0, 1.52,
                                 &other),
                 FLATRAY_OK);
    CHECK_VEC_NEAR(other, out, 1e-15);
    CHECK_STATUS(flatray_refract(v3(0.3e-300, 0.1e-300, 1e-300), v3(0.0, 0.0, 1e300), 1.0, 1.52,
                                 &other),
                 FLATRAY_OK);
    CHECK_VEC_NEAR(other, out, 1e-15);
    /* Water to air below the critical angle: sin t2 = 1.333 sin 30 deg = 0.6665. */
    CHECK_STATUS(flatray_refract(v3(0.5, 0.0, sqrt(0.75)), z, 1.333, 1.0, &out), FLATRAY_OK);
    CHECK_NEAR(out.x, 1.333 * 0.5, 1e-15);
    CHECK_NEAR(out.z, sqrt(1.0 - 0.6665 * 0.6665), 1e-15);

    /* Errors. */
    {
        FlatrayVec3 d = v3(0.3, 0.1, 1.0);
        CHECK_STATUS(flatray_refract(d, z, 1.0, 1.5, NULL), FLATRAY_ERR_NULL_POINTER);
        /* NaN and +-inf in every floating argument. */
        for (c = 0; c < 3; c++)
            for (p = 0; p < POISON_COUNT; p++) {
                FlatrayVec3 bd = d, bn = z;
                *component(&bd, c) = poison(p);
                *component(&bn, c) = poison(p);
                set_context("refract direction.%s = %s", AXIS[c], POISON_NAME[p]);
                EXPECT_REFRACT_ERROR(bd, z, 1.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
                set_context("refract normal.%s = %s", AXIS[c], POISON_NAME[p]);
                EXPECT_REFRACT_ERROR(d, bn, 1.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
            }
        for (p = 0; p < POISON_COUNT; p++) {
            set_context("refract n_from = %s", POISON_NAME[p]);
            EXPECT_REFRACT_ERROR(d, z, poison(p), 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
            set_context("refract n_to = %s", POISON_NAME[p]);
            EXPECT_REFRACT_ERROR(d, z, 1.0, poison(p), FLATRAY_ERR_INVALID_ARGUMENT);
        }
        clear_context();
        EXPECT_REFRACT_ERROR(v3(0.0, 0.0, 0.0), z, 1.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_REFRACT_ERROR(d, v3(0.0, 0.0, 0.0), 1.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_REFRACT_ERROR(v3(1e-310, 0.0, 1e-310), z, 1.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_REFRACT_ERROR(d, v3(0.0, 0.0, 1e-310), 1.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_REFRACT_ERROR(d, z, 0.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_REFRACT_ERROR(d, z, 1.0, -1.5, FLATRAY_ERR_INVALID_ARGUMENT);
        /* A direction in the interface plane misses it. */
        EXPECT_REFRACT_ERROR(v3(1.0, 2.0, 0.0), z, 1.0, 1.5, FLATRAY_ERR_MISSES_INTERFACE);
        /* 60 deg from water into air is beyond the 48.6 deg critical angle. */
        EXPECT_REFRACT_ERROR(v3(sin(PI / 3), 0.0, cos(PI / 3)), z, 1.333, 1.0,
                             FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION);
    }
}

static void test_fresnel(void)
{
    FlatrayFresnel f;
    const double pairs[4][2] = { { 1.0, 1.5 }, { 1.5, 1.0 }, { 1.0, 1.333 }, { 1.333, 1.52 } };
    int i, k, p;
    double theta_b;

    /* Normal incidence on glass n = 1.5: R = ((n-1)/(n+1))^2 = 0.04 (Hecht, Optics, eq. 4.67). */
    CHECK_STATUS(flatray_fresnel(1.0, 1.0, 1.5, &f), FLATRAY_OK);
    CHECK_NEAR(f.r, 0.04, 1e-15);
    CHECK_NEAR(f.rs, 0.04, 1e-15);
    CHECK_NEAR(f.rp, 0.04, 1e-15);
    CHECK_NEAR(f.t, 0.96, 1e-15);
    /* The same from the glass side (reciprocity at normal incidence, same source). */
    CHECK_STATUS(flatray_fresnel(1.0, 1.5, 1.0, &f), FLATRAY_OK);
    CHECK_NEAR(f.r, 0.04, 1e-15);

    /* Brewster's angle tan(theta_B) = n2/n1 makes rp vanish (Hecht, Optics, §4.6). */
    theta_b = atan(1.5 / 1.0);
    CHECK_STATUS(flatray_fresnel(cos(theta_b), 1.0, 1.5, &f), FLATRAY_OK);
    CHECK_NEAR(f.rp, 0.0, 1e-15);
    CHECK(f.rs > 0.1); /* s light is still reflected (about 0.148) */
    theta_b = atan(1.0 / 1.5); /* inside the glass */
    CHECK_STATUS(flatray_fresnel(cos(theta_b), 1.5, 1.0, &f), FLATRAY_OK);
    CHECK_NEAR(f.rp, 0.0, 1e-15);

    /* R + T = 1 (energy conservation, Hecht, Optics, §4.6), and r, t the means;
       oblique values against the Fresnel equations computed here. */
    for (k = 0; k < 4; k++)
        for (i = 0; i <= 20; i++) {
            double c = i / 20.0, rs, rp;
            double n1 = pairs[k][0], n2 = pairs[k][1];
            set_context("fresnel cos = %g, %g -> %g", c, n1, n2);
            CHECK_STATUS(flatray_fresnel(c, n1, n2, &f), FLATRAY_OK);
            CHECK_NEAR(f.rs + f.ts, 1.0, 1e-15);
            CHECK_NEAR(f.rp + f.tp, 1.0, 1e-15);
            CHECK_NEAR(f.r + f.t, 1.0, 1e-15);
            CHECK_NEAR(f.r, 0.5 * (f.rs + f.rp), 1e-15);
            CHECK_NEAR(f.t, 0.5 * (f.ts + f.tp), 1e-15);
            CHECK(f.rs >= 0.0 && f.rs <= 1.0 && f.rp >= 0.0 && f.rp <= 1.0);
            if (c > 0.0 && (n1 < n2 || (n2 / n1) * (n2 / n1) > 1.0 - c * c)) {
                ref_fresnel(c, n1, n2, &rs, &rp);
                CHECK_NEAR(f.rs, rs, 1e-12);
                CHECK_NEAR(f.rp, rp, 1e-12);
            }
        }
    clear_context();
    /* Beyond the critical angle: total reflection, and still FLATRAY_OK. */
    CHECK_STATUS(flatray_fresnel(cos(60.0 * PI / 180.0), 1.333, 1.0, &f), FLATRAY_OK);
    CHECK(f.r == 1.0 && f.rs == 1.0 && f.rp == 1.0);
    CHECK(f.t == 0.0 && f.ts == 0.0 && f.tp == 0.0);
    /* Grazing incidence reflects everything; equal indices transmit everything. */
    CHECK_STATUS(flatray_fresnel(0.0, 1.0, 1.5, &f), FLATRAY_OK);
    CHECK_NEAR(f.r, 1.0, 1e-15);
    CHECK_STATUS(flatray_fresnel(0.3, 1.2, 1.2, &f), FLATRAY_OK);
    CHECK_NEAR(f.t, 1.0, 1e-15);

    /* Errors. */
    CHECK_STATUS(flatray_fresnel(1.0, 1.0, 1.5, NULL), FLATRAY_ERR_NULL_POINTER);
    for (p = 0; p < POISON_COUNT; p++) {
        set_context("fresnel argument = %s", POISON_NAME[p]);
        EXPECT_FRESNEL_ERROR(poison(p), 1.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_FRESNEL_ERROR(0.5, poison(p), 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_FRESNEL_ERROR(0.5, 1.0, poison(p), FLATRAY_ERR_INVALID_ARGUMENT);
    }
    clear_context();
    EXPECT_FRESNEL_ERROR(-0.1, 1.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
    EXPECT_FRESNEL_ERROR(1.1, 1.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
    EXPECT_FRESNEL_ERROR(1.0 + DBL_EPSILON, 1.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
    EXPECT_FRESNEL_ERROR(0.5, 0.0, 1.5, FLATRAY_ERR_INVALID_ARGUMENT);
    EXPECT_FRESNEL_ERROR(0.5, 1.0, -1.5, FLATRAY_ERR_INVALID_ARGUMENT);
}

static void test_critical_angle(void)
{
    double c = SENTINEL;
    int p;

    /* Water (1.333) to air: about 48.6 degrees (common practice). */
    CHECK_STATUS(flatray_critical_angle(1.333, 1.0, &c), FLATRAY_OK);
    CHECK_NEAR(c * 180.0 / PI, 48.6, 0.05);
    CHECK_NEAR(c, asin(1.0 / 1.333), 1e-15); /* sin(theta_c) = n2/n1 (Hecht, Optics, §4.7) */
    /* Glass (1.5) to air: about 41.8 degrees (common practice). */
    CHECK_STATUS(flatray_critical_angle(1.5, 1.0, &c), FLATRAY_OK);
    CHECK_NEAR(c * 180.0 / PI, 41.8, 0.05);

    CHECK_STATUS(flatray_critical_angle(1.333, 1.0, NULL), FLATRAY_ERR_NULL_POINTER);
    for (p = 0; p < POISON_COUNT; p++) {
        set_context("critical angle argument = %s", POISON_NAME[p]);
        EXPECT_CRITICAL_ERROR(poison(p), 1.0, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_CRITICAL_ERROR(1.333, poison(p), FLATRAY_ERR_INVALID_ARGUMENT);
    }
    clear_context();
    EXPECT_CRITICAL_ERROR(1.0, 1.333, FLATRAY_ERR_INVALID_ARGUMENT); /* n_from < n_to */
    EXPECT_CRITICAL_ERROR(1.2, 1.2, FLATRAY_ERR_INVALID_ARGUMENT);   /* n_from == n_to */
    EXPECT_CRITICAL_ERROR(0.0, 1.0, FLATRAY_ERR_INVALID_ARGUMENT);
    EXPECT_CRITICAL_ERROR(1.333, -1.0, FLATRAY_ERR_INVALID_ARGUMENT);
}

/* Scenario checks: line of sight, trace, both images and their inverses. */
static void check_scenario(const FlatrayStack *s, const char *name, double height, double theta0,
                           double depth)
{
    Scenario sc = build_scenario(s, height, theta0, depth);
    FlatrayPath path;
    FlatrayRay out;
    FlatrayVec3 app_s, app_t, back;
    double t = SENTINEL;

    set_context("%s, view %.1f deg, object %.3f m deep", name, theta0 * 180.0 / PI, depth);

    /* Line of sight (Fermat) against the path built from Snell's law. */
    CHECK_STATUS(flatray_line_of_sight(s, sc.observer, sc.object, &path), FLATRAY_OK);
    CHECK_VEC_NEAR(path.direction, sc.sight, 1e-12);
    CHECK_NEAR(vlen(path.direction), 1.0, 1e-15);
    CHECK_VEC_NEAR(path.entry, sc.entry, 1e-9);
    CHECK_VEC_NEAR(path.exit, sc.exit, 1e-9);
    CHECK_NEAR(path.geometric_length, sc.geometric, 1e-9);
    CHECK_NEAR(path.optical_length, sc.optical, 1e-9);
    CHECK_NEAR(path.transmittance, sc.transmittance, 1e-12);

    /* Trace along the line of sight: the object-medium ray reaches the object. */
    CHECK_STATUS(flatray_trace(s, mkray(sc.observer, path.direction), &out, &t), FLATRAY_OK);
    CHECK(distance_to_ray(sc.object, out.origin, out.direction) <= 1e-9);
    CHECK_VEC_NEAR(out.origin, path.exit, 1e-9);
    CHECK_VEC_NEAR(out.direction, sc.object_dir, 1e-12);
    CHECK_NEAR(vlen(out.direction), 1.0, 1e-15);
    CHECK_NEAR(t, path.transmittance, 1e-12);
    /* Trace accepts a non-unit direction and a NULL transmittance. */
    {
        FlatrayRay out2;
        CHECK_STATUS(flatray_trace(s, mkray(sc.observer, vscale(path.direction, 3.7)), &out2, NULL),
                     FLATRAY_OK);
        CHECK_VEC_NEAR(out2.origin, out.origin, 1e-12);
        CHECK_VEC_NEAR(out2.direction, out.direction, 1e-15);
    }

    /* Both images against the formulas of DESIGN.md computed from Snell's law. */
    CHECK_STATUS(flatray_apparent_position(s, sc.observer, sc.object, FLATRAY_IMAGE_SAGITTAL, &app_s),
                 FLATRAY_OK);
    CHECK_VEC_NEAR(app_s, sc.sagittal, 1e-9);
    CHECK_STATUS(
        flatray_apparent_position(s, sc.observer, sc.object, FLATRAY_IMAGE_TANGENTIAL, &app_t),
        FLATRAY_OK);
    CHECK_VEC_NEAR(app_t, sc.tangential, 1e-9);
    /* Both lie on the line of sight. */
    CHECK(distance_to_ray(app_s, sc.observer, sc.sight) <= 1e-9);
    CHECK(distance_to_ray(app_t, sc.observer, sc.sight) <= 1e-9);

    /* true_position(apparent_position(x)) == x. */
    CHECK_STATUS(flatray_true_position(s, sc.observer, app_s, FLATRAY_IMAGE_SAGITTAL, &back),
                 FLATRAY_OK);
    CHECK_VEC_NEAR(back, sc.object, 1e-9);
    CHECK_STATUS(flatray_true_position(s, sc.observer, app_t, FLATRAY_IMAGE_TANGENTIAL, &back),
                 FLATRAY_OK);
    CHECK_VEC_NEAR(back, sc.object, 1e-9);
    clear_context();
}

static void test_geometry_values(void)
{
    const double air_angles[] = { 0.0, 10.0, 35.0, 60.0 };
    const double below_angles[] = { 0.0, 20.0, 40.0 }; /* under the 48.6 deg critical angle */
    FlatrayStack pond = pond_stack(), port = port_stack(), tank = tank_stack();
    FlatrayStack below = surface_from_below_stack(), eight = eight_layer_stack();
    int i;

    for (i = 0; i < 4; i++) {
        double a = air_angles[i] * PI / 180.0;
        check_scenario(&pond, "pond", 0.5, a, 0.4);
        check_scenario(&port, "camera port", 0.02, a, 1.5);
        check_scenario(&tank, "tilted tank", 0.8, a, 0.35);
        check_scenario(&eight, "eight layers", 0.1, a, 0.2);
    }
    for (i = 0; i < 3; i++)
        check_scenario(&below, "surface from below", 1.2, below_angles[i] * PI / 180.0, 3.0);

    /* Looking straight down: apparent depth d n1/n2 for both images (common practice). */
    {
        FlatrayVec3 eye = v3(0.2, -0.1, 0.5), pebble = v3(0.2, -0.1, -0.4), a;
        CHECK_STATUS(flatray_apparent_position(&pond, eye, pebble, FLATRAY_IMAGE_SAGITTAL, &a),
                     FLATRAY_OK);
        CHECK_VEC_NEAR(a, v3(0.2, -0.1, -0.4 * 1.0 / 1.333), 1e-15);
        CHECK_STATUS(flatray_apparent_position(&pond, eye, pebble, FLATRAY_IMAGE_TANGENTIAL, &a),
                     FLATRAY_OK);
        CHECK_VEC_NEAR(a, v3(0.2, -0.1, -0.4 * 1.0 / 1.333), 1e-15);
    }
    /* A stack whose unused layer slots hold junk behaves like a clean one. */
    {
        FlatrayStack clean = tank, dirty = tank;
        FlatrayVec3 o, x, a1, a2;
        int k;
        for (k = 3; k < FLATRAY_MAX_LAYERS; k++)
            clean.thickness[k] = clean.n_layer[k] = 0.0;
        o = vsub(tank.origin, vscale(vunit(tank.normal), 0.5));
        x = vadd(tank.origin, vadd(vscale(vunit(tank.normal), 1.0), v3(0.1, 0.2, -0.05)));
        CHECK_STATUS(flatray_apparent_position(&clean, o, x, FLATRAY_IMAGE_SAGITTAL, &a1),
                     FLATRAY_OK);
        CHECK_STATUS(flatray_apparent_position(&dirty, o, x, FLATRAY_IMAGE_SAGITTAL, &a2),
                     FLATRAY_OK);
        CHECK_VEC_SAME(a2, a1);
    }
    /* The stack normal may have any non-zero length. */
    {
        FlatrayStack big = port, small = port;
        FlatrayVec3 o = v3(0.0, 0.0, 0.0), x = v3(0.4, -0.3, 1.1), a1, a2, a3;
        big.normal = v3(0.0, 0.0, 1e300);
        small.normal = v3(0.0, 0.0, 1e-300);
        CHECK_STATUS(flatray_apparent_position(&port, o, x, FLATRAY_IMAGE_TANGENTIAL, &a1),
                     FLATRAY_OK);
        CHECK_STATUS(flatray_apparent_position(&big, o, x, FLATRAY_IMAGE_TANGENTIAL, &a2),
                     FLATRAY_OK);
        CHECK_STATUS(flatray_apparent_position(&small, o, x, FLATRAY_IMAGE_TANGENTIAL, &a3),
                     FLATRAY_OK);
        CHECK_VEC_NEAR(a2, a1, 1e-15);
        CHECK_VEC_NEAR(a3, a1, 1e-15);
    }
    /* Trace at normal incidence: T = 1 - ((n2-n1)/(n2+n1))^2 (Hecht, Optics, eq. 4.67). */
    {
        FlatrayRay out;
        double t;
        CHECK_STATUS(flatray_trace(&pond, mkray(v3(1.0, 2.0, 3.0), v3(0.0, 0.0, -1.0)), &out, &t),
                     FLATRAY_OK);
        CHECK_VEC_NEAR(out.origin, v3(1.0, 2.0, 0.0), 1e-15);
        CHECK_VEC_NEAR(out.direction, v3(0.0, 0.0, -1.0), 1e-15);
        CHECK_NEAR(t, 1.0 - (0.333 / 2.333) * (0.333 / 2.333), 1e-15);
        /* An origin on the first interface is on the observer's side. */
        CHECK_STATUS(flatray_trace(&pond, mkray(v3(1.0, 2.0, 0.0), v3(0.3, 0.0, -1.0)), &out, &t),
                     FLATRAY_OK);
    }
}

static void test_depth_helpers(void)
{
    const double n1 = 1.0, n2 = 1.333;
    const double angles[] = { 0.0, 5.0, 20.0, 45.0, 70.0, 89.0 };
    double out = SENTINEL, back = SENTINEL;
    int i, p;

    /* Normal view: d n1/n2 (paraxial apparent depth; common practice). */
    CHECK_STATUS(flatray_apparent_depth(3.0, 0.0, n1, n2, FLATRAY_IMAGE_SAGITTAL, &out), FLATRAY_OK);
    CHECK_NEAR(out, 3.0 * n1 / n2, 1e-15);
    CHECK_STATUS(flatray_apparent_depth(3.0, 0.0, n1, n2, FLATRAY_IMAGE_TANGENTIAL, &out),
                 FLATRAY_OK);
    CHECK_NEAR(out, 3.0 * n1 / n2, 1e-15);
    CHECK_STATUS(flatray_apparent_depth(0.0, 0.3, n1, n2, FLATRAY_IMAGE_SAGITTAL, &out), FLATRAY_OK);
    CHECK(out == 0.0);

    /* Oblique views: sagittal d (n1/n2) cos t1/cos t2, tangential d (n1/n2) cos^3 t1/cos^3 t2
       (DESIGN.md), t2 from Snell's law; both directions of view. */
    for (i = 0; i < 6; i++) {
        double t1 = angles[i] * PI / 180.0, d = 2.0;
        double s2 = n1 * sin(t1) / n2, c1 = cos(t1), c2 = sqrt(1.0 - s2 * s2);
        double want_s = d * (n1 / n2) * c1 / c2;
        double want_t = d * (n1 / n2) * (c1 * c1 * c1) / (c2 * c2 * c2);
        set_context("depth helpers, air over water, view %g deg", angles[i]);
        CHECK_STATUS(flatray_apparent_depth(d, t1, n1, n2, FLATRAY_IMAGE_SAGITTAL, &out), FLATRAY_OK);
        CHECK_NEAR(out, want_s, 1e-12 * d);
        CHECK_STATUS(flatray_true_depth(out, t1, n1, n2, FLATRAY_IMAGE_SAGITTAL, &back), FLATRAY_OK);
        CHECK_NEAR(back, d, 1e-12 * d);
        CHECK_STATUS(flatray_apparent_depth(d, t1, n1, n2, FLATRAY_IMAGE_TANGENTIAL, &out),
                     FLATRAY_OK);
        CHECK_NEAR(out, want_t, 1e-12 * d);
        CHECK_STATUS(flatray_true_depth(out, t1, n1, n2, FLATRAY_IMAGE_TANGENTIAL, &back),
                     FLATRAY_OK);
        CHECK_NEAR(back, d, 1e-12 * d);
    }
    /* A diver looking up into air below the critical angle. */
    for (i = 0; i < 3; i++) {
        double t1 = angles[i] * PI / 180.0, d = 2.0;
        double s2 = n2 * sin(t1) / n1, c1 = cos(t1), c2 = sqrt(1.0 - s2 * s2);
        set_context("depth helpers, water under air, view %g deg", angles[i]);
        CHECK_STATUS(flatray_apparent_depth(d, t1, n2, n1, FLATRAY_IMAGE_SAGITTAL, &out), FLATRAY_OK);
        CHECK_NEAR(out, d * (n2 / n1) * c1 / c2, 1e-12);
        CHECK_STATUS(flatray_apparent_depth(d, t1, n2, n1, FLATRAY_IMAGE_TANGENTIAL, &out),
                     FLATRAY_OK);
        CHECK_NEAR(out, d * (n2 / n1) * (c1 * c1 * c1) / (c2 * c2 * c2), 1e-12);
    }
    clear_context();

    /* Errors. */
    CHECK_STATUS(flatray_apparent_depth(1.0, 0.2, n1, n2, FLATRAY_IMAGE_SAGITTAL, NULL),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_true_depth(1.0, 0.2, n1, n2, FLATRAY_IMAGE_SAGITTAL, NULL),
                 FLATRAY_ERR_NULL_POINTER);
    for (i = 0; i < 2; i++) {
        set_context("%s", i ? "flatray_true_depth" : "flatray_apparent_depth");
        for (p = 0; p < POISON_COUNT; p++) {
            expect_depth_error(i, poison(p), 0.2, n1, n2, FLATRAY_IMAGE_SAGITTAL,
                               FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
            expect_depth_error(i, 1.0, poison(p), n1, n2, FLATRAY_IMAGE_SAGITTAL,
                               FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
            expect_depth_error(i, 1.0, 0.2, poison(p), n2, FLATRAY_IMAGE_SAGITTAL,
                               FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
            expect_depth_error(i, 1.0, 0.2, n1, poison(p), FLATRAY_IMAGE_TANGENTIAL,
                               FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
        }
        /* Negative depth; view angle negative, at pi/2 and beyond. */
        expect_depth_error(i, -0.5, 0.2, n1, n2, FLATRAY_IMAGE_SAGITTAL,
                           FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
        expect_depth_error(i, 1.0, -0.1, n1, n2, FLATRAY_IMAGE_SAGITTAL,
                           FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
        expect_depth_error(i, 1.0, -DBL_MIN, n1, n2, FLATRAY_IMAGE_SAGITTAL,
                           FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
        expect_depth_error(i, 1.0, PI / 2, n1, n2, FLATRAY_IMAGE_SAGITTAL,
                           FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
        expect_depth_error(i, 1.0, 2.0, n1, n2, FLATRAY_IMAGE_TANGENTIAL,
                           FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
        /* Indices not > 0. */
        expect_depth_error(i, 1.0, 0.2, 0.0, n2, FLATRAY_IMAGE_SAGITTAL,
                           FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
        expect_depth_error(i, 1.0, 0.2, n1, -1.333, FLATRAY_IMAGE_SAGITTAL,
                           FLATRAY_ERR_INVALID_ARGUMENT, __FILE__, __LINE__);
        /* Unknown image codes. */
        expect_depth_error(i, 1.0, 0.2, n1, n2, 2, FLATRAY_ERR_INVALID_ARGUMENT, __FILE__,
                           __LINE__);
        expect_depth_error(i, 1.0, 0.2, n1, n2, -1, FLATRAY_ERR_INVALID_ARGUMENT, __FILE__,
                           __LINE__);
        expect_depth_error(i, 1.0, 0.2, n1, n2, INT32_MAX, FLATRAY_ERR_INVALID_ARGUMENT,
                           __FILE__, __LINE__);
        /* A diver (water) beyond the 48.6 deg critical angle sees no ray from the air. */
        expect_depth_error(i, 1.0, 60.0 * PI / 180.0, n2, n1, FLATRAY_IMAGE_SAGITTAL,
                           FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION, __FILE__, __LINE__);
        expect_depth_error(i, 1.0, 60.0 * PI / 180.0, n2, n1, FLATRAY_IMAGE_TANGENTIAL,
                           FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION, __FILE__, __LINE__);
    }
    clear_context();
    /* Results too large to represent. */
    EXPECT_APPARENT_DEPTH_ERROR(1.5e308, 0.0, n2, n1, FLATRAY_IMAGE_SAGITTAL,
                                FLATRAY_ERR_OUT_OF_RANGE);
    EXPECT_TRUE_DEPTH_ERROR(1.5e308, 0.0, n1, n2, FLATRAY_IMAGE_SAGITTAL, FLATRAY_ERR_OUT_OF_RANGE);
}

/* Errors of the single-point stack functions. */
static void test_geometry_errors(void)
{
    BadStack bad[MAX_BAD_STACKS];
    size_t nbad = make_bad_stacks(bad), b;
    FlatrayStack port = port_stack(), pond = pond_stack(), below = surface_from_below_stack();
    FlatrayVec3 cam = v3(0.0, 0.0, 0.0);          /* camera inside the housing */
    FlatrayVec3 fish = v3(0.3, -0.2, 1.5);        /* in the water */
    FlatrayVec3 fish_seen;                        /* its sagittal image */
    FlatrayVec3 in_glass = v3(0.01, 0.0, 0.025);  /* inside the port */
    FlatrayVec3 behind = v3(0.0, 0.1, -0.3);      /* on the camera's side */
    FlatrayRay look = mkray(cam, v3(0.1, 0.05, 1.0));
    FlatrayRay out;
    FlatrayPath path;
    FlatrayVec3 v;
    double t;
    int c, p, img;

    CHECK_STATUS(flatray_apparent_position(&port, cam, fish, FLATRAY_IMAGE_SAGITTAL, &fish_seen),
                 FLATRAY_OK);

    /* NULL for every pointer argument. */
    CHECK_STATUS(flatray_trace(NULL, look, &out, &t), FLATRAY_ERR_NULL_POINTER);
    EXPECT_TRACE_ERROR(NULL, look, FLATRAY_ERR_NULL_POINTER);
    t = SENTINEL;
    CHECK_STATUS(flatray_trace(&port, look, NULL, &t), FLATRAY_ERR_NULL_POINTER);
    CHECK(isnan(t)); /* out_transmittance is NaN when out_object_ray is NULL */
    CHECK_STATUS(flatray_trace(&port, look, NULL, NULL), FLATRAY_ERR_NULL_POINTER);
    EXPECT_LOS_ERROR(NULL, cam, fish, FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_line_of_sight(&port, cam, fish, NULL), FLATRAY_ERR_NULL_POINTER);
    EXPECT_APPARENT_ERROR_BOTH(NULL, cam, fish, FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_apparent_position(&port, cam, fish, FLATRAY_IMAGE_SAGITTAL, NULL),
                 FLATRAY_ERR_NULL_POINTER);
    EXPECT_TRUE_ERROR_BOTH(NULL, cam, fish_seen, FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_true_position(&port, cam, fish_seen, FLATRAY_IMAGE_SAGITTAL, NULL),
                 FLATRAY_ERR_NULL_POINTER);

    /* Every invalid stack. */
    for (b = 0; b < nbad; b++) {
        set_context("%s", bad[b].what);
        EXPECT_TRACE_ERROR(&bad[b].stack, look, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_LOS_ERROR(&bad[b].stack, cam, fish, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_APPARENT_ERROR_BOTH(&bad[b].stack, cam, fish, FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_TRUE_ERROR_BOTH(&bad[b].stack, cam, fish_seen, FLATRAY_ERR_INVALID_ARGUMENT);
    }

    /* NaN and +-inf in every component of every point and direction. */
    for (c = 0; c < 3; c++)
        for (p = 0; p < POISON_COUNT; p++) {
            FlatrayRay r1 = look, r2 = look;
            FlatrayVec3 o = cam, x = fish, a = fish_seen;
            *component(&r1.origin, c) = poison(p);
            *component(&r2.direction, c) = poison(p);
            *component(&o, c) = poison(p);
            *component(&x, c) = poison(p);
            *component(&a, c) = poison(p);
            set_context("component %s = %s", AXIS[c], POISON_NAME[p]);
            EXPECT_TRACE_ERROR(&port, r1, FLATRAY_ERR_INVALID_ARGUMENT);
            EXPECT_TRACE_ERROR(&port, r2, FLATRAY_ERR_INVALID_ARGUMENT);
            EXPECT_LOS_ERROR(&port, o, fish, FLATRAY_ERR_INVALID_ARGUMENT);
            EXPECT_LOS_ERROR(&port, cam, x, FLATRAY_ERR_INVALID_ARGUMENT);
            EXPECT_APPARENT_ERROR_BOTH(&port, o, fish, FLATRAY_ERR_INVALID_ARGUMENT);
            EXPECT_APPARENT_ERROR_BOTH(&port, cam, x, FLATRAY_ERR_INVALID_ARGUMENT);
            EXPECT_TRUE_ERROR_BOTH(&port, o, fish_seen, FLATRAY_ERR_INVALID_ARGUMENT);
            EXPECT_TRUE_ERROR_BOTH(&port, cam, a, FLATRAY_ERR_INVALID_ARGUMENT);
        }
    clear_context();

    /* Unknown image codes (the enum travels as int32_t). */
    for (img = 0; img < 4; img++) {
        const int32_t codes[4] = { 2, -1, INT32_MIN, INT32_MAX };
        set_context("image code %ld", (long)codes[img]);
        EXPECT_APPARENT_ERROR(&port, cam, fish, codes[img], FLATRAY_ERR_INVALID_ARGUMENT);
        EXPECT_TRUE_ERROR(&port, cam, fish_seen, codes[img], FLATRAY_ERR_INVALID_ARGUMENT);
    }
    clear_context();

    /* Trace: zero direction; origin past the first interface; rays that miss. */
    EXPECT_TRACE_ERROR(&port, mkray(cam, v3(0.0, 0.0, 0.0)), FLATRAY_ERR_INVALID_ARGUMENT);
    EXPECT_TRACE_ERROR(&port, mkray(in_glass, v3(0.0, 0.0, 1.0)), FLATRAY_ERR_WRONG_SIDE);
    EXPECT_TRACE_ERROR(&port, mkray(fish, v3(0.0, 0.0, 1.0)), FLATRAY_ERR_WRONG_SIDE);
    EXPECT_TRACE_ERROR(&port, mkray(cam, v3(0.1, 0.0, -1.0)), FLATRAY_ERR_MISSES_INTERFACE);
    EXPECT_TRACE_ERROR(&port, mkray(cam, v3(1.0, 0.5, 0.0)), FLATRAY_ERR_MISSES_INTERFACE);
    /* A diver looking up at 60 deg, beyond the critical angle. */
    EXPECT_TRACE_ERROR(&below, mkray(v3(0.0, 0.0, -1.0), v3(sin(PI / 3), 0.0, cos(PI / 3))),
                       FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION);

    /* Observer inside a layer, or past the stack; object on the observer's side or
       inside a layer. */
    EXPECT_LOS_ERROR(&port, in_glass, fish, FLATRAY_ERR_WRONG_SIDE);
    EXPECT_LOS_ERROR(&port, v3(0.0, 0.0, 3.0), fish, FLATRAY_ERR_WRONG_SIDE);
    EXPECT_LOS_ERROR(&port, cam, behind, FLATRAY_ERR_WRONG_SIDE);
    EXPECT_LOS_ERROR(&port, cam, in_glass, FLATRAY_ERR_WRONG_SIDE);
    EXPECT_APPARENT_ERROR_BOTH(&port, in_glass, fish, FLATRAY_ERR_WRONG_SIDE);
    EXPECT_APPARENT_ERROR_BOTH(&port, cam, behind, FLATRAY_ERR_WRONG_SIDE);
    EXPECT_APPARENT_ERROR_BOTH(&port, cam, in_glass, FLATRAY_ERR_WRONG_SIDE);
    EXPECT_TRUE_ERROR_BOTH(&port, in_glass, fish_seen, FLATRAY_ERR_WRONG_SIDE);
    /* An apparent point on the observer's side, at the observer, or too shallow (inside
       the glass, above the image of the last interface) to image any point of the water. */
    EXPECT_TRUE_ERROR_BOTH(&port, cam, behind, FLATRAY_ERR_WRONG_SIDE);
    EXPECT_TRUE_ERROR_BOTH(&port, cam, v3(0.0, 0.0, 0.01), FLATRAY_ERR_WRONG_SIDE);
    EXPECT_TRUE_ERROR_BOTH(&port, v3(0.0, 0.0, 0.02), v3(0.0, 0.0, 0.02),
                           FLATRAY_ERR_WRONG_SIDE);
    EXPECT_TRUE_ERROR_BOTH(&port, cam, v3(0.0, 0.0, 0.021), FLATRAY_ERR_WRONG_SIDE);
    /* An apparent point inside the glass can be a valid image (deep enough). */
    CHECK_STATUS(flatray_true_position(&port, cam, v3(0.0, 0.0, 0.0295), FLATRAY_IMAGE_SAGITTAL, &v),
                 FLATRAY_OK);
    CHECK(v.z > 0.03);

    /* No ray connects an eye lying on the water surface to a pebble far to the side
       (it would have to graze the surface). */
    EXPECT_LOS_ERROR(&pond, v3(0.0, 0.0, 0.0), v3(5.0, 0.0, -1.0),
                     FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION);
    EXPECT_APPARENT_ERROR_BOTH(&pond, v3(0.0, 0.0, 0.0), v3(5.0, 0.0, -1.0),
                               FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION);
    /* A diver's line of sight at 53 deg (cos = 0.6) cannot leave the water. */
    EXPECT_TRUE_ERROR_BOTH(&below, v3(0.0, 0.0, -1.0), v3(2.0, 0.0, 0.5),
                           FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION);

    /* A successful path for the record (all finite). */
    CHECK_STATUS(flatray_line_of_sight(&port, cam, fish, &path), FLATRAY_OK);
    CHECK(isfinite(path.optical_length) && path.optical_length > path.geometric_length);
}

/* ------------------------------------------------------------------------ */
/* Batches                                                                    */
/* ------------------------------------------------------------------------ */

#define NB 6

static void fill_vecs(FlatrayVec3 *v, size_t n)
{
    size_t i;
    for (i = 0; i < n; i++)
        v[i] = sentinel_vec();
}
static void fill_rays(FlatrayRay *r, size_t n)
{
    size_t i;
    for (i = 0; i < n; i++)
        r[i].origin = r[i].direction = sentinel_vec();
}
static void fill_doubles(double *d, size_t n)
{
    size_t i;
    for (i = 0; i < n; i++)
        d[i] = SENTINEL;
}
static void fill_codes(int32_t *s, size_t n)
{
    size_t i;
    for (i = 0; i < n; i++)
        s[i] = STATUS_SENTINEL;
}
static int vecs_untouched(const FlatrayVec3 *v, size_t n)
{
    size_t i;
    for (i = 0; i < n; i++)
        if (v[i].x != SENTINEL || v[i].y != SENTINEL || v[i].z != SENTINEL)
            return 0;
    return 1;
}
static int rays_untouched(const FlatrayRay *r, size_t n)
{
    size_t i;
    for (i = 0; i < n; i++)
        if (!vecs_untouched(&r[i].origin, 1) || !vecs_untouched(&r[i].direction, 1))
            return 0;
    return 1;
}
static int doubles_untouched(const double *d, size_t n)
{
    size_t i;
    for (i = 0; i < n; i++)
        if (d[i] != SENTINEL)
            return 0;
    return 1;
}
static int codes_untouched(const int32_t *s, size_t n)
{
    size_t i;
    for (i = 0; i < n; i++)
        if (s[i] != STATUS_SENTINEL)
            return 0;
    return 1;
}

/* Which of the two point batches to call. */
typedef FlatrayStatus (*PointBatch)(const FlatrayStack *, const FlatrayVec3 *, size_t,
                                    const FlatrayVec3 *, size_t, int32_t, FlatrayVec3 *,
                                    int32_t *);

/* Whole-call errors of a point batch: right status, nothing written. */
static void point_batch_whole_call_errors(PointBatch fn, const char *name,
                                          const FlatrayVec3 *points, const FlatrayVec3 *observer)
{
    FlatrayStack port = port_stack();
    BadStack bad[MAX_BAD_STACKS];
    size_t nbad = make_bad_stacks(bad), b;
    FlatrayVec3 out[NB], observers[NB + 1]; /* room for the largest bad observer_count */
    int32_t st[NB];
    size_t i;
    const int32_t bad_images[3] = { 2, -1, INT32_MIN };
    const size_t bad_observer_counts[3] = { 0, 2, NB + 1 };

    for (i = 0; i < NB + 1; i++)
        observers[i] = *observer;

#define WHOLE_CALL(call, want)                                             \
    do {                                                                   \
        fill_vecs(out, NB);                                                \
        fill_codes(st, NB);                                                \
        CHECK_STATUS(call, want);                                          \
        CHECK(vecs_untouched(out, NB));                                    \
        CHECK(codes_untouched(st, NB));                                    \
    } while (0)

    set_context("%s: NULL stack", name);
    WHOLE_CALL(fn(NULL, observer, 1, points, NB, 0, out, st), FLATRAY_ERR_NULL_POINTER);
    for (b = 0; b < nbad; b++) {
        set_context("%s: %s", name, bad[b].what);
        WHOLE_CALL(fn(&bad[b].stack, observer, 1, points, NB, 0, out, st),
                   FLATRAY_ERR_INVALID_ARGUMENT);
    }
    for (i = 0; i < 3; i++) {
        set_context("%s: observer_count %lu with count %d", name,
                    (unsigned long)bad_observer_counts[i], NB);
        WHOLE_CALL(fn(&port, observers, bad_observer_counts[i], points, NB, 0, out, st),
                   FLATRAY_ERR_INVALID_ARGUMENT);
        set_context("%s: unknown image %ld", name, (long)bad_images[i]);
        WHOLE_CALL(fn(&port, observer, 1, points, NB, bad_images[i], out, st),
                   FLATRAY_ERR_INVALID_ARGUMENT);
    }
    set_context("%s: NULL arrays with a count above 0", name);
    WHOLE_CALL(fn(&port, NULL, 1, points, NB, 0, out, st), FLATRAY_ERR_NULL_POINTER);
    WHOLE_CALL(fn(&port, NULL, NB, points, NB, 0, out, st), FLATRAY_ERR_NULL_POINTER);
    WHOLE_CALL(fn(&port, observer, 1, NULL, NB, 0, out, st), FLATRAY_ERR_NULL_POINTER);
    fill_codes(st, NB);
    CHECK_STATUS(fn(&port, observer, 1, points, NB, 0, NULL, st), FLATRAY_ERR_NULL_POINTER);
    CHECK(codes_untouched(st, NB));
    /* observer_count 1 means one observer must be there, even for an empty batch. */
    CHECK_STATUS(fn(&port, NULL, 1, NULL, 0, 0, NULL, NULL), FLATRAY_ERR_NULL_POINTER);

    /* Empty batches: NULL arrays with count 0 succeed and write nothing. */
    set_context("%s: empty batch", name);
    CHECK_STATUS(fn(&port, NULL, 0, NULL, 0, 0, NULL, NULL), FLATRAY_OK);
    CHECK_STATUS(fn(&port, observer, 1, NULL, 0, 1, NULL, NULL), FLATRAY_OK);
    WHOLE_CALL(fn(&port, observer, 1, NULL, 0, 0, out, st), FLATRAY_OK);
    WHOLE_CALL(fn(&port, observers, 0, points, 0, 1, out, st), FLATRAY_OK);
#undef WHOLE_CALL
    clear_context();
}

static void test_point_batches(void)
{
    FlatrayStack port = port_stack();
    FlatrayVec3 cam = v3(0.0, 0.0, 0.0);
    /* Objects: good, on the camera's side, good, NaN, good, inside the glass. */
    FlatrayVec3 objects[NB];
    const int want_obj[NB] = { FLATRAY_OK, FLATRAY_ERR_WRONG_SIDE, FLATRAY_OK,
                               FLATRAY_ERR_INVALID_ARGUMENT, FLATRAY_OK, FLATRAY_ERR_WRONG_SIDE };
    FlatrayVec3 apparent[NB], out[NB], single, observers[NB];
    int32_t st[NB];
    int want_app[NB];
    int img, i;

    objects[0] = v3(0.1, 0.05, 1.0);
    objects[1] = v3(0.1, 0.0, -0.5);
    objects[2] = v3(-0.3, 0.2, 2.0);
    objects[3] = v3((double)NAN, 0.0, 1.0);
    objects[4] = v3(0.0, 0.0, 0.5);
    objects[5] = v3(0.0, 0.0, 0.025);

    for (img = 0; img <= 1; img++) {
        set_context("flatray_apparent_positions, image %d", img);
        /* Mixed batch: good elements filled, bad ones NaN with their own status; the
           return value is the status of the lowest-index failure. */
        fill_vecs(out, NB);
        fill_codes(st, NB);
        CHECK_STATUS(flatray_apparent_positions(&port, &cam, 1, objects, NB, img, out, st),
                     FLATRAY_ERR_WRONG_SIDE);
        for (i = 0; i < NB; i++) {
            CHECK_STATUS(st[i], want_obj[i]);
            if (want_obj[i] == FLATRAY_OK) {
                CHECK_STATUS(flatray_apparent_position(&port, cam, objects[i], img, &single),
                             FLATRAY_OK);
                CHECK_VEC_SAME(out[i], single);
            } else {
                CHECK_VEC_NAN(out[i]);
            }
        }
        /* out_status may be NULL: same return value and outputs. */
        {
            FlatrayVec3 out2[NB];
            fill_vecs(out2, NB);
            CHECK_STATUS(flatray_apparent_positions(&port, &cam, 1, objects, NB, img, out2, NULL),
                         FLATRAY_ERR_WRONG_SIDE);
            for (i = 0; i < NB; i++) {
                if (want_obj[i] == FLATRAY_OK)
                    CHECK_VEC_SAME(out2[i], out[i]);
                else
                    CHECK_VEC_NAN(out2[i]);
            }
        }
        /* The lowest-index failure decides, not the kind: NaN first, then wrong side. */
        {
            FlatrayVec3 swapped[NB];
            memcpy(swapped, objects, sizeof swapped);
            swapped[1] = objects[3];
            swapped[3] = objects[1];
            fill_codes(st, NB);
            CHECK_STATUS(flatray_apparent_positions(&port, &cam, 1, swapped, NB, img, out, st),
                         FLATRAY_ERR_INVALID_ARGUMENT);
            CHECK_STATUS(st[1], FLATRAY_ERR_INVALID_ARGUMENT);
            CHECK_STATUS(st[3], FLATRAY_ERR_WRONG_SIDE);
        }
        /* All good: FLATRAY_OK. */
        CHECK_STATUS(flatray_apparent_positions(&port, &cam, 1, objects, 1, img, out, st),
                     FLATRAY_OK);
        CHECK_STATUS(st[0], FLATRAY_OK);

        /* One observer per point; a bad observer fails only its own element. */
        for (i = 0; i < NB; i++)
            observers[i] = v3(0.01 * i, -0.02 * i, -0.1 * i);
        observers[2] = v3(0.0, 0.0, 0.025);             /* inside the glass */
        observers[4] = v3(0.0, (double)INFINITY, 0.0);  /* not finite */
        {
            FlatrayVec3 good[NB];
            const int want[NB] = { FLATRAY_OK, FLATRAY_OK, FLATRAY_ERR_WRONG_SIDE, FLATRAY_OK,
                                   FLATRAY_ERR_INVALID_ARGUMENT, FLATRAY_OK };
            for (i = 0; i < NB; i++)
                good[i] = v3(0.05 * i, 0.1, 0.5 + 0.2 * i);
            fill_vecs(out, NB);
            fill_codes(st, NB);
            CHECK_STATUS(flatray_apparent_positions(&port, observers, NB, good, NB, img, out, st),
                         FLATRAY_ERR_WRONG_SIDE);
            for (i = 0; i < NB; i++) {
                CHECK_STATUS(st[i], want[i]);
                if (want[i] == FLATRAY_OK) {
                    CHECK_STATUS(
                        flatray_apparent_position(&port, observers[i], good[i], img, &single),
                        FLATRAY_OK);
                    CHECK_VEC_SAME(out[i], single);
                } else {
                    CHECK_VEC_NAN(out[i]);
                }
            }
        }

        /* True positions: invert the good images, plus bad apparent points. */
        set_context("flatray_true_positions, image %d", img);
        for (i = 0; i < NB; i++) {
            want_app[i] = FLATRAY_OK;
            apparent[i] = v3(0.0, 0.0, 0.0);
            if (want_obj[i] == FLATRAY_OK)
                CHECK_STATUS(flatray_apparent_position(&port, cam, objects[i], img, &apparent[i]),
                             FLATRAY_OK);
        }
        apparent[1] = v3(0.0, 0.0, -0.2);             /* camera side */
        want_app[1] = FLATRAY_ERR_WRONG_SIDE;
        apparent[3] = v3(0.0, -(double)INFINITY, 1.0);
        want_app[3] = FLATRAY_ERR_INVALID_ARGUMENT;
        apparent[5] = v3(0.0, 0.0, 0.021);            /* too shallow */
        want_app[5] = FLATRAY_ERR_WRONG_SIDE;
        fill_vecs(out, NB);
        fill_codes(st, NB);
        CHECK_STATUS(flatray_true_positions(&port, &cam, 1, apparent, NB, img, out, st),
                     FLATRAY_ERR_WRONG_SIDE);
        for (i = 0; i < NB; i++) {
            CHECK_STATUS(st[i], want_app[i]);
            if (want_app[i] == FLATRAY_OK) {
                CHECK_VEC_NEAR(out[i], objects[i], 1e-9);
                CHECK_STATUS(flatray_true_position(&port, cam, apparent[i], img, &single),
                             FLATRAY_OK);
                CHECK_VEC_SAME(out[i], single);
            } else {
                CHECK_VEC_NAN(out[i]);
            }
        }
        fill_vecs(out, NB);
        CHECK_STATUS(flatray_true_positions(&port, &cam, 1, apparent, NB, img, out, NULL),
                     FLATRAY_ERR_WRONG_SIDE);
        CHECK_VEC_NEAR(out[0], objects[0], 1e-9);
        CHECK_VEC_NAN(out[3]);
        /* Per-point observers (all the same camera here). */
        for (i = 0; i < NB; i++)
            observers[i] = cam;
        fill_vecs(out, NB);
        CHECK_STATUS(flatray_true_positions(&port, observers, NB, apparent, NB, img, out, st),
                     FLATRAY_ERR_WRONG_SIDE);
        CHECK_VEC_NEAR(out[2], objects[2], 1e-9);
        CHECK_VEC_NAN(out[5]);
    }
    clear_context();

    point_batch_whole_call_errors(flatray_apparent_positions, "flatray_apparent_positions",
                                  objects, &cam);
    point_batch_whole_call_errors(flatray_true_positions, "flatray_true_positions", objects,
                                  &cam);
}

static void test_trace_rays(void)
{
    FlatrayStack below = surface_from_below_stack();
    FlatrayVec3 diver = v3(0.0, 0.0, -1.0);
    FlatrayRay rays[NB], out[NB], single;
    double t[NB], ts;
    int32_t st[NB];
    const int want[NB] = { FLATRAY_OK,
                           FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION,
                           FLATRAY_OK,
                           FLATRAY_ERR_MISSES_INTERFACE,
                           FLATRAY_ERR_WRONG_SIDE,
                           FLATRAY_ERR_INVALID_ARGUMENT };
    BadStack bad[MAX_BAD_STACKS];
    size_t nbad = make_bad_stacks(bad), b;
    int i;

    rays[0] = mkray(diver, v3(0.2, 0.1, 1.0));
    rays[1] = mkray(diver, v3(sin(PI / 3), 0.0, cos(PI / 3))); /* beyond 48.6 deg */
    rays[2] = mkray(v3(1.0, 1.0, -0.5), v3(0.0, 0.0, 2.0));
    rays[3] = mkray(diver, v3(0.3, 0.0, -1.0));                 /* away from the surface */
    rays[4] = mkray(v3(0.0, 0.0, 0.5), v3(0.0, 0.0, 1.0));      /* starts in the air */
    rays[5] = mkray(diver, v3(0.0, 0.0, 0.0));                  /* zero direction */

    fill_rays(out, NB);
    fill_doubles(t, NB);
    fill_codes(st, NB);
    CHECK_STATUS(flatray_trace_rays(&below, rays, NB, out, t, st),
                 FLATRAY_ERR_TOTAL_INTERNAL_REFLECTION);
    for (i = 0; i < NB; i++) {
        set_context("flatray_trace_rays element %d", i);
        CHECK_STATUS(st[i], want[i]);
        if (want[i] == FLATRAY_OK) {
            CHECK_STATUS(flatray_trace(&below, rays[i], &single, &ts), FLATRAY_OK);
            CHECK_VEC_SAME(out[i].origin, single.origin);
            CHECK_VEC_SAME(out[i].direction, single.direction);
            CHECK(t[i] == ts);
        } else {
            CHECK_VEC_NAN(out[i].origin);
            CHECK_VEC_NAN(out[i].direction);
            CHECK_NAN(t[i]);
        }
    }
    clear_context();
    /* A ray parallel to the surface also misses; it is the first failure here. */
    rays[1] = mkray(diver, v3(1.0, 1.0, 0.0));
    fill_codes(st, NB);
    CHECK_STATUS(flatray_trace_rays(&below, rays, NB, out, t, st), FLATRAY_ERR_MISSES_INTERFACE);
    CHECK_STATUS(st[1], FLATRAY_ERR_MISSES_INTERFACE);
    CHECK_STATUS(st[3], FLATRAY_ERR_MISSES_INTERFACE);
    /* out_transmittance and out_status may be NULL. */
    fill_rays(out, NB);
    CHECK_STATUS(flatray_trace_rays(&below, rays, NB, out, NULL, NULL),
                 FLATRAY_ERR_MISSES_INTERFACE);
    CHECK_STATUS(flatray_trace(&below, rays[2], &single, NULL), FLATRAY_OK);
    CHECK_VEC_SAME(out[2].origin, single.origin);
    CHECK_VEC_NAN(out[5].direction);
    fill_rays(out, NB);
    fill_doubles(t, NB);
    CHECK_STATUS(flatray_trace_rays(&below, rays, NB, out, t, NULL), FLATRAY_ERR_MISSES_INTERFACE);
    CHECK(!isnan(t[0]) && isnan(t[1]));
    fill_codes(st, NB);
    CHECK_STATUS(flatray_trace_rays(&below, rays, 1, out, NULL, st), FLATRAY_OK);
    CHECK_STATUS(st[0], FLATRAY_OK);
    CHECK(st[1] == STATUS_SENTINEL); /* only `count` elements are written */

    /* Whole-call errors write nothing. */
#define TRACE_WHOLE_CALL(call, want)                                       \
    do {                                                                   \
        fill_rays(out, NB);                                                \
        fill_doubles(t, NB);                                               \
        fill_codes(st, NB);                                                \
        CHECK_STATUS(call, want);                                          \
        CHECK(rays_untouched(out, NB));                                    \
        CHECK(doubles_untouched(t, NB));                                   \
        CHECK(codes_untouched(st, NB));                                    \
    } while (0)
    TRACE_WHOLE_CALL(flatray_trace_rays(NULL, rays, NB, out, t, st), FLATRAY_ERR_NULL_POINTER);
    TRACE_WHOLE_CALL(flatray_trace_rays(&below, NULL, NB, out, t, st), FLATRAY_ERR_NULL_POINTER);
    TRACE_WHOLE_CALL(flatray_trace_rays(&below, rays, NB, NULL, t, st), FLATRAY_ERR_NULL_POINTER);
    for (b = 0; b < nbad; b++) {
        set_context("flatray_trace_rays: %s", bad[b].what);
        TRACE_WHOLE_CALL(flatray_trace_rays(&bad[b].stack, rays, NB, out, t, st),
                         FLATRAY_ERR_INVALID_ARGUMENT);
    }
    clear_context();
    /* Empty batches. */
    CHECK_STATUS(flatray_trace_rays(&below, NULL, 0, NULL, NULL, NULL), FLATRAY_OK);
    TRACE_WHOLE_CALL(flatray_trace_rays(&below, NULL, 0, out, t, st), FLATRAY_OK);
    TRACE_WHOLE_CALL(flatray_trace_rays(&below, rays, 0, out, t, st), FLATRAY_OK);
#undef TRACE_WHOLE_CALL
}

int main(void)
{
    test_constants_and_version();
    test_status_messages();
    test_refract();
    test_fresnel();
    test_critical_angle();
    test_geometry_values();
    test_depth_helpers();
    test_geometry_errors();
    test_point_batches();
    test_trace_rays();

    return check_summary();
}
