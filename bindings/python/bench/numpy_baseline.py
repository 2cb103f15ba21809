"""The NumPy baseline of the speed comparison: flatray's batch work written as a
survey script would write it without flatray, fully vectorised over (N, 3)
arrays (no Python loop over points).

The formulas are the ones flatray documents (README "Geometry and units", the
Rust docs of ``path`` and ``image``):

* Snell's law through a flat stack with the ray parameter ``p = n sin θ``,
  constant in every medium: relative to the observer's index ``n0``, medium k
  has ``q_k = n_k cos θ_k / n0 = √(η_k² − sin² θ0)``, ``η_k = n_k / n0``,
  computed as ``(η_k − 1)(η_k + 1) + cos² θ0`` when ``η_k ≥ 1`` (no
  cancellation at grazing angles); the lateral step through a layer of
  thickness ``h`` is ``h tan θ_k = h sin θ0 / q_k``.
* Fresnel power transmittances from the projections ``a ∝ n_i cos θ_i``,
  ``b ∝ n_t cos θ_t`` (Hecht, *Optics*, eqs. 4.42–4.45 squared):
  ``Ts = 4ab/(a + b)²``, ``Tp = 4xy/(x + y)²`` with ``x = η² a``, ``y = b``;
  unpolarised ``(Π Ts + Π Tp)/2``.
* Sagittal image depth ``Σ h_k (n0 cos θ0)/(n_k cos θ_k)``, tangential
  ``Σ h_k (n0/n_k)(cos θ0/cos θ_k)³``.
* Line of sight (Fermat): with ``u = tan θ`` in the lowest-index medium and
  ``ν_k = n_k / n_min``, ``D_k = √(ν_k² + (ν_k² − 1) u²)``, the lateral offset
  ``F(u) = u Σ h_k / D_k`` is increasing and concave, so Newton's method from
  ``u = 0`` climbs monotonically to ``F(u) = lateral distance``. All points
  iterate together; converged points drop out of the working set (masked
  Newton), to the same relative tolerance as flatray (1e-14 of the geometry's
  size).

Points that fail (wrong side, total internal reflection) come out as NaN rows.
The stack is a :class:`flatray.Stack` (only its numbers are read).
"""

from __future__ import annotations

import numpy as np

#: Relative tolerance of the line-of-sight solve (flatray's default).
RELATIVE_TOLERANCE = 1e-14
#: Most Newton steps (flatray's default).
MAX_ITERATIONS = 200


def _geometry(stack):
    n = np.asarray(stack.normal, dtype=np.float64)
    n = n / np.sqrt(n @ n)
    origin = np.asarray(stack.origin, dtype=np.float64)
    return n, float(origin @ n)


def _dot3(a, b):
    """Row-wise dot product of two (N, 3) arrays."""
    return np.einsum("ij,ij->i", a, b)


def _projection(eta, cos0, sin2):
    """q = n cos θ / n0 in a medium of relative index ``eta``; NaN beyond the
    critical angle (or grazing, q = 0)."""
    q2 = (eta - 1.0) * (eta + 1.0) + cos0 * cos0 if eta >= 1.0 else eta * eta - sin2
    q2 = np.where(q2 > 0.0, q2, np.nan)
    return np.sqrt(q2)


def _transmittances(eta, a, b):
    """(Ts, Tp) for projections a (incident side) and b, index ratio eta."""
    s = 1.0 / (a + b)
    ts = np.minimum(4.0 * (a * s) * (b * s), 1.0)
    x = (eta * eta) * a
    s = 1.0 / (x + b)
    tp = np.minimum(4.0 * (x * s) * (b * s), 1.0)
    return ts, tp


