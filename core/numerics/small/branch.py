"""One branch in plain floats: its head loss h(Q) and d ln h / d ln Q, and its flow at a head.

The equations are those of :mod:`branchwise.core.numerics.hydraulics` (Darcy–Weisbach with the
minor losses and the valve, the same friction models and regimes), for one branch at a time:

* one segment under Colebrook in turbulent flow — the valve folded into the fittings' K — is
  one equation in x = 1/√f (:mod:`.one`);
* series segments under Colebrook in turbulent flow: Newton on ln Q and every segment's x
  together (each x's step from its Colebrook equation given the step in ln Q);
* anything else (other models, laminar or transition flow): Newton on ln h against ln Q inside
  a bracket, as the vectorised solver does, from the same kind of start.

Either way the flow is accepted on the same test as the vectorised solver's,
|ln h(Q) − ln H| ≤ ``HEAD_RTOL``; when that is not reached the caller falls back.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

from ...model import Branch, Segment
from ..friction import RE_TURBULENT
from ..hydraulics import HEAD_RTOL, MAX_ITER
from . import friction as fr
from .one import NO_ONE, one_row, valve_resistance
from .series import NO_SERIES, SeriesConstants, series_constants, series_flow

LN10 = fr.LN10
TWO_LN10 = fr.TWO_LN10
_log = math.log
_exp = math.exp
_sqrt = math.sqrt
_log10 = math.log10
_NAN = math.nan


class Fallback(Exception):
    """This network (or this case of it) is left to the vectorised path."""


class Pipe:
    """One branch's constants (SI) and the state of its last evaluation.

    The constants' lists may be shared with other pipes of the same branch (:meth:`copy`):
    only a pipe that owns them (``owned``; a pipe built to be shared is made with
    ``owned=False``) changes them, by :meth:`set_segment`.

    After :meth:`evaluate` at |Q| = q: ``h`` (m), ``s`` = d ln h / d ln Q, and per segment
    ``re``, ``f``, ``fs`` (d ln f / d ln Re), ``major`` and ``minor`` (m, for the flow's
    magnitude)."""

    re: list[float]
    f: list[float]
    fs: list[float]
    major: list[float]
    minor: list[float]
    series: SeriesConstants

    __slots__ = ("d", "length", "rr", "a3", "k", "area", "c", "eps", "valve_r", "nu", "g",
                 "model", "n", "h", "s", "re", "f", "fs", "major", "minor", "q", "x", "xs",
                 "one_colebrook", "owned", "one", "series")

    def __init__(self, br: Branch, nu: float, g: float, model: str, owned: bool = True) -> None:
        # Written for speed (a network met anew in a direction other than the flows at a given
        # Δp builds one pipe a branch): every attribute set once, the lists made whole, the
        # state's too (as :meth:`_new_state`).
        segs = br.segments
        self.valve_r = valve_r = valve_resistance(br.valve_kv, g)
        self.nu, self.g, self.model = nu, g, model
        self.h = self.s = self.q = _NAN
        self.x = 0.0
        self.owned = owned
        if len(segs) == 1:
            s = segs[0]
            dj, length, eps, k, hw_c = s.diameter, s.length, s.roughness, s.minor_k, s.hw_c
            self.one = one = one_row(dj, length, eps, k, valve_r, nu, g)
            rr, a3, area = one[0], one[1], one[2]
            self.n = 1
            self.d, self.length, self.eps, self.k = [dj], [length], [eps], [k]
            self.rr, self.a3, self.area = [rr], [a3], [area]
            self.c = [hw_c if hw_c is not None else _NAN]
            self.series = NO_SERIES
            self.one_colebrook = model == "colebrook"
            self.xs = [0.0]
            self.re, self.f, self.fs = [_NAN], [_NAN], [_NAN]
            self.major, self.minor = [_NAN], [_NAN]
            return
        n = len(segs)
        self.n = n
        self.series, a3s, areas = series_constants(segs, valve_r, nu, g)
        ds: list[float] = []
        lengths: list[float] = []
        roughs: list[float] = []
        ks: list[float] = []
        rrs: list[float] = []
        cs: list[float] = []
        self.d, self.length, self.eps, self.k = ds, lengths, roughs, ks
        self.rr, self.a3, self.area, self.c = rrs, a3s, areas, cs
        for s in segs:
            ds.append(s.diameter)
            lengths.append(s.length)
            roughs.append(s.roughness)
            ks.append(s.minor_k)
            rrs.append(s.roughness / s.diameter)
            cs.append(s.hw_c if s.hw_c is not None else _NAN)
        self.one = NO_ONE
        self.one_colebrook = False
        self._new_state()

    def copy(self, own: bool = False) -> Pipe:
        """A pipe of the same branch with no state (as new): its constants' lists shared with
        this one, or copied with ``own`` (a pipe whose segment will be changed)."""
        new = Pipe.__new__(Pipe)
        if own:
            new.d, new.length, new.eps = list(self.d), list(self.length), list(self.eps)
            new.rr, new.a3, new.area = list(self.rr), list(self.a3), list(self.area)
        else:
            new.d, new.length, new.eps = self.d, self.length, self.eps
            new.rr, new.a3, new.area = self.rr, self.a3, self.area
        new.k, new.c, new.valve_r = self.k, self.c, self.valve_r
        new.nu, new.g, new.model, new.n = self.nu, self.g, self.model, self.n
        new.one_colebrook, new.owned, new.one = self.one_colebrook, own, self.one
        new.series = self.series
        new._new_state()
        return new

    def _new_state(self) -> None:
        """The state of a pipe never evaluated, in lists of its own."""
        n = self.n
        self.h = self.s = self.q = math.nan
        self.x = 0.0
        self.xs = [0.0] * n
        self.re, self.f, self.fs = [math.nan] * n, [math.nan] * n, [math.nan] * n
        self.major, self.minor = [math.nan] * n, [math.nan] * n

    @staticmethod
    def reset(pipes: Sequence[Pipe]) -> None:
        """Forget each pipe's last evaluation (pipes lent for another solve start as new):
        their lists are written over in place by every evaluation, not made anew."""
        nan = math.nan
        for p in pipes:
            p.h = p.s = p.q = nan
            p.x = 0.0
            xs = p.xs
            if p.n == 1:
                xs[0] = 0.0
            else:
                for j in range(p.n):
                    xs[j] = 0.0

    def set_segment(self, j: int, diameter: float, length: float, roughness: float) -> None:
        """Change segment ``j`` (m): an unknown being sought (on a pipe that owns its lists)."""
        if not self.owned:
            raise ValueError("a pipe that shares its constants cannot change them (copy(own=True))")
        self.d[j], self.length[j], self.eps[j] = diameter, length, roughness
        self.rr[j] = roughness / diameter
        self.a3[j] = self.rr[j] / 3.7
        self.area[j] = math.pi * diameter**2 / 4
        self._fold()

    def _fold(self) -> None:
        """The constants worked out again from the segments' numbers, once one has changed:
        a one-segment branch's row for :meth:`colebrook_one_flow`, or the series constants."""
        if self.n == 1:
            self.one = one_row(self.d[0], self.length[0], self.eps[0], self.k[0], self.valve_r,
                               self.nu, self.g)
            self.series = NO_SERIES
        else:
            self.one = NO_ONE
            segs = [Segment(d, length, eps, k)
                    for d, length, eps, k in zip(self.d, self.length, self.eps, self.k,
                                                 strict=True)]
            self.series = series_constants(segs, self.valve_r, self.nu, self.g)[0]

    def friction(self, j: int, re: float) -> tuple[float, float]:
        if self.model == "hazen-williams":
            return fr.hazen_williams(re, self.rr[j], self.d[j], self.c[j], self.nu, self.g)
        return fr.darcy(re, self.rr[j], self.model)

    def evaluate(self, q: float) -> float:
        """h at |Q| = q > 0 (m); fills the state."""
        two_g = 2 * self.g
        colebrook = self.model == "colebrook"
        nu = self.nu
        area, dia, length, k, xs, a3 = self.area, self.d, self.length, self.k, self.xs, self.a3
        re_l, f_l, fs_l, ma_l, mi_l = self.re, self.f, self.fs, self.major, self.minor
        h = dh = 0.0
        for j in range(self.n):
            d = dia[j]
            v = q / area[j]
            re = v * d / nu
            if colebrook and re >= RE_TURBULENT:
                # Colebrook's f and d ln f / d ln Re, Newton started from this segment's last
                # root (a nearby flow's) and run until the next step would be below round-off.
                x = xs[j]
                a = a3[j]
                c = 2.51 / re
                if x > 0:
                    for _ in range(50):
                        arg = a + c * x
                        step = (x + 2.0 * _log10(arg)) / (1.0 + 2.0 * c / (LN10 * arg))
                        x -= step
                        if abs(step) <= 1e-8 * x:  # the next step would be below round-off
                            break
                else:
                    x = fr.colebrook_x(re, self.rr[j])
                xs[j] = x
                arg = a + c * x
                f = x**-2.0
                fs = -4.0 * c / (LN10 * arg) / (1.0 + 2.0 * c / (LN10 * arg))
            else:
                f, fs = self.friction(j, re)
            vel_head = v * v / two_g
            major = f * length[j] / d * vel_head
            minor = k[j] * vel_head
            h += major + minor
            dh += major * (2 + fs) + 2 * minor
            re_l[j], f_l[j], fs_l[j], ma_l[j], mi_l[j] = re, f, fs, major, minor
        return self.with_valve(q, h, dh)

    def with_valve(self, q: float, h: float, dh: float) -> float:
        """The state's last step: the valve's loss added to the segments' h and to their
        d h / d ln Q (``dh``), and the flow, head and slope kept; returns h (m)."""
        valve = self.valve_r * q * q
        h += valve
        dh += 2 * valve
        self.q, self.h = q, h
        self.s = dh / h if h != 0 else 2.0
        return h

    # ---- the flow at a head ------------------------------------------------------------------

    def flow_at(self, head: float, guess: float = 0.0) -> int:
        """Set the state to the flow at driving head ``head`` > 0 (m); returns the iterations.
        ``guess``: a starting |Q| (m³/s), 0 for none. Raises :class:`Fallback` when the test
        of the vectorised solver is not met."""
        if self.one_colebrook:
            it = self.colebrook_one_flow(head)
            if it:
                return it
        elif guess <= 0 and self.model == "colebrook":
            self.q = math.nan
            it = self.colebrook_series_flow(head)
            if it:
                return it
            guess = self.q if self.q > 0 and math.isfinite(self.q) else 0.0  # where it got
        return self._newton(head, guess)

    def colebrook_one_flow(self, head: float) -> int:
        """A one-segment branch under Colebrook, its valve and fittings folded in, as one
        equation in x = 1/√f (:mod:`.one`): the state at the flow at ``head`` > 0 (m), from
        the last root; 0 when the flow is not turbulent or the test is not met (the general
        solver takes it). :mod:`.at_head` writes the same steps out in its loop."""
        _, a, area, ld, ke, c0, minor_k, valve_r, d = self.one
        c0 = c0 / _sqrt(head)
        it = 1
        if ke == 0:
            x = -2.0 * _log10(a + c0 * _sqrt(ld))
        else:
            # One fixed-point pass from the last root (or from f = 0.02: x ≈ 7), then Newton
            # on g(x) = x + 2 log10(a + C R), R = √(L/D + K x²). Its error after a step s is
            # about |g''|/(2 g') s², and |g''|/(2 g') ≤ K/(ln 10 R²) (g' ≥ 1; R''s terms
            # bounded by K/R²): taken at 0.9 x, the next step would be below round-off once
            # that bound times s² is below 1e-16 x.
            x = self.x if self.x > 0 else 7.0
            x = -2.0 * _log10(a + c0 * _sqrt(ld + ke * x * x))
            kc = TWO_LN10 * c0 * ke
            curve = ke / (LN10 * (ld + 0.81 * ke * x * x))
            for it in range(1, 40):  # noqa: B007 (the count is reported)
                root = _sqrt(ld + ke * x * x)
                arg = a + c0 * root
                step = (x + TWO_LN10 * _log(arg)) / (1.0 + kc * x / (arg * root))
                x -= step
                if curve * step * step <= 1e-16 * x:
                    break
        f = 1.0 / (x * x)
        vel_head = head / (ld * f + ke)  # V²/2g
        speed = _sqrt(2 * self.g * vel_head)
        re = speed * d / self.nu
        if not (re >= RE_TURBULENT and x > 0):
            return 0
        self.x = x
        q = speed * area
        c = 2.51 / re  # d ln f / d ln Re at the root, as friction.colebrook_slopes
        t = TWO_LN10 * c / (a + c * x)
        fs = -2.0 * t / (1.0 + t)
        major = f * ld * vel_head
        minor = minor_k * vel_head
        valve = valve_r * q * q
        h = major + minor + valve
        if not abs(h - head) <= HEAD_RTOL * head:  # |ln h − ln H| ≤ HEAD_RTOL, to first order
            return 0
        self.re[0], self.f[0], self.fs[0], self.major[0], self.minor[0] = re, f, fs, major, minor
        self.q, self.h = q, h
        self.s = (major * (2 + fs) + 2 * minor + 2 * valve) / h
        return it

    def colebrook_series_flow(self, head: float) -> int:
        """Series segments under Colebrook in turbulent flow, solved together
        (:func:`.series.joint_newton`), then tested as :meth:`_newton` tests a flow; 0 when
        a segment is not in turbulent flow or the test is not met (the caller goes on from
        the flow reached, if any)."""
        it, q, h, s = series_flow(head, self.series, self.a3, self.xs,
                                  (self.re, self.f, self.fs, self.major, self.minor),
                                  self.valve_r)
        if q == q:  # reached (not NaN)
            self.q, self.h, self.s = q, h, s
        return it

    def _start(self, head: float) -> float:
        """Two fixed-point passes from f = 0.02, as the vectorised solver starts."""
        g, n, nu = self.g, self.n, self.nu
        area, d, length, k, a3 = self.area, self.d, self.length, self.k, self.a3
        f = [0.02] * n
        q = math.nan
        for last in (False, True):
            r = 0.0
            for j in range(n):
                a = area[j]
                r += (f[j] * length[j] / d[j] + k[j]) / (2 * g * a * a)
            r += self.valve_r
            q = _sqrt(head / r)
            if last:
                break
            for j in range(n):
                # max(64/Re, Swamee–Jain's f at max(Re, 1)) with Re ≥ 1e-300, written out (the
                # slope unused; each max as the builtin's: the first unless the other is more)
                re = q / area[j] * d[j] / nu
                re = 1e-300 if 1e-300 > re else re
                laminar = 64 / re
                lg = _log10(a3[j] + 5.74 * (1.0 if 1.0 > re else re)**-0.9)
                turbulent = 0.25 / lg**2
                f[j] = turbulent if turbulent > laminar else laminar
        return q if math.isfinite(q) and q > 0 else 1e-6

    def _newton(self, head: float, guess: float) -> int:
        """Safeguarded Newton on ln h against ln Q (the vectorised ``flows_at_head``)."""
        x = _log(guess if guess > 0 and math.isfinite(guess) else self._start(head))
        ln_t = _log(head)
        inf = math.inf
        lo, hi = -inf, inf
        eps4 = 4 * 2.220446049250313e-16
        evaluate = self.evaluate
        for it in range(1, MAX_ITER + 1):
            h = evaluate(_exp(x))
            resid = _log(h) - ln_t if h > 0 else -inf
            if abs(resid) <= HEAD_RTOL:
                return it
            if resid < 0:
                lo = x
            elif resid > 0:
                hi = x
            s = self.s
            step = resid / (s if s > 0 else 1.0)
            step = -8.0 if -8.0 > step else (8.0 if step > 8.0 else step)  # min(max(…, −8), 8)
            trial = x - step
            if lo < trial < hi:
                x = trial
            elif math.isfinite(lo) and math.isfinite(hi):
                x = 0.5 * (lo + hi)
            else:
                x = hi - 8 if math.isfinite(hi) else lo + 8
            span = hi - lo
            if span != inf and span <= eps4 * max(1.0, abs(x)):  # inf: one end still open
                break
        raise Fallback("no flow to the vectorised test")

