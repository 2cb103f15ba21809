/*
 * example.c: using flatray from C (invented scenarios).
 *
 * 1. A camera 0.5 m above a pond looks at a pebble on the bottom: where does the
 *    pebble appear, and where is a pebble that appears at a given point?
 * 2. A camera in an underwater housing looks through a 10 mm flat glass port.
 * 3. A mistake (an object on the camera's side of the port), to show how errors
 *    are reported.
 *
 * Units: metres and radians; refractive indices are absolute.
 */

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "flatray.h"

static const double DEGREE = 3.14159265358979323846 / 180.0;

static FlatrayVec3 vec3(double x, double y, double z)
{
    FlatrayVec3 v;
    v.x = x;
    v.y = y;
    v.z = z;
    return v;
}

static void print_point(const char *label, FlatrayVec3 p)
{
    printf("  %-28s (%8.4f, %8.4f, %8.4f) m\n", label, p.x, p.y, p.z);
}

/* Print the status message and return 1 when a call failed. */
static int failed(const char *what, FlatrayStatus status)
{
    if (status == FLATRAY_OK)
        return 0;
    printf("  %s failed: %s (code %d)\n", what, flatray_status_message(status), (int)status);
    return 1;
}

static int pond(void)
{
    FlatrayStack surface;
    FlatrayVec3 camera = vec3(0.0, 0.0, 0.5);   /* 0.5 m above the water */
    FlatrayVec3 pebble = vec3(0.6, 0.2, -0.4);  /* 0.4 m deep, off to the side */
    FlatrayVec3 seen, back;
    FlatrayPath path;

    /* z points up and the surface is z = 0; the normal points from the camera's
       side into the water, i.e. down. No layers: air (1.000293) meets water (1.333). */
    memset(&surface, 0, sizeof surface);
    surface.origin = vec3(0.0, 0.0, 0.0);
    surface.normal = vec3(0.0, 0.0, -1.0);
    surface.n_observer = 1.000293;
    surface.layer_count = 0;
    surface.n_object = 1.333;

    printf("Pond: camera 0.5 m above the surface\n");
    print_point("pebble (true)", pebble);

    if (failed("line of sight", flatray_line_of_sight(&surface, camera, pebble, &path)))
        return 1;
    print_point("light enters the water at", path.entry);
    printf("  %-28s %.4f\n", "transmittance", path.transmittance);

    if (failed("apparent position",
               flatray_apparent_position(&surface, camera, pebble, FLATRAY_IMAGE_SAGITTAL, &seen)))
        return 1;
    print_point("pebble appears at", seen);

    /* The other way: the camera sees a pebble at `seen`; where is it really? */
    if (failed("true position",
               flatray_true_position(&surface, camera, seen, FLATRAY_IMAGE_SAGITTAL, &back)))
        return 1;
    print_point("true position recovered", back);
    return 0;
}

/* Air inside the housing, the port 30 mm in front of the camera (which looks
   along +z): 10 mm of glass (1.52), then sea water (1.34). */
static FlatrayStack housing_port(void)
{
    FlatrayStack port;
    memset(&port, 0, sizeof port);
    port.origin = vec3(0.0, 0.0, 0.03);
    port.normal = vec3(0.0, 0.0, 1.0);
    port.n_observer = 1.000293;
    port.layer_count = 1;
    port.thickness[0] = 0.010;
    port.n_layer[0] = 1.52;
    port.n_object = 1.34;
    return port;
}

static int housing(void)
{
    FlatrayStack port = housing_port();
    FlatrayVec3 camera = vec3(0.0, 0.0, 0.0);
    FlatrayVec3 fish = vec3(0.3, -0.1, 2.0);    /* 2 m away in the water */
    FlatrayVec3 seen_s, seen_t, measured, truth;
    double depth;

    printf("\nHousing: camera behind a 10 mm glass port\n");
    print_point("fish (true)", fish);
    if (failed("apparent position (sagittal)",
               flatray_apparent_position(&port, camera, fish, FLATRAY_IMAGE_SAGITTAL, &seen_s)) ||
        failed("apparent position (tangential)",
               flatray_apparent_position(&port, camera, fish, FLATRAY_IMAGE_TANGENTIAL, &seen_t)))
        return 1;
    print_point("appears at (sagittal)", seen_s);
    print_point("appears at (tangential)", seen_t);

    /* A point measured as if there were no port, e.g. by triangulation. */
    measured = vec3(-0.2, 0.15, 1.2);
    if (failed("true position",
               flatray_true_position(&port, camera, measured, FLATRAY_IMAGE_SAGITTAL, &truth)))
        return 1;
    print_point("measured (apparent)", measured);
    print_point("really at", truth);

    /* The scalar helper for one flat interface: 3 m of water seen at 20 degrees. */
    if (failed("apparent depth", flatray_apparent_depth(3.0, 20.0 * DEGREE, 1.000293, 1.34,
                                                        FLATRAY_IMAGE_SAGITTAL, &depth)))
        return 1;
    printf("  %-28s %.4f m\n", "3 m of water at 20 deg looks", depth);
    return 0;
}

static void mistake(void)
{
    FlatrayStack port = housing_port();
    FlatrayVec3 camera = vec3(0.0, 0.0, 0.0), seen;
    FlatrayVec3 behind_camera = vec3(0.0, 0.0, -1.0); /* not in the water at all */
    FlatrayStatus status;

    printf("\nA mistake: an object behind the camera\n");
    status = flatray_apparent_position(&port, camera, behind_camera, FLATRAY_IMAGE_SAGITTAL, &seen);
    /* On error the output is NaN, never garbage. */
    printf("  status %d: %s\n", (int)status, flatray_status_message(status));
    printf("  output x is %s\n", isnan(seen.x) ? "NaN" : "a number (unexpected)");
}

int main(void)
{
    printf("flatray %s\n\n", flatray_version());
    if (pond() != 0 || housing() != 0)
        return 1;
    mistake();
    return 0;
}
