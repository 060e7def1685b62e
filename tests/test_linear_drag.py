"""The vector integrator checked on linear (Stokes) drag, whose axes separate exactly.

With acceleration -g e_z - b (v - U e_x) the three axes are independent linear ODEs
[derived; [TVDW-1999] "Linear drag ... separates exactly into independent axes"]:
    x(t) = U t + (u0 - U) tau (1 - exp(-t/tau)),  tau = 1/b,
    z(t) = H - v_t t + (w0 + v_t) tau (1 - exp(-t/tau)),  v_t = g tau.
The landing time solves z(t) = 0, found here with scipy.optimize.brentq (independent of the
engine's Hermite root finder).
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.optimize import brentq

from dropcalc.physics.trajectory import WindField, solve_falls

G = 9.80665


def exact(height: float, b: float, wind: float, u0: float, v0: float, w0: float):
    tau = 1.0 / b
    vt = G * tau

    def z(t: float) -> float:
        return height - vt * t + (w0 + vt) * tau * (1.0 - np.exp(-t / tau))

    t_land = brentq(z, 1e-12, 1e4, xtol=1e-14, rtol=1e-15)
    decay = np.exp(-t_land / tau)
    x = wind * t_land + (u0 - wind) * tau * (1.0 - decay)
    y = v0 * tau * (1.0 - decay)
    vx = wind + (u0 - wind) * decay
    vz = -vt + (w0 + vt) * decay
    return t_land, x, y, vx, vz


# b spans slow relaxation (explicit method) to fast relaxation (the stiff, implicit method).
@pytest.mark.parametrize("b", [0.05, 0.5, 2.0, 20.0, 200.0])
@pytest.mark.parametrize(("u0", "v0", "w0"), [(0.0, 0.0, 0.0), (3.0, -1.0, 4.0), (-2.0, 2.0, -6.0)])
def test_axes_separate_as_in_closed_form(b: float, u0: float, v0: float, w0: float) -> None:
    height, wind = 40.0, 7.0
    sol = solve_falls(height, [u0, v0, w0], b, wind=WindField(speed_10m=wind), drag_law="linear")
    t_land, x, y, vx, vz = exact(height, b, wind, u0, v0, w0)
    assert sol.landed[0]
    assert sol.time[0] == pytest.approx(t_land, rel=1e-6)
    assert sol.position[0, 0] == pytest.approx(x, rel=1e-6, abs=1e-7)
    assert sol.position[1, 0] == pytest.approx(y, rel=1e-6, abs=1e-7)
    assert sol.velocity[0, 0] == pytest.approx(vx, rel=1e-6, abs=1e-7)
    assert sol.velocity[2, 0] == pytest.approx(vz, rel=1e-6)
    assert sol.position[2, 0] == 0.0


def test_unknown_drag_law_is_refused() -> None:
    with pytest.raises(ValueError, match="drag_law"):
        solve_falls(10.0, [0.0, 0.0, 0.0], 0.1, drag_law="cubic")