def trace(stack, origins, directions):
    """Trace N observer rays through the stack.

    Returns ``(origins, directions, transmittance)`` in the object's medium:
    (N, 3), (N, 3), (N,).
    """
    n, c = _geometry(stack)
    o = np.asarray(origins, dtype=np.float64)
    d = np.asarray(directions, dtype=np.float64)
    d = d / np.sqrt(_dot3(d, d))[:, None]
    cos0 = d @ n
    h0 = o @ n - c
    ok = (cos0 > 0.0) & (h0 <= 0.0)
    t = d - cos0[:, None] * n
    t -= (t @ n)[:, None] * n  # rounding residue along the normal
    sin2 = _dot3(t, t)
    n0 = stack.n_observer
    lateral = np.zeros(len(d))
    prod_ts = np.ones(len(d))
    prod_tp = np.ones(len(d))
    prev_eta, prev_q = 1.0, cos0
    for h, index in stack.layers:
        eta = index / n0
        q = _projection(eta, cos0, sin2)
        ts, tp = _transmittances(eta / prev_eta, prev_q, q)
        prod_ts *= ts
        prod_tp *= tp
        lateral += h / q
        prev_eta, prev_q = eta, q
    eta_x = stack.n_object / n0
    q_x = _projection(eta_x, cos0, sin2)
    ts, tp = _transmittances(eta_x / prev_eta, prev_q, q_x)
    prod_ts *= ts
    prod_tp *= tp
    total = stack.total_thickness
    exit_ = o + d * (-h0 / cos0)[:, None] + t * lateral[:, None] + n * total
    out_d = t + q_x[:, None] * n
    out_d /= np.sqrt(_dot3(out_d, out_d))[:, None]
    transmittance = 0.5 * (prod_ts + prod_tp)
    bad = ~ok | np.isnan(q_x)
    exit_[bad] = np.nan
    out_d[bad] = np.nan
    transmittance[bad] = np.nan
    return exit_, out_d, transmittance


def true_positions_sagittal(stack, observers, apparent):
    """Sagittal true positions (closed form): the line of sight through each
    apparent point fixes the ray parameter; the depth below the last interface
    is ``(z_a − Σ_layers t_i f_i) / f_object`` with ``f_k = cos θ0 / q_k``, and
    the true point lies on the normal through the apparent point."""
    n, c = _geometry(stack)
    obs = np.asarray(observers, dtype=np.float64)
    a = np.asarray(apparent, dtype=np.float64)
    d = a - obs
    d /= np.sqrt(_dot3(d, d))[:, None]
    cos0 = d @ n
    t = d - cos0[:, None] * n
    sin2 = _dot3(t, t)
    z_a = a @ n - c
    ok = (obs @ n - c <= 0.0) & (z_a >= 0.0) & (cos0 > 0.0)
    n0 = stack.n_observer
    layer_depth = np.zeros(len(a))
    for h, index in stack.layers:
        layer_depth += h * (cos0 / _projection(index / n0, cos0, sin2))
    q_x = _projection(stack.n_object / n0, cos0, sin2)
    remaining = z_a - layer_depth
    ok &= remaining >= 0.0
    depth_x = remaining * (q_x / cos0)
    truth = a + (stack.total_thickness + depth_x - z_a)[:, None] * n
    truth[~ok | np.isnan(q_x)] = np.nan
    return truth


class _Solved:
    """Lines of sight solved for N point pairs (see :func:`solve`)."""

    def __init__(self, **fields):
        self.__dict__.update(fields)


