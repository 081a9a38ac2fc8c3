"""Shaly-sand log Sw (Simandoux, Indonesia) against closed forms worked by hand and scipy.

No published worked example with numbers is relied on: the equations are those of
``simandoux1963`` and ``poupon1971`` (docs/references.md, recalled from memory), and the
worked values are computed from them with the inputs stated here (also listed in
docs/references.md under those keys), redone by hand in the docstrings.
"""

import numpy as np
import pytest
from scipy.optimize import brentq

from satheight.logsw import archie_sw, indonesia_sw, simandoux_sw


def test_simandoux_worked_example_quadratic_root():
    """a = 1, m = n = 2, phi = 0.2, Rw = 0.05, Rt = 20, Vsh = 0.2, Rsh = 2 ohm.m.

    A = phi^2/(a Rw) = 0.04/0.05 = 0.8; B = Vsh/Rsh = 0.1; C = 1/Rt = 0.05;
    Sw = (sqrt(B^2 + 4AC) - B)/(2A) = (sqrt(0.17) - 0.1)/1.6 = (0.4123106 - 0.1)/1.6
    = 0.1951941.
    """
    # simandoux1963, computed worked example (closed form worked in the docstring)
    assert simandoux_sw(20.0, 0.2, 0.2, 0.05, 2.0) == pytest.approx(0.1951941, abs=1e-7)


def test_simandoux_with_four_tenths_and_five_constants():
    """With a = 0.81, m = 2 the root is the printed Sw = (0.4 Rw/phi^2)[sqrt((Vsh/Rsh)^2 +
    5 phi^2/(Rw Rt)) - Vsh/Rsh], with 0.405 and 4.938 in place of the rounded 0.4 and 5."""
    rt, phi, vsh, rw, rsh = 5.0, 0.25, 0.3, 0.05, 4.0
    b = vsh / rsh
    expected = 0.405 * rw / phi**2 * (np.sqrt(b * b + (4 / 0.81) * phi**2 / (rw * rt)) - b)
    # simandoux1963 (recalled from memory: the 0.4 / 5 form), closed form in the docstring
    assert simandoux_sw(rt, phi, vsh, rw, rsh, a=0.81) == pytest.approx(expected, rel=1e-12)
    rounded = 0.4 * rw / phi**2 * (np.sqrt(b * b + 5 * phi**2 / (rw * rt)) - b)
    assert simandoux_sw(rt, phi, vsh, rw, rsh, a=0.81) == pytest.approx(rounded, rel=0.02)


def test_simandoux_general_exponent_root_solves_the_equation():
    """n = 2.5 with the inputs of the first example: Sw = 0.25 gives
    0.8 * 0.25^2.5 + 0.1 * 0.25 = 0.8 * 0.03125 + 0.025 = 0.05 = 1/Rt, so 0.25 is the root."""
    # closed form worked in the docstring
    assert simandoux_sw(20.0, 0.2, 0.2, 0.05, 2.0, n=2.5) == pytest.approx(0.25, abs=1e-12)
    # library: scipy.optimize.brentq on the same equation, several samples at once
    rt = np.array([3.0, 8.0, 40.0, 150.0])
    phi = np.array([0.3, 0.22, 0.15, 0.12])
    vsh = np.array([0.05, 0.25, 0.4, 0.1])
    got = simandoux_sw(rt, phi, vsh, 0.04, 3.0, a=0.9, m=1.9, n=2.3, clip=False)
    for i in range(rt.size):
        f = lambda s: phi[i] ** 1.9 * s ** 2.3 / (0.9 * 0.04) + vsh[i] * s / 3.0 - 1 / rt[i]
        assert got[i] == pytest.approx(brentq(f, 0.0, 5.0, xtol=1e-15), abs=1e-12)


def test_indonesia_worked_example():
    """Same inputs: Vsh^(1 - Vsh/2) = 0.2^0.9 = 0.2349237; / sqrt(2) = 0.1661176;
    sqrt(phi^2/(a Rw)) = sqrt(0.8) = 0.8944272; sum 1.0605448; 1/sqrt(20) = 0.2236068;
    Sw = (0.2236068/1.0605448)^(2/2) = 0.2108417."""
    # poupon1971, computed worked example (closed form worked in the docstring)
    assert indonesia_sw(20.0, 0.2, 0.2, 0.05, 2.0) == pytest.approx(0.2108417, abs=1e-7)
    # n = 2.5: the same ratio to the power 2/2.5 = 0.8
    assert indonesia_sw(20.0, 0.2, 0.2, 0.05, 2.0, n=2.5) == pytest.approx(
        0.2108417 ** 0.8, rel=1e-6)


@pytest.mark.parametrize("fn", [simandoux_sw, indonesia_sw])
def test_shaly_sand_reduces_to_archie_without_shale(fn):
    """Vsh = 0: both shale terms vanish and Sw = (a Rw/(phi^m Rt))^(1/n) (archie1942):
    a = 1, m = n = 2, phi = 0.2, Rw = 0.05, Rt = 20 -> 0.25; n = 2.5 -> 0.25^0.8 = 0.32988."""
    # archie1942, computed values in docs/references.md
    assert fn(20.0, 0.2, 0.0, 0.05, 2.0) == pytest.approx(0.25, rel=1e-12)
    assert fn(20.0, 0.2, 0.0, 0.05, 2.0, n=2.5) == pytest.approx(0.32988, abs=1e-5)
    rng = np.random.default_rng(3)
    rt, phi = rng.uniform(1, 200, 50), rng.uniform(0.05, 0.35, 50)
    np.testing.assert_allclose(fn(rt, phi, np.zeros(50), 0.03, 1.5, a=0.8, m=2.1, n=1.9, clip=False),
                               archie_sw(rt, phi, 0.03, 0.8, 2.1, 1.9, clip=False), rtol=1e-12)


@pytest.mark.parametrize("fn", [simandoux_sw, indonesia_sw])
def test_shaly_sand_refuses_unusable_samples(fn):
    """Rt <= 0, phi <= 0, Vsh outside [0, 1] or NaN give NaN, never a number (README: log Sw)."""
    out = fn([20, 0, 20, 20, 20], [0.2, 0.2, 0.0, 0.2, 0.2], [0.1, 0.1, 0.1, 1.5, np.nan],
             0.05, 2.0)
    assert np.isfinite(out[0]) and np.isnan(out[1:]).all()
    # shale conductance only adds to the rock's: Sw below Archie's (common practice)
    assert out[0] < archie_sw(20, 0.2, 0.05)
