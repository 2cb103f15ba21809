/*
 * test_survey.c: C tests of the survey functions of the flatray C ABI
 * (triangulation, multi-view and range corrections, depth tables, error budget).
 *
 * Synthetic surveys are built from known true points (invented geometry): exact
 * lines of sight come from flatray_line_of_sight, and the uncorrected point from
 * this file's own straight-line least-squares intersection (independent of the
 * library's). Indices: air 1.00028, seawater 1.339, typical values from memory.
 */

#include "check.h"

#include <stdlib.h>

static const double N_AIR = 1.00028;
static const double N_SEA = 1.339;
/* The recovery tolerance the survey issue asks for. The solvers reach ~1e-12 m. */
static const double RECOVERY = 1e-9;

static FlatrayStack lagoon(void)
{
    FlatrayStack s;
    memset(&s, 0, sizeof s);
    s.normal = v3(0.0, 0.0, -1.0);
    s.n_observer = N_AIR;
    s.n_object = N_SEA;
    return s;
}

/* The exact straight line of sight from camera c to object p. */
static FlatrayRay sight(const FlatrayStack *s, FlatrayVec3 c, FlatrayVec3 p)
{
    FlatrayPath path;
    FlatrayStatus st = flatray_line_of_sight(s, c, p, &path);
    CHECK_STATUS(st, FLATRAY_OK);
    return mkray(c, path.direction);
}

/* Least-squares point of n lines (normal equations, Cramer's rule): the test's
   own implementation of what a refraction-blind triangulation reports. */
static FlatrayVec3 straight_point(const FlatrayRay *lines, size_t n)
{
    double a[3][3] = { { 0 } }, b[3] = { 0 }, x[3];
    size_t i;
    int r, c;
    for (i = 0; i < n; i++) {
        FlatrayVec3 d = vunit(lines[i].direction);
        double dv[3] = { d.x, d.y, d.z };
        double o[3] = { lines[i].origin.x, lines[i].origin.y, lines[i].origin.z };
        for (r = 0; r < 3; r++)
            for (c = 0; c < 3; c++) {
                double m = (r == c ? 1.0 : 0.0) - dv[r] * dv[c];
                a[r][c] += m;
                b[r] += m * o[c];
            }
    }
    {
        double det = a[0][0] * (a[1][1] * a[2][2] - a[1][2] * a[2][1]) -
                     a[0][1] * (a[1][0] * a[2][2] - a[1][2] * a[2][0]) +
                     a[0][2] * (a[1][0] * a[2][1] - a[1][1] * a[2][0]);
        for (c = 0; c < 3; c++) {
            double m[3][3];
            memcpy(m, a, sizeof m);
            for (r = 0; r < 3; r++)
                m[r][c] = b[r];
            x[c] = (m[0][0] * (m[1][1] * m[2][2] - m[1][2] * m[2][1]) -
                    m[0][1] * (m[1][0] * m[2][2] - m[1][2] * m[2][0]) +
                    m[0][2] * (m[1][0] * m[2][1] - m[1][1] * m[2][0])) /
                   det;
        }
    }
    return v3(x[0], x[1], x[2]);
}

static void test_multiview_and_triangulation(void)
{
    FlatrayStack s = lagoon();
    FlatrayVec3 cams[4] = { { -12.0, -3.0, 38.0 }, { 4.0, -9.5, 41.5 }, { 17.0, 2.0, 44.0 },
                            { 9.0, 15.0, 52.0 } };
    FlatrayVec3 truths[4] = { { 0.0, 0.0, -1.0 }, { 5.0, -2.0, -3.5 }, { -8.0, 6.0, -0.4 },
                              { 12.0, 9.0, -6.0 } };
    double worst_shortcut = 0.0;
    int k;
    for (k = 0; k < 4; k++) {
        size_t n = (size_t)(2 + k % 3);
        FlatrayRay lines[4];
        FlatrayVec3 seen, out = sentinel_vec();
        double rms = SENTINEL;
        size_t i;
        set_context("point %d with %zu cameras", k, n);
        for (i = 0; i < n; i++)
            lines[i] = sight(&s, cams[(size_t)k + i < 4 ? (size_t)k + i : i], truths[k]);
        seen = straight_point(lines, n);
        {
            FlatrayVec3 used[4];
            for (i = 0; i < n; i++)
                used[i] = lines[i].origin;
            CHECK_STATUS(flatray_correct_multiview(&s, used, n, seen, &out, &rms), FLATRAY_OK);
            CHECK_VEC_NEAR(out, truths[k], RECOVERY);
            CHECK(rms > 0.0 && rms < 1.0);
            CHECK_STATUS(flatray_correct_multiview_shortcut(&s, used, n, seen, &out, NULL),
                         FLATRAY_OK);
            if (vdist(out, truths[k]) > worst_shortcut)
                worst_shortcut = vdist(out, truths[k]);
        }
        CHECK_STATUS(flatray_triangulate(&s, lines, n, &out, &rms), FLATRAY_OK);
        CHECK_VEC_NEAR(out, truths[k], RECOVERY);
        CHECK(rms < RECOVERY);
    }
    clear_context();
    printf("multiview: shortcut worst error %.2e m (exact: below %.0e m)\n", worst_shortcut,
           RECOVERY);
}

