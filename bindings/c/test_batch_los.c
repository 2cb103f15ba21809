/*
 * test_batch_los.c: C tests of flatray_lines_of_sight, the batch line of sight.
 *
 * Every element must equal the single-point flatray_line_of_sight bit for bit
 * (the batch runs the same code, on every core for large batches), failures
 * must be reported per element with NaN paths, and whole-call errors must write
 * nothing (DESIGN.md, batch rules). Invented scenes; indices are common-practice
 * values (air 1.00028, acrylic 1.49, glass 1.52, water 1.333).
 */

#include "check.h"

#include <stdlib.h>

static FlatrayStack lake(void)
{
    FlatrayStack s;
    memset(&s, 0, sizeof s);
    s.normal = v3(0.0, 0.0, -1.0);
    s.n_observer = 1.00028;
    s.n_object = 1.333;
    return s;
}

/* A tank wall seen through a camera port: three layers (glass, air gap, acrylic). */
static FlatrayStack three_layers(void)
{
    FlatrayStack s;
    memset(&s, 0, sizeof s);
    s.origin = v3(0.0, 0.0, 0.05);
    s.normal = v3(0.0, 0.0, 2.0); /* any length */
    s.n_observer = 1.00028;
    s.layer_count = 3;
    s.thickness[0] = 0.010;
    s.n_layer[0] = 1.52;
    s.thickness[1] = 0.002;
    s.n_layer[1] = 1.00028;
    s.thickness[2] = 0.120;
    s.n_layer[2] = 1.49;
    s.n_object = 1.333;
    return s;
}

static int path_same(const FlatrayPath *a, const FlatrayPath *b)
{
    return memcmp(a, b, sizeof *a) == 0;
}

static int path_all_nan(const FlatrayPath *p)
{
    return isnan(p->direction.x) && isnan(p->direction.y) && isnan(p->direction.z) &&
           isnan(p->entry.x) && isnan(p->entry.y) && isnan(p->entry.z) && isnan(p->exit.x) &&
           isnan(p->exit.y) && isnan(p->exit.z) && isnan(p->geometric_length) &&
           isnan(p->optical_length) && isnan(p->transmittance);
}

static void fill_sentinel(FlatrayPath *paths, int32_t *status, size_t n)
{
    size_t i;
    for (i = 0; i < n; i++) {
        paths[i].direction = sentinel_vec();
        paths[i].entry = sentinel_vec();
        paths[i].exit = sentinel_vec();
        paths[i].geometric_length = SENTINEL;
        paths[i].optical_length = SENTINEL;
        paths[i].transmittance = SENTINEL;
        if (status)
            status[i] = STATUS_SENTINEL;
    }
}

static int untouched(const FlatrayPath *paths, const int32_t *status, size_t n)
{
    size_t i;
    for (i = 0; i < n; i++) {
        if (paths[i].geometric_length != SENTINEL || paths[i].direction.x != SENTINEL)
            return 0;
        if (status && status[i] != STATUS_SENTINEL)
            return 0;
    }
    return 1;
}

/* Objects under the lake (or past the 3-layer stack), one per row of a grid. */
static FlatrayVec3 object_at(const FlatrayStack *s, size_t i)
{
    double lateral = (double)(i % 101) * 0.37 - 18.0;
    double across = (double)(i % 13) * 0.5 - 3.0;
    double depth = 0.05 + (double)(i % 29) * 0.21;
    if (s->layer_count == 0)
        return v3(lateral, across, -depth);
    return v3(lateral * 0.05, across * 0.05, 0.05 + 0.132 + depth);
}

static FlatrayVec3 observer_at(const FlatrayStack *s, size_t i)
{
    if (s->layer_count == 0)
        return v3((double)(i % 7) - 3.0, 0.5, 12.0 + (double)(i % 5));
    return v3(0.001 * (double)(i % 3), 0.0, -0.001 * (double)(i % 4));
}

/* Each element of a batch equals its single call, shared and per-point observers,
   on a small batch (one thread) and a large one (split over every core). */
