"""Rock typing: reservoir quality index, flow-zone indicator and class rules.

Amaefule et al. (1993) define, with permeability in mD and porosity as a fraction,

.. math::

    RQI = 0.0314 \\sqrt{k / \\phi}\\ [\\mu m], \\qquad
    \\phi_z = \\frac{\\phi}{1 - \\phi}, \\qquad FZI = RQI / \\phi_z\\ [\\mu m]

The constant 0.0314 is the square root of 1 mD in um^2 (sqrt(9.869233e-4) =
0.0314153) rounded; here permeability is SI [m^2] and RQI is computed exactly as
``sqrt(k / phi)`` converted to micrometres, so results differ from the rounded
constant by 0.005 %.

A :class:`RockTypeRule` groups plugs and log samples by the same rule:

* ``column``: a user column of the plug table (e.g. ``rock_type``); this rule
  cannot be applied to logs (logs have no such column);
* ``permeability``: classes between permeability edges [m^2];
* ``fzi``: classes between FZI edges [um].

References
----------
Amaefule, J. O., Altunbay, M., Tiab, D., Kersey, D. G. and Keelan, D. K., 1993.
Enhanced reservoir description: using core and log data to identify hydraulic
(flow) units and predict permeability in uncored intervals/wells. SPE 26436.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from . import constants as C
from .errors import SatHeightError

METHODS = ("column", "permeability", "fzi")


def rqi(k, phi):
    """Reservoir quality index [um] (Amaefule et al. 1993).

    Parameters
    ----------
    k : array_like
        Permeability [m^2].
    phi : array_like
        Porosity [fraction].

    Returns
    -------
    numpy.ndarray
        ``sqrt(k / phi)`` in micrometres (= 0.0314153 sqrt(k[mD] / phi)); NaN where
        k <= 0 or phi <= 0.
    """
    k = np.asarray(k, dtype=float)
    phi = np.asarray(phi, dtype=float)
    with np.errstate(invalid="ignore", divide="ignore"):
        out = np.sqrt(k / phi) * 1e6
    return np.where((k > 0) & (phi > 0), out, np.nan)


def normalised_porosity(phi):
    """Pore-to-grain volume ratio ``phi_z = phi / (1 - phi)`` [-] (Amaefule et al. 1993)."""
    phi = np.asarray(phi, dtype=float)
    with np.errstate(invalid="ignore", divide="ignore"):
        return phi / (1.0 - phi)


def fzi(k, phi):
    """Flow-zone indicator ``FZI = RQI / phi_z`` [um] (Amaefule et al. 1993).

    Parameters
    ----------
    k : array_like
        Permeability [m^2].
    phi : array_like
        Porosity [fraction], 0 < phi < 1.
    """
    with np.errstate(invalid="ignore", divide="ignore"):
        return rqi(k, phi) / normalised_porosity(phi)


def _fmt(v: float) -> str:
    return f"{v:g}"


@dataclass(frozen=True)
class RockTypeRule:
    """How plugs (and log samples) are put into rock types.

    Attributes
    ----------
    method : str
        ``"column"``, ``"permeability"`` or ``"fzi"``.
    column : str or None
        Plug-table column for ``"column"`` (default ``rock_type``).
    edges : tuple of float
        Increasing class edges: [m^2] for ``"permeability"``, [um] for ``"fzi"``.
        ``len(edges) + 1`` classes, the outer ones open-ended.
    names : tuple of str
        Class names (``len(edges) + 1``); generated from the edges when empty.
    """

    method: str = "column"
    column: str | None = "rock_type"
    edges: tuple[float, ...] = ()
    names: tuple[str, ...] = ()

    def __post_init__(self):
        if self.method not in METHODS:
            raise SatHeightError(f"unknown rock-typing method {self.method!r}",
                                 hint="use one of " + ", ".join(METHODS))
        if self.method == "column":
            if not self.column:
                raise SatHeightError("rock typing by column needs a column name",
                                     hint="name the plug-table column, e.g. rock_type")
            return
        e = np.asarray(self.edges, dtype=float)
        if e.size == 0 or not np.all(np.isfinite(e)) or np.any(e <= 0) or np.any(np.diff(e) <= 0):
            raise SatHeightError(f"rock-type class edges {list(self.edges)} must be positive and "
                                 "increasing", hint="give e.g. 1,10,100 (mD) or 0.5,1,2 (FZI um)")
        if not self.names:
            object.__setattr__(self, "names", self._default_names())
        if len(self.names) != e.size + 1 or len(set(self.names)) != len(self.names):
            raise SatHeightError(f"{e.size} class edges need {e.size + 1} distinct class names, "
                                 f"got {list(self.names)}", hint="give one name per class")

    def _default_names(self) -> tuple[str, ...]:
        if self.method == "permeability":
            shown = [v / C.MILLIDARCY for v in self.edges]
            label, unit = "k", " mD"
        else:
            shown = list(self.edges)
            label, unit = "FZI", " um"
        out = [f"{label} < {_fmt(shown[0])}{unit}"]
        out += [f"{label} {_fmt(a)}-{_fmt(b)}{unit}" for a, b in zip(shown, shown[1:])]
        out.append(f"{label} >= {_fmt(shown[-1])}{unit}")
        return tuple(out)

    @property
    def applies_to_logs(self) -> bool:
        """True when the rule can be computed from log porosity and permeability."""
        return self.method != "column"

    def classify(self, phi, k) -> np.ndarray:
        """Class name of each sample from porosity [fraction] and permeability [m^2].

        Returns an object array of names, ``""`` where phi or k is unusable.
        Vectorised (``numpy.digitize``); a value on an edge goes to the upper class.

        Raises
        ------
        SatHeightError
            For the ``column`` method, which logs cannot supply.
        """
        if self.method == "column":
            raise SatHeightError(f"rock types by plug-table column {self.column!r} cannot be "
                                 "computed from logs",
                                 hint="name the rock type per zone in the project file "
                                      "(rock_type = ...), or fit with permeability or FZI classes")
        value = np.asarray(k, dtype=float) if self.method == "permeability" else fzi(k, phi)
        phi = np.asarray(phi, dtype=float)
        with np.errstate(invalid="ignore"):
            ok = np.isfinite(value) & (value > 0) & (phi > 0) & (phi < 1)
        idx = np.digitize(np.where(ok, value, 1.0), np.asarray(self.edges, dtype=float))
        names = np.asarray(self.names + ("",), dtype=object)
        return names[np.where(ok, idx, len(self.names))]

    def to_dict(self) -> dict:
        """JSON-ready description (edges in SI: m^2 or um)."""
        d = {"method": self.method}
        if self.method == "column":
            d["column"] = self.column
        else:
            d["edges"] = list(self.edges)
            d["edge_unit"] = "m2" if self.method == "permeability" else "um"
            d["names"] = list(self.names)
        return d

    @classmethod
    def from_dict(cls, d: dict, where: str = "") -> "RockTypeRule":
        """Inverse of :meth:`to_dict`; errors name ``where``."""
        try:
            if d["method"] == "column":
                return cls(method="column", column=str(d["column"]))
            return cls(method=str(d["method"]), column=None,
                       edges=tuple(float(x) for x in d["edges"]),
                       names=tuple(str(x) for x in d.get("names", ())))
        except SatHeightError as exc:
            raise SatHeightError(exc.what, where=where or None, hint=exc.hint) from None
        except (KeyError, TypeError, ValueError) as exc:
            raise SatHeightError(f"rock-typing rule is incomplete or malformed ({exc})",
                                 where=where or None,
                                 hint="it needs method and column, or method, edges and names") from None


def plug_rock_types(plugs, rule: RockTypeRule, where: str = "") -> dict[str, str]:
    """Rock type of each plug by ``rule``.

    Parameters
    ----------
    plugs : mapping of plug id -> :class:`satheight.core.Plug`
    rule : RockTypeRule

    Returns
    -------
    dict[str, str]
        Plug id -> rock-type name. For the column rule the plug's value of the
        column (``rock_type`` or an extra column) is used.

    Raises
    ------
    SatHeightError
        If a plug lacks the column; the message names the plug and where it was read.
    """
    ids = list(plugs)
    if rule.method != "column":
        phi = np.array([plugs[i].porosity for i in ids])
        k = np.array([plugs[i].permeability for i in ids])
        return dict(zip(ids, (str(x) for x in rule.classify(phi, k))))
    out = {}
    for i in ids:  # loop over plugs (a few dozen), not log samples
        p = plugs[i]
        value = p.rock_type if rule.column == "rock_type" else p.extra.get(rule.column)
        if value is None or str(value).strip() == "":
            raise SatHeightError(f"plug {i!r} has no value in column {rule.column!r}",
                                 where=p.source or where or None,
                                 hint="fill the column for every plug, or group by "
                                      "permeability or FZI classes")
        out[i] = str(value).strip()
    return out


def check_rock_type_names(given, known, option: str, wildcard: str | None = "*") -> None:
    """Refuse names in an option that match no rock type.

    An option that maps fluids or models to rock types by name (e.g. ``--reservoir
    "Upper Sand=26 mN/m"``) would otherwise leave a misspelt name silently unused.

    Parameters
    ----------
    given : iterable of str
        Rock-type names the option mentions.
    known : iterable of str
        Rock types the data have.
    option : str
        The option's name, for the message.
    wildcard : str or None
        A name that stands for every other rock type (allowed).

    Raises
    ------
    SatHeightError
        Naming the unknown names and listing the known ones.
    """
    known = sorted(set(known))
    unknown = [n for n in dict.fromkeys(given) if n != wildcard and n not in known]
    if unknown:
        also = f", or {wildcard} for every other" if wildcard else ""
        raise SatHeightError("names rock type(s) that match no plug: "
                             + ", ".join(repr(n) for n in unknown), where=option,
                             hint="known rock types: " + ", ".join(repr(n) for n in known) + also)