static void test_multiview_batch(void)
{
    FlatrayStack s = lagoon();
    FlatrayVec3 cams[3] = { { -10.0, 0.0, 40.0 }, { 8.0, 6.0, 44.0 }, { 0.0, -12.0, 50.0 } };
    FlatrayVec3 truth = v3(1.0, 2.0, -2.5);
    FlatrayRay lines[3];
    FlatrayVec3 seen[3], out[3];
    double rms[3];
    int32_t status[3];
    size_t offsets[4] = { 0, 3, 4, 6 };
    uint32_t ids[6] = { 0, 1, 2, 1, 0, 9 }; /* point 1: one view; point 2: id 9 missing */
    int i;
    for (i = 0; i < 3; i++)
        lines[i] = sight(&s, cams[i], truth);
    seen[0] = seen[1] = seen[2] = straight_point(lines, 3);
    CHECK_STATUS(flatray_correct_multiviews(&s, cams, 3, offsets, ids, 6, seen, 3, out, rms,
                                            status),
                 FLATRAY_ERR_DEGENERATE);
    CHECK_VEC_NEAR(out[0], truth, RECOVERY);
    CHECK_STATUS(status[0], FLATRAY_OK);
    CHECK_STATUS(status[1], FLATRAY_ERR_DEGENERATE);
    CHECK_STATUS(status[2], FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK_VEC_NAN(out[1]);
    CHECK_NAN(rms[2]);
    CHECK_STATUS(flatray_correct_multiviews_shortcut(&s, cams, 3, offsets, ids, 6, seen, 1, out,
                                                     NULL, NULL),
                 FLATRAY_OK);
    /* Malformed offsets: a whole-call error, nothing written. */
    {
        size_t bad[4] = { 0, 3, 2, 6 };
        int32_t untouched[3] = { STATUS_SENTINEL, STATUS_SENTINEL, STATUS_SENTINEL };
        CHECK_STATUS(flatray_correct_multiviews(&s, cams, 3, bad, ids, 6, seen, 3, out, rms,
                                                untouched),
                     FLATRAY_ERR_INVALID_ARGUMENT);
        CHECK(untouched[0] == STATUS_SENTINEL);
    }
    CHECK_STATUS(flatray_correct_multiviews(&s, cams, 3, NULL, ids, 6, seen, 3, out, rms, status),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_correct_multiviews(&s, NULL, 0, NULL, NULL, 0, NULL, 0, NULL, NULL, NULL),
                 FLATRAY_OK);
}

static void test_ranges(void)
{
    FlatrayStack s = lagoon();
    double ng[2] = { 1.00029, 1.3758 }; /* group indices near 532 nm, from memory */
    FlatrayVec3 sensor = v3(3.0, -2.0, 60.0);
    FlatrayVec3 truth = v3(9.0, 4.0, -3.2);
    FlatrayPath path;
    FlatrayVec3 uncorrected, out = sentinel_vec();
    double g;
    CHECK_STATUS(flatray_line_of_sight(&s, sensor, truth, &path), FLATRAY_OK);
    g = ng[0] * vdist(path.entry, sensor) + ng[1] * vdist(truth, path.entry);
    uncorrected = vadd(sensor, vscale(path.direction, g / ng[0]));
    CHECK_STATUS(flatray_correct_range(&s, sensor, uncorrected, ng, 2, &out), FLATRAY_OK);
    CHECK_VEC_NEAR(out, truth, RECOVERY);
    /* Phase indices (NULL, 0) give another point: the group indices matter. */
    CHECK_STATUS(flatray_correct_range(&s, sensor, uncorrected, NULL, 0, &out), FLATRAY_OK);
    CHECK(vdist(out, truth) > 1e-3);
    /* A range that ends above the water comes back unchanged. */
    CHECK_STATUS(flatray_correct_range(&s, sensor, v3(3.0, -2.0, 10.0), ng, 2, &out), FLATRAY_OK);
    CHECK_VEC_SAME(out, v3(3.0, -2.0, 10.0));
    /* Bad input. */
    out = sentinel_vec();
    CHECK_STATUS(flatray_correct_range(&s, sensor, uncorrected, ng, 3, &out),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK_VEC_NAN(out);
    CHECK_STATUS(flatray_correct_range(&s, sensor, uncorrected, NULL, 2, &out),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_correct_range(&s, v3(0, 0, -1), uncorrected, ng, 2, &out),
                 FLATRAY_ERR_WRONG_SIDE);
    CHECK_STATUS(flatray_correct_range(&s, sensor, v3(NAN, 0, -1), ng, 2, &out),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK_STATUS(flatray_correct_range(&s, sensor, uncorrected, ng, 2, NULL),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_correct_range(NULL, sensor, uncorrected, ng, 2, &out),
                 FLATRAY_ERR_NULL_POINTER);
    /* Batch: a NaN row fails alone. */
    {
        FlatrayVec3 pts[3];
        FlatrayVec3 res[3];
        int32_t status[3];
        pts[0] = uncorrected;
        pts[1] = v3(NAN, 0.0, -1.0);
        pts[2] = uncorrected;
        CHECK_STATUS(flatray_correct_ranges(&s, &sensor, 1, pts, 3, ng, 2, res, status),
                     FLATRAY_ERR_INVALID_ARGUMENT);
        CHECK_VEC_NEAR(res[0], truth, RECOVERY);
        CHECK_VEC_NEAR(res[2], truth, RECOVERY);
        CHECK_VEC_NAN(res[1]);
        CHECK_STATUS(status[1], FLATRAY_ERR_INVALID_ARGUMENT);
        CHECK_STATUS(flatray_correct_ranges(&s, &sensor, 2, pts, 3, ng, 2, res, status),
                     FLATRAY_ERR_INVALID_ARGUMENT);
        CHECK_STATUS(flatray_correct_ranges(&s, &sensor, 1, pts, 3, ng, 1, res, NULL),
                     FLATRAY_ERR_INVALID_ARGUMENT);
    }
}

static void test_depth_tables(void)
{
    double angles[4] = { 0.0, 0.3, 0.6, 2.0 };
    double depths[4] = { 1.0, 1.0, -1.0, 1.0 };
    double out[4], k[4];
    int32_t status[4];
    CHECK_STATUS(flatray_correction_factors(angles, 3, N_AIR, 1.335, FLATRAY_IMAGE_SAGITTAL, k,
                                            status),
                 FLATRAY_OK);
    /* Nadir: n_water / n_air, the constant 1.34 that Westaway, Lane and Hicks
       (2001) name, to within the spread of water indices (0.01). */
    CHECK_NEAR(k[0], 1.335 / N_AIR, 1e-15);
    CHECK_NEAR(k[0], 1.34, 0.01);
    CHECK(k[1] > k[0] && k[2] > k[1]);
    CHECK_STATUS(flatray_true_depths(depths, angles, 4, N_AIR, 1.335, FLATRAY_IMAGE_SAGITTAL, out,
                                     status),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK_NEAR(out[1], k[1], 1e-15);
    CHECK_NAN(out[2]);
    CHECK_STATUS(status[2], FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK_STATUS(status[3], FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK_STATUS(flatray_true_depths(depths, angles, 4, N_AIR, 1.335, 7, out, status),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK_STATUS(flatray_true_depths(NULL, angles, 4, N_AIR, 1.335, 0, out, status),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_true_depths(NULL, NULL, 0, N_AIR, 1.335, 0, NULL, NULL), FLATRAY_OK);
}

static void test_error_budget(void)
{
    FlatrayStack s = lagoon();
    FlatrayVec3 obs = v3(1.0, -2.0, 20.0), app = v3(9.0, 4.0, -2.5);
    double d_off[3], d_n[3], d_obs[9], d_app[9], cov[9];
    const double h = 1e-5; /* central differences: truncation ~h^2, rounding ~1e-11/h */
    int image;
    for (image = 0; image < 2; image++) {
        FlatrayVec3 plus, minus;
        FlatrayStack sp = s, sm = s;
        int j;
        set_context("image %d", image);
        CHECK_STATUS(flatray_true_position_sensitivity(&s, obs, app, image, d_off, d_n, d_obs,
                                                       d_app),
                     FLATRAY_OK);
        /* The stack moved by +-h along its unit normal (0, 0, -1). */
        sp.origin = v3(0, 0, -h);
        sm.origin = v3(0, 0, h);
        flatray_true_position(&sp, obs, app, image, &plus);
        flatray_true_position(&sm, obs, app, image, &minus);
        CHECK_NEAR(d_off[2], (plus.z - minus.z) / (2 * h), 1e-6);
        sp = s;
        sm = s;
        sp.n_object += h;
        sm.n_object -= h;
        flatray_true_position(&sp, obs, app, image, &plus);
        flatray_true_position(&sm, obs, app, image, &minus);
        CHECK_NEAR(d_n[0], (plus.x - minus.x) / (2 * h), 1e-6);
        for (j = 0; j < 3; j++) {
            FlatrayVec3 ap = app, am = app;
            *component(&ap, j) += h;
            *component(&am, j) -= h;
            flatray_true_position(&s, obs, ap, image, &plus);
            flatray_true_position(&s, obs, am, image, &minus);
            CHECK_NEAR(d_app[0 * 3 + j], (plus.x - minus.x) / (2 * h), 1e-6);
            CHECK_NEAR(d_app[2 * 3 + j], (plus.z - minus.z) / (2 * h), 1e-6);
        }
        CHECK_STATUS(flatray_true_position_covariance(&s, obs, app, image, 0.02, 0.0, 0.0, 0.0, cov),
                     FLATRAY_OK);
        /* Only the offset term: C = sigma^2 g g^T. */
        CHECK_NEAR(cov[8], 0.02 * 0.02 * d_off[2] * d_off[2], 1e-15);
        CHECK_NEAR(cov[1], cov[3], 1e-18);
    }
    clear_context();
    /* Bad input: NULL outputs (the others NaN), a point above the water, a
       negative standard deviation, an unknown image. */
    CHECK_STATUS(flatray_true_position_sensitivity(&s, obs, app, 0, d_off, NULL, d_obs, d_app),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_NAN(d_off[0]);
    CHECK_NAN(d_app[8]);
    CHECK_STATUS(flatray_true_position_sensitivity(&s, obs, v3(0, 0, 1), 0, d_off, d_n, d_obs,
                                                   d_app),
                 FLATRAY_ERR_WRONG_SIDE);
    CHECK_NAN(d_n[1]);
    CHECK_STATUS(flatray_true_position_covariance(&s, obs, app, 0, -1.0, 0, 0, 0, cov),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK_NAN(cov[4]);
    CHECK_STATUS(flatray_true_position_covariance(&s, obs, app, 5, 0, 0, 0, 0, cov),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK_STATUS(flatray_true_position_covariance(&s, obs, app, 0, 0, 0, 0, 0, NULL),
                 FLATRAY_ERR_NULL_POINTER);
}

static void test_bad_views(void)
{
    FlatrayStack s = lagoon();
    FlatrayVec3 cams[2] = { { 0.0, 0.0, 30.0 }, { 10.0, 0.0, 32.0 } };
    FlatrayVec3 seen = v3(1.0, 2.0, -1.5), out;
    double rms = SENTINEL;
    /* One view. */
    CHECK_STATUS(flatray_correct_multiview(&s, cams, 1, seen, &out, &rms), FLATRAY_ERR_DEGENERATE);
    CHECK_VEC_NAN(out);
    CHECK_NAN(rms);
    /* A camera under water. */
    {
        FlatrayVec3 wet[2] = { { 0.0, 0.0, 30.0 }, { 5.0, 0.0, -0.5 } };
        CHECK_STATUS(flatray_correct_multiview(&s, wet, 2, seen, &out, NULL),
                     FLATRAY_ERR_WRONG_SIDE);
    }
    /* A point above the surface. */
    CHECK_STATUS(flatray_correct_multiview_shortcut(&s, cams, 2, v3(1, 2, 0.5), &out, NULL),
                 FLATRAY_ERR_WRONG_SIDE);
    /* Parallel lines of sight: cameras on one vertical over the point. */
    {
        FlatrayVec3 stacked[2] = { { 1.0, 2.0, 30.0 }, { 1.0, 2.0, 45.0 } };
        FlatrayRay lines[2];
        lines[0] = mkray(stacked[0], v3(0, 0, -1));
        lines[1] = mkray(stacked[1], v3(0, 0, -1));
        CHECK_STATUS(flatray_correct_multiview(&s, stacked, 2, seen, &out, NULL),
                     FLATRAY_ERR_DEGENERATE);
        CHECK_STATUS(flatray_triangulate(&s, lines, 2, &out, &rms), FLATRAY_ERR_DEGENERATE);
        CHECK_STATUS(flatray_triangulate(&s, lines, 1, &out, &rms), FLATRAY_ERR_DEGENERATE);
    }
    /* NaN rows. */
    CHECK_STATUS(flatray_correct_multiview(&s, cams, 2, v3(NAN, 0, -1), &out, NULL),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    /* NULL pointers. */
    rms = SENTINEL;
    CHECK_STATUS(flatray_correct_multiview(&s, cams, 2, seen, NULL, &rms), FLATRAY_ERR_NULL_POINTER);
    CHECK_NAN(rms);
    CHECK_STATUS(flatray_correct_multiview(&s, NULL, 2, seen, &out, NULL), FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_correct_multiview(NULL, cams, 2, seen, &out, NULL),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_triangulate(&s, NULL, 2, &out, NULL), FLATRAY_ERR_NULL_POINTER);
}

int main(void)
{
    test_multiview_and_triangulation();
    test_multiview_batch();
    test_ranges();
    test_depth_tables();
    test_error_budget();
    test_bad_views();
    return check_summary();
}