def solve(stack, observers, objects):
    """Solve N lines of sight by masked Newton in ``u = tan θ_min``."""
    n, c = _geometry(stack)
    obs = np.asarray(observers, dtype=np.float64)
    obj = np.asarray(objects, dtype=np.float64)
    count = len(obj)
    obs = np.broadcast_to(obs, (count, 3)) if obs.shape[0] == 1 else obs
    total = stack.total_thickness
    h_obs = c - obs @ n  # distance from observer to the first interface
    h_obj = obj @ n - c - total  # depth below the last interface
    ok = (h_obs >= 0.0) & (h_obj >= 0.0)
    delta = obj - obs
    lateral = delta - (delta @ n)[:, None] * n
    target = np.sqrt(_dot3(lateral, lateral))
    with np.errstate(invalid="ignore", divide="ignore"):
        e = np.where((target > 0.0)[:, None], lateral / target[:, None], 0.0)

    indices = [stack.n_observer] + [k for _, k in stack.layers] + [stack.n_object]
    n_min = min(indices)
    nu = [k / n_min for k in indices]
    b = [(v - 1.0) * (v + 1.0) for v in nu]
    layer_h = [h for h, _ in stack.layers]
    tol = RELATIVE_TOLERANCE * (target + h_obs + h_obj + total)

    # Newton on the points still moving; h of the observer's and object's media
    # vary per point, the layers' are constants. F(u) = u Σ h_k / D_k and
    # F'(u) = Σ h_k ν_k² / D_k³; the first step from u = 0 (F'(0) = Σ h_k / ν_k)
    # is the paraxial guess, taken directly.
    u = np.zeros(count)
    idx = np.flatnonzero(ok & (target > tol))
    h0a, hxa, ta, tola = h_obs[idx], h_obj[idx], target[idx], tol[idx]
    paraxial = h0a / nu[0] + sum(h / v for h, v in zip(layer_h, nu[1:-1])) + hxa / nu[-1]
    ua = ta / paraxial
    last = len(nu) - 1
    for _ in range(MAX_ITERATIONS):
        if idx.size == 0:
            break
        u2 = ua * ua
        f = np.zeros_like(ua)
        df = np.zeros_like(ua)
        for k, (nu_k, b_k) in enumerate(zip(nu, b)):
            h_k = h0a if k == 0 else (hxa if k == last else layer_h[k - 1])
            if b_k == 0.0:  # the lowest-index medium: D = 1
                f += h_k
                df += h_k
                continue
            a_k = nu_k * nu_k
            d_k = u2 * b_k
            d_k += a_k
            np.sqrt(d_k, out=d_k)
            inv = h_k / d_k  # h_k / D_k
            f += inv
            d_k *= d_k
            np.divide(a_k, d_k, out=d_k)
            d_k *= inv  # h_k ν_k² / D_k³
            df += d_k
        f *= ua
        residual = np.subtract(ta, f, out=f)
        moving = residual > tola
        residual /= df
        residual[~moving] = 0.0
        ua += residual
        if not moving.all():
            u[idx] = ua
            keep = np.flatnonzero(moving)
            idx, ua, h0a, hxa, ta, tola = (idx[keep], ua[keep], h0a[keep], hxa[keep],
                                           ta[keep], tola[keep])
    else:
        ok[idx] = False  # not converged
    u[idx] = ua

    u2 = u * u
    d = [np.sqrt(nu_k * nu_k + b_k * u2) if b_k != 0.0 else np.ones(count)
         for nu_k, b_k in zip(nu, b)]
    h = [h_obs] + layer_h + [h_obj]
    tan0 = u / d[0]
    step0 = e * tan0[:, None] + n  # per unit of height in the observer's medium
    entry = obs + step0 * h_obs[:, None]
    return _Solved(ok=ok, n=n, c=c, e=e, u=u, d=d, h=h, indices=indices, entry=entry,
                   step0=step0, obj=obj)


def apparent_positions(stack, observers, objects, image="sagittal"):
    """Apparent positions (sagittal or tangential image) of N object points."""
    s = solve(stack, observers, objects)
    n0 = s.indices[0]
    depth = np.zeros(len(s.u))
    for h_k, n_k, d_k in zip(s.h[1:], s.indices[1:], s.d[1:]):
        r = s.d[0] / d_k
        depth += h_k * (r if image == "sagittal" else r * r * r * (n_k / n0) ** 2)
    if image == "sagittal":
        out = s.obj + (depth - (s.obj @ s.n - s.c))[:, None] * s.n
    else:
        out = s.entry + s.step0 * depth[:, None]
    out[~s.ok] = np.nan
    return out


def lines_of_sight(stack, observers, objects):
    """Lines of sight: ``(direction, entry, exit, geometric_length,
    optical_length, transmittance)`` as (N, 3), (N, 3), (N, 3), (N,), (N,), (N,)."""
    s = solve(stack, observers, objects)
    count = len(s.u)
    direction = s.e * s.u[:, None] + s.d[0][:, None] * s.n
    direction /= np.sqrt(_dot3(direction, direction))[:, None]
    exit_ = s.entry.copy()
    geometric = np.zeros(count)
    optical = np.zeros(count)
    prod_ts = np.ones(count)
    prod_tp = np.ones(count)
    last = len(s.h) - 1
    for k, (h_k, n_k, d_k) in enumerate(zip(s.h, s.indices, s.d)):
        tan_k = s.u / d_k
        seg = h_k * np.sqrt(1.0 + tan_k * tan_k)
        geometric += seg
        optical += n_k * seg
        if k > 0:
            ts, tp = _transmittances(n_k / s.indices[k - 1], s.d[k - 1], d_k)
            prod_ts *= ts
            prod_tp *= tp
        if 0 < k < last:
            exit_ += s.e * (tan_k * h_k)[:, None] + s.n * h_k
    transmittance = 0.5 * (prod_ts + prod_tp)
    for a in (direction, s.entry, exit_, geometric, optical, transmittance):
        a[~s.ok] = np.nan
    return direction, s.entry, exit_, geometric, optical, transmittance
