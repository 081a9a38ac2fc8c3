"""Project-file keys of the Monte Carlo: ``[uncertainty]`` and ``[zones.uncertainty]``."""

from __future__ import annotations

import tomllib
from pathlib import Path

import pytest

from satheight.distributions import Distribution
from satheight.errors import ProjectFileError
from satheight.project.uncertainty_keys import read_uncertainty

PATH = Path("project.toml")

DOC = """
[project]
units = "{units}"

[uncertainty]
realisations = 500
seed = 42
memory_mb = 32
tornado = false

[[zones]]
name = "Upper"
fwl = 2060
[zones.uncertainty]
fwl = {{ distribution = "normal", sd = 5 }}
water_density = {{ distribution = "uniform", low = "1.06 g/cm3", high = "1.10 g/cm3" }}
hydrocarbon_density = {{ distribution = "triangular", low = "0.72 g/cm3", high = "0.79 g/cm3" }}
sigma_cos_theta = {{ distribution = "truncated_normal", sd = "3 mN/m", low = "18 mN/m", high = "34 mN/m" }}
porosity_error = {{ distribution = "normal", sd = "1 %", correlation_length = "3 m" }}
permeability_error = {{ distribution = "normal", sd = 0.2, correlation_length = 10 }}
[zones.uncertainty.function]
swirr = {{ distribution = "uniform", low = 0.05, high = 0.15 }}

[[zones]]
name = "Lower"
fwl = 2100
"""


def _read(text: str, units: str = "metric"):
    return read_uncertainty(tomllib.loads(text), PATH, units)


def test_every_key_is_read_in_si():
    spec = _read(DOC.format(units="metric"))
    s = spec.settings
    assert (s.realisations, s.seed, s.memory_mb, spec.tornado) == (500, 42, 32.0, False)
    assert set(spec.zones) == {"Upper"}
    z = spec.zones["Upper"]
    # unit factors: 1 g/cm3 = 1000 kg/m3, 1 mN/m = 1e-3 N/m, 1 % = 0.01 (NIST SP 811)
    assert z.inputs["fwl"] == Distribution("normal", sd=5.0)
    assert z.inputs["water_density"].low == pytest.approx(1060.0)
    assert z.inputs["water_density"].high == pytest.approx(1100.0)
    assert z.inputs["hydrocarbon_density"].mode is None          # the zone's own value
    assert z.inputs["sigma_cos_theta"].low == pytest.approx(0.018)
    assert z.inputs["swirr"] == Distribution("uniform", low=0.05, high=0.15)
    assert z.porosity_error.distribution.sd == pytest.approx(0.01)
    assert z.porosity_error.correlation_length == pytest.approx(3.0)
    assert z.permeability_error.correlation_length == pytest.approx(10.0)


def test_bare_numbers_take_the_field_unit_system():
    z = _read(DOC.format(units="field"), "field").zones["Upper"]
    # 1 ft = 0.3048 m exactly (NIST SP 811)
    assert z.inputs["fwl"].sd == pytest.approx(5 * 0.3048)
    assert z.permeability_error.correlation_length == pytest.approx(3.048)


def test_no_keys_no_monte_carlo_and_defaults_without_settings():
    assert _read('[project]\nunits = "metric"\n[[zones]]\nname = "A"\n') is None
    spec = _read('[[zones]]\nname = "A"\n[zones.uncertainty]\n'
                 'fwl = { distribution = "normal", sd = 2 }\n')
    assert spec.settings.realisations == 1000 and spec.tornado


@pytest.mark.parametrize("change, key", [
    ('sd = 5 }', "zones[Upper].uncertainty.fwl"),                                   # sd missing
    ('distribution = "normal", sd = 5', "zones[Upper].uncertainty.fwl.distribution"),
    ('distribution = "lognormal", sd = 5', "zones[Upper].uncertainty.fwl.distribution"),
    ('distribution = "normal", sd = -5', "zones[Upper].uncertainty.fwl.sd"),
    ('distribution = "normal", sd = "5 psi"', "zones[Upper].uncertainty.fwl.sd"),
    ('distribution = "normal", sd = 5, low = 1', "zones[Upper].uncertainty.fwl.low"),
    ('distribution = "normal", sd = 5000', "zones[Upper].uncertainty.fwl"),
    ('distribution = "normal", sd = 5, spread = 1', "zones[Upper].uncertainty.fwl.spread"),
])
def test_bad_fwl_distribution_names_the_key(change, key):
    text = DOC.format(units="metric").replace(
        'fwl = { distribution = "normal", sd = 5 }',
        "fwl = { " + change + (" }" if not change.endswith("}") else ""))
    if change == 'distribution = "normal", sd = 5':
        text = text.replace('fwl = { distribution = "normal", sd = 5 }', 'fwl = { sd = 5 }')
    with pytest.raises(ProjectFileError) as err:
        _read(text)
    assert f"key {key}" in str(err.value)
    assert "project.toml" in str(err.value)


@pytest.mark.parametrize("old, new, key", [
    ("realisations = 500", "realisations = 0", "uncertainty.realisations"),
    ("seed = 42", "seed = -1", "uncertainty.seed"),
    ("seed = 42", 'seed = "x"', "uncertainty.seed"),
    ("tornado = false", 'tornado = "no"', "uncertainty.tornado"),
    ("memory_mb = 32", "memory_mb = 0.1", "uncertainty.memory_mb"),
    ("memory_mb = 32", "memory = 32", "uncertainty.memory"),
    ('correlation_length = "3 m"', 'correlation_length = "-3 m"',
     "zones[Upper].uncertainty.porosity_error.correlation_length"),
    ('correlation_length = "3 m"', 'correlation_length = "30 km"',
     "zones[Upper].uncertainty.porosity_error.correlation_length"),
    ("swirr = {", "swirr = 3\nb = {", "zones[Upper].uncertainty.function.swirr"),
    ("[zones.uncertainty.function]", "sigma = 1\n[zones.uncertainty.function]",
     "zones[Upper].uncertainty.sigma"),
])
def test_bad_settings_name_the_key(old, new, key):
    text = DOC.format(units="metric").replace(old, new, 1)
    with pytest.raises(ProjectFileError) as err:
        _read(text)
    assert f"key {key}" in str(err.value)


def test_implausible_spread_is_accepted_when_the_user_says_so():
    text = DOC.format(units="metric").replace("sd = 5 }", "sd = 5000 }")
    with pytest.raises(ProjectFileError, match="accept_implausible"):
        _read(text)
    spec = _read(text.replace("tornado = false", "tornado = false\naccept_implausible = true"))
    assert spec.zones["Upper"].inputs["fwl"].sd == 5000.0