static void test_matches_single_calls(void)
{
    const size_t sizes[2] = { 17, 20000 };
    FlatrayStack stacks[2];
    int which, k;
    stacks[0] = lake();
    stacks[1] = three_layers();
    for (which = 0; which < 2; which++) {
        for (k = 0; k < 2; k++) {
            size_t n = sizes[k], i, mismatches = 0, failures = 0;
            FlatrayVec3 *objects = malloc(n * sizeof *objects);
            FlatrayVec3 *observers = malloc(n * sizeof *observers);
            FlatrayPath *paths = malloc(n * sizeof *paths);
            FlatrayPath *shared = malloc(n * sizeof *shared);
            int32_t *status = malloc(n * sizeof *status);
            FlatrayStatus rc;
            if (!objects || !observers || !paths || !shared || !status) {
                CHECK(!"out of memory");
                return;
            }
            set_context("stack %d, %zu points", which, n);
            for (i = 0; i < n; i++) {
                objects[i] = object_at(&stacks[which], i);
                observers[i] = observer_at(&stacks[which], i);
            }
            fill_sentinel(paths, status, n);
            rc = flatray_lines_of_sight(&stacks[which], observers, n, objects, n, paths, status);
            CHECK_STATUS(rc, FLATRAY_OK);
            for (i = 0; i < n; i++) {
                FlatrayPath one;
                FlatrayStatus s1 = flatray_line_of_sight(&stacks[which], observers[i], objects[i], &one);
                if (s1 != FLATRAY_OK || status[i] != FLATRAY_OK)
                    failures++;
                if (!path_same(&one, &paths[i]))
                    mismatches++;
            }
            CHECK(failures == 0);
            CHECK(mismatches == 0);
            /* One shared observer, and no status array. */
            fill_sentinel(shared, NULL, n);
            rc = flatray_lines_of_sight(&stacks[which], observers, 1, objects, n, shared, NULL);
            CHECK_STATUS(rc, FLATRAY_OK);
            mismatches = 0;
            for (i = 0; i < n; i++) {
                FlatrayPath one;
                flatray_line_of_sight(&stacks[which], observers[0], objects[i], &one);
                if (!path_same(&one, &shared[i]))
                    mismatches++;
            }
            CHECK(mismatches == 0);
            /* Physics, independent of the library: the path starts along its
               direction, unit length, and is longer than the straight line. */
            for (i = 0; i < n; i += 97) {
                double straight = vdist(observers[i], objects[i]);
                CHECK_NEAR(vlen(paths[i].direction), 1.0, 4.0 * DBL_EPSILON);
                CHECK(paths[i].geometric_length >= straight * (1.0 - 1e-15));
                CHECK(distance_to_ray(paths[i].entry, observers[i], paths[i].direction) <=
                      1e-12 * (1.0 + vlen(observers[i])));
                CHECK(paths[i].transmittance > 0.0 && paths[i].transmittance <= 1.0);
            }
            clear_context();
            free(objects);
            free(observers);
            free(paths);
            free(shared);
            free(status);
        }
    }
}

/* Failing elements get their own status and NaN paths; the others are computed;
   the return value is the lowest-index failure. */
