"""The camera functions through the Python binding: round trips over whole
images, batches against single calls, remap tables against the forward
projection, the remap error's growth, field of view and magnification
(Snell's law), the camera view summary and stereo triangulation.

Cameras and housings are invented; indices are typical values from memory.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import flatray
from flatray import Lens, Status

N_AIR, N_GLASS, N_SEA = 1.00028, 1.52, 1.339
W, H = 1280, 720


def straight_port(n_air=N_AIR):
    return flatray.Stack((0.0, 0.0, 0.03), (0.0, 0.0, 1.0), n_air, [(0.008, N_GLASS)], N_SEA)


def tilted_port():
    return flatray.Stack((0.012, -0.007, 0.045), (0.11, -0.06, 1.0), N_AIR,
                         [(0.012, N_GLASS), (0.0015, 1.49)], N_SEA)


LENS = Lens(1100.0, 1102.0, 641.3, 357.9, k1=-0.08, k2=0.015, p1=2e-4, p2=-1e-4)
STRONG = Lens(780.0, 780.0, 639.5, 359.5, k1=-0.31, k2=0.095, k3=-0.012, p1=9e-4, p2=-7e-4)
CAMERAS = {
    "straight, mild": (LENS, straight_port()),
    "tilted, mild": (LENS, tilted_port()),
    "straight, strong": (STRONG, straight_port()),
    "tilted, strong": (STRONG, tilted_port()),
}


def image_grid(nu=21, nv=13):
    u, v = np.meshgrid(np.linspace(-0.5, W - 0.5, nu), np.linspace(-0.5, H - 0.5, nv))
    return np.column_stack([u.ravel(), v.ravel()])


@pytest.mark.parametrize("name", sorted(CAMERAS))
def test_round_trips_over_the_whole_image(name):
    lens, port = CAMERAS[name]
    uv = image_grid()
    origins, directions, status = flatray.pixels_to_rays(lens, port, uv, raise_on_error=True)
    assert (status == Status.OK).all()
    for s in (1e-3, 0.4, 2.0, 15.0, 200.0):
        back, st = flatray.points_to_pixels(lens, port, origins + s * directions,
                                            raise_on_error=True)
        # Issue requirement: 1e-6 px (the library's own budget is ~1e-9 px).
        np.testing.assert_allclose(back, uv, rtol=0, atol=1e-6)


def test_batches_equal_single_calls():
    lens, port = CAMERAS["tilted, strong"]
    uv = image_grid(7, 5)
    origins, directions, status = flatray.pixels_to_rays(lens, port, uv)
    for k, (u, v) in enumerate(uv):
        o, d = flatray.pixel_to_ray(lens, port, u, v)
        assert np.array_equal(o, origins[k]) and np.array_equal(d, directions[k])
    pts = origins + 1.5 * directions
    got, _ = flatray.points_to_pixels(lens, port, pts)
    for k, p in enumerate(pts):
        assert flatray.point_to_pixel(lens, port, p) == tuple(got[k])


def _target_for(lens, port, scale=1.0):
    view = flatray.camera_view(lens, port, W, H)
    return Lens(view.focal_x_water * scale, view.focal_y_water * scale, lens.cx * scale,
                lens.cy * scale)


def _target_points(target, width, height, distance):
    i, j = np.meshgrid(np.arange(width, dtype=float), np.arange(height, dtype=float))
    d = np.stack([(i - target.cx) / target.fx, (j - target.cy) / target.fy,
                  np.ones_like(i)], axis=-1)
    return distance * d / np.linalg.norm(d, axis=-1, keepdims=True)


@pytest.mark.parametrize("name", sorted(CAMERAS))
@pytest.mark.parametrize("distance", [0.3, 2.0, 25.0])
def test_remap_table_maps_points_at_its_distance(name, distance):
    lens, port = CAMERAS[name]
    target = _target_for(lens, port, 0.125)
    w, h = 160, 90
    mu, mv = flatray.remap_table(lens, port, target, distance, w, h)
    assert mu.shape == (h, w) and mu.dtype == np.float32
    pts = _target_points(target, w, h, distance).reshape(-1, 3)
    exact, status = flatray.points_to_pixels(lens, port, pts)
    ok = status == Status.OK
    table = np.column_stack([mu.ravel(), mv.ravel()]).astype(float)
    assert np.isnan(table[~ok]).all()
    # Issue requirement: 1e-3 px; float32 entries round to ~6e-5 px here.
    assert np.abs(table[ok] - exact[ok]).max() < 1e-3
    # Filling caller buffers gives the same table.
    bu, bv = np.zeros((h, w), np.float32), np.zeros((h, w), np.float32)
    flatray.remap_table(lens, port, target, distance, w, h, out=(bu, bv))
    np.testing.assert_array_equal(bu, mu)
    np.testing.assert_array_equal(bv, mv)


def test_remap_error_grows_away_from_the_table_distance():
    # A flat-port camera has no single viewpoint (Agrawal et al., CVPR 2012,
    # section 3): a table is exact at its distance only.
    lens, port = CAMERAS["tilted, mild"]
    target = _target_for(lens, port, 0.125)
    at = {d: flatray.remap_error(lens, port, target, 2.0, d, 160, 90)
          for d in (0.25, 0.5, 1.0, 2.0, 4.0, 8.0, 1000.0)}
    assert at[2.0] == (0.0, 0.0)
    assert at[1.0].rms_px < at[0.5].rms_px < at[0.25].rms_px
    assert at[4.0].rms_px < at[8.0].rms_px < at[1000.0].rms_px
    for r in at.values():
        assert r.max_px >= r.rms_px >= 0.0
    # The error is what the table gets wrong: compare with the table itself.
    mu2, mv2 = flatray.remap_table(lens, port, target, 2.0, 160, 90)
    mu8, mv8 = flatray.remap_table(lens, port, target, 8.0, 160, 90)
    diff = np.hypot(mu2.astype(float) - mu8, mv2.astype(float) - mv8)
    assert np.nanmax(diff) == pytest.approx(at[8.0].max_px, abs=2e-4)  # float32 entries


def test_field_of_view_and_magnification_follow_snell():
    # Pinhole, principal point at the image centre, perpendicular port: each
    # half-angle obeys n_air sin(a) = n_water sin(w) (Snell's law); near the axis
    # angles shrink by n_air / n_water, so the in-water focal length is
    # f n_water / n_air (common practice: about 1.33x, about 25 % narrower).
    lens = Lens(900.0, 900.0, (W - 1) / 2, (H - 1) / 2)
    port = straight_port()
    view = flatray.camera_view(lens, port, W, H)
    for air, water in ((view.horizontal_air, view.horizontal),
                       (view.vertical_air, view.vertical),
                       (view.diagonal_air, view.diagonal)):
        assert water == pytest.approx(2 * math.asin(N_AIR * math.sin(air / 2) / N_SEA),
                                      abs=1e-13)
    assert view.horizontal_air == pytest.approx(2 * math.atan(W / 2 / 900.0), abs=1e-14)
    assert (view.horizontal, view.vertical) == flatray.field_of_view(lens, port, W, H)
    assert view.focal_x_water / 900.0 == pytest.approx(N_SEA / N_AIR, rel=1e-9)
    assert view.focal_y_water / 900.0 == pytest.approx(N_SEA / N_AIR, rel=1e-9)
    assert 0.2 < 1 - view.horizontal / view.horizontal_air < 0.3
    assert view.tir_radius_px is None
    h_deg, v_deg = flatray.field_of_view_deg(lens, port, W, H)
    assert h_deg == pytest.approx(math.degrees(view.horizontal), rel=1e-15)


def test_total_internal_reflection_radius():
    # A water-filled housing looking into air: rays beyond asin(1/1.333) from
    # the normal cannot leave (Snell's law); for a pinhole behind a
    # perpendicular port the boundary is the circle of radius f tan(theta_c).
    port = flatray.Stack((0, 0, 0.02), (0, 0, 1), 1.333, [(0.01, N_GLASS)], 1.0)
    lens = Lens(900.0, 900.0, 640.0, 360.0)
    view = flatray.camera_view(lens, port, W, H)
    r = 900.0 * math.tan(math.asin(1 / 1.333))
    assert view.tir_radius_px == pytest.approx(r, abs=1e-9)
    flatray.pixel_to_ray(lens, port, 640.0 + r - 0.01, 360.0)
    with pytest.raises(flatray.TotalInternalReflectionError):
        flatray.pixel_to_ray(lens, port, 640.0 + r + 0.01, 360.0)
    # A wider lens (f = 500 px: TIR radius 567 px) puts the image's side edges
    # beyond the critical angle: no field of view.
    with pytest.raises(flatray.TotalInternalReflectionError):
        flatray.field_of_view(Lens(500.0, 500.0, 640.0, 360.0), port, W, H)


def _rot_y(deg):
    t = math.radians(deg)
    return np.array([[math.cos(t), 0, math.sin(t)], [0, 1, 0], [-math.sin(t), 0, math.cos(t)]])


def test_stereo_triangulation():
    lens_a, port_a = CAMERAS["straight, mild"]
    lens_b, port_b = CAMERAS["tilted, strong"]
    rot, t = _rot_y(-6.0), np.array([0.3, 0.0, 0.0])  # x_a = R x_b + t
    for p in ([0.1, 0.05, 1.0], [-0.4, 0.3, 3.0], [0.2, -0.1, 8.0]):
        p = np.array(p)
        uv_a = flatray.point_to_pixel(lens_a, port_a, p)
        uv_b = flatray.point_to_pixel(lens_b, port_b, rot.T @ (p - t))
        hit = flatray.stereo_triangulate(lens_a, port_a, lens_b, port_b, rot, t, uv_a, uv_b)
        # Round-trip accuracy (1e-10 m) times the range/baseline conditioning.
        np.testing.assert_allclose(hit.point, p, rtol=0, atol=1e-8)
        assert hit.rms_miss < 1e-9
        noisy = flatray.stereo_triangulate(lens_a, port_a, lens_b, port_b, rot, t, uv_a,
                                           (uv_b[0] + 0.5, uv_b[1]))
        assert noisy.rms_miss > 1e-6


def test_stereo_failures():
    lens, port = CAMERAS["straight, mild"]
    with pytest.raises(flatray.DegenerateError):
        flatray.stereo_triangulate(lens, port, lens, port, np.eye(3), (0.2, 0, 0),
                                   (600, 300), (600, 300))
    with pytest.raises(flatray.WrongSideError):
        flatray.stereo_triangulate(lens, port, lens, port, np.eye(3), (0.2, 0, 0),
                                   (500, 360), (900, 360))
    with pytest.raises(flatray.InvalidArgumentError):
        flatray.stereo_triangulate(lens, port, lens, port, 1.1 * np.eye(3), (0.2, 0, 0),
                                   (600, 300), (500, 300))
    with pytest.raises(ValueError, match="rotation"):
        flatray.stereo_triangulate(lens, port, lens, port, np.eye(2), (0.2, 0, 0),
                                   (600, 300), (500, 300))
