/*
 * scalar_loop.c: the "plain C loop" column of the speed comparison
 * (bindings/python/bench/compare.py). It calls the flatray C ABI one point at a
 * time, in a simple for loop on one thread, as firmware or a C survey tool that
 * ignores the batch functions would.
 *
 * Usage: scalar_loop WORKLOAD DIR COUNT REPEATS
 *   WORKLOAD  trace | true_sagittal | apparent_sagittal | apparent_tangential | los
 *   DIR       holds stack.bin (one FlatrayStack), a.bin and b.bin (float64
 *             inputs, see below); out.bin and status.bin are written there
 *   COUNT     number of points
 *   REPEATS   the loop runs this many times; the best time is printed
 *
 * Inputs: trace: a.bin = COUNT FlatrayRay (observer rays), b.bin unused;
 * the others: a.bin = COUNT observers (FlatrayVec3), b.bin = COUNT points.
 * Outputs: out.bin = COUNT FlatrayRay + COUNT doubles (trace), COUNT FlatrayVec3
 * (positions) or COUNT FlatrayPath (los); status.bin = COUNT int32.
 * Prints one line: "seconds S" (the best of REPEATS runs, wall clock).
 */
#define _POSIX_C_SOURCE 199309L
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "flatray.h"

static void *read_file(const char *dir, const char *name, size_t bytes)
{
    char path[4096];
    FILE *f;
    void *buf = malloc(bytes ? bytes : 1);
    snprintf(path, sizeof path, "%s/%s", dir, name);
    f = fopen(path, "rb");
    if (!f || !buf || fread(buf, 1, bytes, f) != bytes) {
        fprintf(stderr, "scalar_loop: cannot read %zu bytes from %s\n", bytes, path);
        exit(2);
    }
    fclose(f);
    return buf;
}

static void write_file(const char *dir, const char *name, const void *buf, size_t bytes)
{
    char path[4096];
    FILE *f;
    snprintf(path, sizeof path, "%s/%s", dir, name);
    f = fopen(path, "wb");
    if (!f || fwrite(buf, 1, bytes, f) != bytes) {
        fprintf(stderr, "scalar_loop: cannot write %s\n", path);
        exit(2);
    }
    fclose(f);
}

static double now(void)
{
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

int main(int argc, char **argv)
{
    const char *work, *dir;
    size_t count, i;
    int repeats, r;
    FlatrayStack *stack;
    int32_t *status;
    double best = 1e300;
    if (argc != 5) {
        fprintf(stderr, "usage: scalar_loop WORKLOAD DIR COUNT REPEATS\n");
        return 2;
    }
    work = argv[1];
    dir = argv[2];
    count = (size_t)strtoull(argv[3], NULL, 10);
    repeats = atoi(argv[4]);
    stack = read_file(dir, "stack.bin", sizeof *stack);
    status = malloc(count * sizeof *status + 1);

    if (strcmp(work, "trace") == 0) {
        FlatrayRay *rays = read_file(dir, "a.bin", count * sizeof *rays);
        FlatrayRay *out = malloc(count * sizeof *out + 1);
        double *t = malloc(count * sizeof *t + 1);
        for (r = 0; r < repeats; r++) {
            double start = now(), took;
            for (i = 0; i < count; i++)
                status[i] = flatray_trace(stack, rays[i], &out[i], &t[i]);
            took = now() - start;
            best = took < best ? took : best;
        }
        write_file(dir, "out.bin", out, count * sizeof *out);
        write_file(dir, "transmittance.bin", t, count * sizeof *t);
        free(rays);
        free(out);
        free(t);
    } else if (strcmp(work, "los") == 0) {
        FlatrayVec3 *obs = read_file(dir, "a.bin", count * sizeof *obs);
        FlatrayVec3 *pts = read_file(dir, "b.bin", count * sizeof *pts);
        FlatrayPath *out = malloc(count * sizeof *out + 1);
        for (r = 0; r < repeats; r++) {
            double start = now(), took;
            for (i = 0; i < count; i++)
                status[i] = flatray_line_of_sight(stack, obs[i], pts[i], &out[i]);
            took = now() - start;
            best = took < best ? took : best;
        }
        write_file(dir, "out.bin", out, count * sizeof *out);
        free(obs);
        free(pts);
        free(out);
    } else {
        int truth = strcmp(work, "true_sagittal") == 0;
        int32_t image = strcmp(work, "apparent_tangential") == 0 ? FLATRAY_IMAGE_TANGENTIAL
                                                                 : FLATRAY_IMAGE_SAGITTAL;
        FlatrayVec3 *obs, *pts, *out;
        if (!truth && strcmp(work, "apparent_sagittal") != 0 &&
            strcmp(work, "apparent_tangential") != 0) {
            fprintf(stderr, "scalar_loop: unknown workload %s\n", work);
            return 2;
        }
        obs = read_file(dir, "a.bin", count * sizeof *obs);
        pts = read_file(dir, "b.bin", count * sizeof *pts);
        out = malloc(count * sizeof *out + 1);
        for (r = 0; r < repeats; r++) {
            double start = now(), took;
            if (truth)
                for (i = 0; i < count; i++)
                    status[i] = flatray_true_position(stack, obs[i], pts[i], image, &out[i]);
            else
                for (i = 0; i < count; i++)
                    status[i] = flatray_apparent_position(stack, obs[i], pts[i], image, &out[i]);
            took = now() - start;
            best = took < best ? took : best;
        }
        write_file(dir, "out.bin", out, count * sizeof *out);
        free(obs);
        free(pts);
        free(out);
    }
    write_file(dir, "status.bin", status, count * sizeof *status);
    printf("seconds %.9f\n", best);
    free(status);
    free(stack);
    return 0;
}
