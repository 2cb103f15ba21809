"""Reference apparent depths through one flat interface, at 40 significant digits.

Independent of flatray: the crossing point of the light path is found with
mpmath.findroot on Snell's law (n1 sin t1 = n2 sin t2) for an eye at height h
above the surface and an object at lateral offset x and depth d; the sagittal
depth is where the straight line from the eye through the crossing point meets
the vertical through the object, and the tangential depth is the caustic
-1/(dT/dc), T(c) the tangent of the air ray that crossed at c, by mpmath.diff.

Run:  python3 -m pip install mpmath && python3 tests/data/single_interface_images.py
Output columns: h_m, x_m, d_m, sagittal_depth_m, tangential_depth_m
(used by tests/reference_images.rs).
"""
from mpmath import mp, mpf, sqrt, findroot, diff

mp.dps = 40
N1 = mpf("1.00029")
N2 = mpf("1.333")
CASES = [("2", "1", "1.5"), ("10", "30", "4"), ("0.3", "5", "0.2")]

for hs, xs_, ds in CASES:
    h, x, d = mpf(hs), mpf(xs_), mpf(ds)

    def snell(c):
        return N1 * c / sqrt(c * c + h * h) - N2 * (x - c) / sqrt((x - c) ** 2 + d * d)

    c0 = findroot(snell, (x * mpf("0.5"), x * mpf("0.99")), solver="anderson")

    def tan_air(c):
        s2 = (x - c) / sqrt((x - c) ** 2 + d * d)
        s1 = N2 * s2 / N1
        return s1 / sqrt(1 - s1 * s1)

    sagittal = -(h * (1 - x / c0))
    tangential = -1 / diff(tan_air, c0)
    print(f"{hs}, {xs_}, {ds}, {mp.nstr(sagittal, 25)}, {mp.nstr(tangential, 25)}")