static void test_element_failures(void)
{
    FlatrayStack s = lake();
    FlatrayVec3 observer = v3(0.0, 0.0, 12.0);
    FlatrayVec3 objects[6];
    FlatrayPath paths[6];
    int32_t status[6];
    const int32_t want[6] = { FLATRAY_OK, FLATRAY_ERR_WRONG_SIDE, FLATRAY_ERR_INVALID_ARGUMENT,
                              FLATRAY_OK, FLATRAY_ERR_INVALID_ARGUMENT, FLATRAY_OK };
    FlatrayStatus rc;
    int i;
    objects[0] = v3(4.0, 1.0, -2.5);
    objects[1] = v3(1.0, 0.0, 3.0); /* above the water */
    objects[2] = v3(NAN, 0.0, -1.0);
    objects[3] = v3(0.0, 0.0, -1.0); /* straight down */
    objects[4] = v3(0.0, INFINITY, -1.0);
    objects[5] = v3(-300.0, 20.0, -0.5); /* grazing */
    fill_sentinel(paths, status, 6);
    rc = flatray_lines_of_sight(&s, &observer, 1, objects, 6, paths, status);
    CHECK_STATUS(rc, FLATRAY_ERR_WRONG_SIDE);
    for (i = 0; i < 6; i++) {
        set_context("element %d", i);
        CHECK_STATUS(status[i], want[i]);
        if (want[i] == FLATRAY_OK) {
            FlatrayPath one;
            CHECK_STATUS(flatray_line_of_sight(&s, observer, objects[i], &one), FLATRAY_OK);
            CHECK(path_same(&one, &paths[i]));
        } else {
            CHECK(path_all_nan(&paths[i]));
        }
    }
    clear_context();
    /* Straight down: the path is the normal, lengths add up. */
    CHECK_VEC_NEAR(paths[3].direction, v3(0.0, 0.0, -1.0), 0.0);
    CHECK_NEAR(paths[3].geometric_length, 13.0, 1e-14);
    CHECK_NEAR(paths[3].optical_length, 12.0 * 1.00028 + 1.333, 1e-13);
    /* Without a status array the return value still names the first failure. */
    fill_sentinel(paths, NULL, 6);
    rc = flatray_lines_of_sight(&s, &observer, 1, objects + 2, 4, paths, NULL);
    CHECK_STATUS(rc, FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK(path_all_nan(&paths[0]) && !isnan(paths[1].geometric_length));
}

/* Whole-call errors return at once and write nothing. */
static void test_whole_call_errors(void)
{
    FlatrayStack s = lake(), bad = lake();
    FlatrayVec3 observers[2] = { { 0.0, 0.0, 12.0 }, { 1.0, 0.0, 12.0 } };
    FlatrayVec3 objects[3] = { { 1.0, 0.0, -1.0 }, { 2.0, 0.0, -1.0 }, { 3.0, 0.0, -1.0 } };
    FlatrayPath paths[3];
    int32_t status[3];
    int i;

    fill_sentinel(paths, status, 3);
    CHECK_STATUS(flatray_lines_of_sight(NULL, observers, 1, objects, 3, paths, status),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK(untouched(paths, status, 3));
    /* Two observers for three points. */
    CHECK_STATUS(flatray_lines_of_sight(&s, observers, 2, objects, 3, paths, status),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK(untouched(paths, status, 3));
    CHECK_STATUS(flatray_lines_of_sight(&s, observers, 0, objects, 3, paths, status),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK(untouched(paths, status, 3));
    /* NULL arrays with a count above 0. */
    CHECK_STATUS(flatray_lines_of_sight(&s, NULL, 1, objects, 3, paths, status),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_lines_of_sight(&s, observers, 1, NULL, 3, paths, status),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK_STATUS(flatray_lines_of_sight(&s, observers, 1, objects, 3, NULL, status),
                 FLATRAY_ERR_NULL_POINTER);
    CHECK(untouched(paths, status, 3));
    /* Invalid stacks: every bad field, and too many layers. */
    for (i = 0; i < POISON_COUNT; i++) {
        set_context("n_object = %s", POISON_NAME[i]);
        bad = lake();
        bad.n_object = poison(i);
        CHECK_STATUS(flatray_lines_of_sight(&bad, observers, 1, objects, 3, paths, status),
                     FLATRAY_ERR_INVALID_ARGUMENT);
        CHECK(untouched(paths, status, 3));
    }
    clear_context();
    bad = lake();
    bad.normal = v3(0.0, 0.0, 0.0);
    CHECK_STATUS(flatray_lines_of_sight(&bad, observers, 1, objects, 3, paths, status),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    bad = lake();
    bad.layer_count = FLATRAY_MAX_LAYERS + 1;
    CHECK_STATUS(flatray_lines_of_sight(&bad, observers, 1, objects, 3, paths, status),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    bad = lake();
    bad.layer_count = 1; /* thickness[0] is 0 */
    CHECK_STATUS(flatray_lines_of_sight(&bad, observers, 1, objects, 3, paths, status),
                 FLATRAY_ERR_INVALID_ARGUMENT);
    CHECK(untouched(paths, status, 3));
    /* An empty batch: NULL everywhere is fine, and so is a shared observer. */
    CHECK_STATUS(flatray_lines_of_sight(&s, NULL, 0, NULL, 0, NULL, NULL), FLATRAY_OK);
    CHECK_STATUS(flatray_lines_of_sight(&s, observers, 1, NULL, 0, NULL, NULL), FLATRAY_OK);
    /* ...but an empty batch still needs a valid stack. */
    CHECK_STATUS(flatray_lines_of_sight(NULL, NULL, 0, NULL, 0, NULL, NULL),
                 FLATRAY_ERR_NULL_POINTER);
}

int main(void)
{
    test_matches_single_calls();
    test_element_failures();
    test_whole_call_errors();
    return check_summary();
}
