"""Shared shape of every J-Sw function family.

A family is a class with

* ``name``: registry key used in project files;
* ``param_names``: ordered parameter names;
* ``bounds``: ``{name: (low, high)}`` used both to validate given parameters
  and as least-squares bounds when fitting;
* ``equation(j, **params)``: a pure vectorised static method giving Sw [fraction]
  from J [-];
* ``initial_guess(j, sw)``: starting values for a fit.

Instances follow scikit-learn's estimator convention (scikit-learn developers'
guide, "Rolling your own estimator"): the constructor only stores its arguments
(``max_evaluations``); ``fit(j, sw)`` returns ``self`` and sets the learned
attributes, whose names end in ``_`` (``params_``, ``stderr_``, ``rmse_``,
``j_range_``, ``fit_data_``) and which do not exist before; ``get_params`` and
``set_params`` work, so ``sklearn.base.clone`` gives an unfitted copy.
``predict(j)`` before fit (or before :meth:`JSwFunction.from_params`) raises
:class:`NotFittedError`. scikit-learn itself is not needed.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import ClassVar

import numpy as np

from ..errors import ModelError, NotFittedError


class JSwFunction:
    """Base class of a J-Sw function family (see module docstring)."""

    name: ClassVar[str] = ""
    param_names: ClassVar[tuple[str, ...]] = ()
    bounds: ClassVar[dict[str, tuple[float, float]]] = {}
    description: ClassVar[str] = ""
    #: What ``predict`` and ``fit`` take: ``"j"`` (Leverett J [-], every J-Sw family)
    #: or ``"height"`` (height above the FWL [m], height functions fitted to Sw
    #: versus height directly). The engine passes the matching array.
    variable: ClassVar[str] = "j"

    def __init__(self, max_evaluations: int = 20000):
        self.max_evaluations = max_evaluations

    # --- estimator parameters (scikit-learn convention) ---------------------------
    def get_params(self, deep: bool = True) -> dict:
        """Constructor arguments by name (``deep`` is accepted for scikit-learn)."""
        return {"max_evaluations": self.max_evaluations}

    def set_params(self, **params) -> "JSwFunction":
        """Set constructor arguments; returns ``self``."""
        valid = self.get_params()
        for key, value in params.items():
            if key not in valid:
                raise ModelError(f"{type(self).__name__} has no setting {key!r}",
                                 hint="settings: " + ", ".join(valid))
            setattr(self, key, value)
        return self

    def is_fitted(self) -> bool:
        """Whether the function has parameters (fitted, or built from given values)."""
        return "params_" in vars(self)

    def __sklearn_is_fitted__(self) -> bool:
        return self.is_fitted()

    def __sklearn_tags__(self):
        """Estimator tags for scikit-learn (imported only when scikit-learn asks)."""
        from sklearn.utils import RegressorTags, Tags, TargetTags   # optional library

        return Tags(estimator_type="regressor", target_tags=TargetTags(required=True),
                    regressor_tags=RegressorTags())

    # --- construction -------------------------------------------------------------
    @classmethod
    def from_params(cls, params: dict[str, float], j_range=None, where: str = "") -> "JSwFunction":
        """Make a ready-to-predict function from given parameters, validated against ``bounds``.

        Raises
        ------
        ModelError
            If a parameter is missing, unknown, not a number or out of bounds; the
            message names ``where`` (e.g. the project-file key).
        """
        missing = [p for p in cls.param_names if p not in params]
        if missing:
            raise ModelError(f"{cls.name} function needs parameter(s) {', '.join(missing)}",
                             where=where or None,
                             hint=f"give all of {', '.join(cls.param_names)}")
        unknown = [p for p in params if p not in cls.param_names]
        if unknown:
            raise ModelError(f"{cls.name} function has no parameter(s) {', '.join(unknown)}",
                             where=where or None,
                             hint=f"its parameters are {', '.join(cls.param_names)}")
        clean = {}
        for p in cls.param_names:
            v = params[p]
            if isinstance(v, bool) or not isinstance(v, (int, float)) or not np.isfinite(v):
                raise ModelError(f"parameter {p} must be a finite number, got {v!r}",
                                 where=where or None)
            lo, hi = cls.bounds[p]
            if not (lo <= v <= hi):
                raise ModelError(f"parameter {p} = {v} is outside its allowed range [{lo}, {hi}]",
                                 where=where or None)
            clean[p] = float(v)
        cls.check_params(clean, where)
        obj = cls()
        obj.params_ = clean
        obj.stderr_ = None
        obj.rmse_ = None
        obj.j_range_ = None
        if j_range is not None:
            lo, hi = float(j_range[0]), float(j_range[1])
            if not (0 <= lo < hi):
                raise ModelError(f"calibrated J range [{lo}, {hi}] must satisfy 0 <= j_min < j_max",
                                 where=where or None)
            obj.j_range_ = (lo, hi)
        return obj

    @classmethod
    def check_params(cls, params: dict[str, float], where: str = "") -> None:
        """Extra consistency checks between parameters (override where needed)."""

    # --- the function -------------------------------------------------------------
    @staticmethod
    def equation(j, **params):  # pragma: no cover - abstract
        raise NotImplementedError

    def predict(self, j) -> np.ndarray:
        """Water saturation [fraction] at Leverett J [-] (array in, array out).

        J <= 0 (at or below the free-water level) gives Sw = 1. NaN J gives NaN.
        Results are clipped to [0, 1].
        """
        if not self.is_fitted():
            raise NotFittedError(f"{self.name} function has no parameters yet",
                                 hint="call fit(j, sw) or build it with from_params(...)")
        j = np.asarray(j, dtype=float)
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            sw = self.equation(np.where(j > 0, j, np.inf), **self.params_)
            sw = np.where(j > 0, sw, 1.0)
        sw = np.clip(sw, 0.0, 1.0)
        return np.where(np.isnan(j), np.nan, sw)

    # --- fitting ------------------------------------------------------------------
    def initial_guess(self, j: np.ndarray, sw: np.ndarray) -> dict[str, float]:
        """Starting values for a least-squares fit (override for a better start)."""
        return {p: float(np.clip(1.0, *self.bounds[p])) for p in self.param_names}

    def fit(self, j, sw) -> "JSwFunction":
        """Least-squares fit in saturation space with parameter bounds.

        Parameters
        ----------
        j : array_like
            Leverett J of each point [-], positive.
        sw : array_like
            Measured water saturation [fraction].

        Returns
        -------
        self
        """
        from scipy.optimize import curve_fit

        j = np.asarray(j, dtype=float)
        sw = np.asarray(sw, dtype=float)
        ok = np.isfinite(j) & np.isfinite(sw) & (j > 0)
        if ok.sum() <= len(self.param_names):
            raise ModelError(f"{self.name}: need more than {len(self.param_names)} usable "
                             f"points to fit, got {int(ok.sum())}",
                             hint="add data points with J > 0 and finite Sw")
        j, sw = j[ok], sw[ok]
        guess = self.initial_guess(j, sw)
        lo = [self.bounds[p][0] for p in self.param_names]
        hi = [self.bounds[p][1] for p in self.param_names]
        p0 = [float(np.clip(guess[p], lo[i] + 1e-12 * (hi[i] - lo[i]), hi[i])) for i, p in enumerate(self.param_names)]

        def f(x, *p):
            return np.clip(self.equation(x, **dict(zip(self.param_names, p))), 0.0, 1.0)

        popt, pcov = curve_fit(f, j, sw, p0=p0, bounds=(lo, hi), maxfev=int(self.max_evaluations))
        self.params_ = dict(zip(self.param_names, map(float, popt)))
        with np.errstate(invalid="ignore"):
            self.stderr_ = dict(zip(self.param_names, map(float, np.sqrt(np.diag(pcov)))))
        self.rmse_ = float(np.sqrt(np.mean((f(j, *popt) - sw) ** 2)))
        self.j_range_ = (float(j.min()), float(j.max()))
        self.fit_data_ = (j, sw, f(j, *popt), np.asarray(pcov, dtype=float), ok)
        return self

    # --- fit report (additive: statistics of the last fit) ----------------------------
    def fit_report(self, groups=None) -> "FitReport":
        """Statistics of the last :meth:`fit`.

        Parameters
        ----------
        groups : array_like, optional
            A label per point given to :meth:`fit` (same length as its ``j``), e.g.
            the plug id; residuals are then summarised per label.

        Returns
        -------
        FitReport
            Parameters, standard errors, correlation matrix, RMSE, R^2, AIC, J range
            and per-group residuals.

        Notes
        -----
        ``AIC = n ln(RSS/n) + 2 p`` for least squares with Gaussian errors of
        unknown variance (Akaike 1974; the least-squares form as in Burnham and
        Anderson 2002, Model Selection and Multimodel Inference, section 2.2).
        ``R^2 = 1 - RSS/TSS`` in saturation space. Standard errors and the
        correlation matrix come from the covariance that
        :func:`scipy.optimize.curve_fit` estimates (residual variance scaled).
        """
        if "fit_data_" not in vars(self):
            raise NotFittedError(f"{self.name} function has not been fitted",
                                 hint="call fit(j, sw) before fit_report()")
        j, sw, pred, pcov, ok = self.fit_data_
        resid = pred - sw
        n, p = sw.size, len(self.param_names)
        rss = float(np.sum(resid ** 2))
        tss = float(np.sum((sw - sw.mean()) ** 2))
        with np.errstate(invalid="ignore", divide="ignore"):
            se = np.sqrt(np.diag(pcov))
            corr = pcov / np.outer(se, se)
        per_group: dict[str, dict[str, float]] = {}
        if groups is not None:
            g = np.asarray(groups, dtype=object)
            if g.shape != ok.shape:
                raise ModelError(f"groups has {g.size} labels but fit had {ok.size} points",
                                 hint="give one label per point passed to fit")
            g = g[ok]
            for label in dict.fromkeys(g.tolist()):  # loop over plugs, not samples
                m = g == label
                r = resid[m]
                per_group[str(label)] = {"n": int(m.sum()), "mean": float(r.mean()),
                                         "rms": float(np.sqrt(np.mean(r ** 2))),
                                         "max_abs": float(np.max(np.abs(r)))}
        return FitReport(
            family=self.name, params=dict(self.params_), stderr=dict(self.stderr_ or {}),
            correlation=[[float(x) for x in row] for row in corr],
            n_points=int(n), rmse=float(np.sqrt(rss / n)),
            r2=float(1.0 - rss / tss) if tss > 0 else float("nan"),
            aic=float(n * np.log(max(rss, 1e-300) / n) + 2 * p),
            j_range=tuple(self.j_range_), residuals_by_group=per_group,
            variable=self.variable, covariance=[[float(x) for x in row] for row in pcov])

    def __repr__(self) -> str:
        if not self.is_fitted():
            return f"{type(self).__name__}(max_evaluations={self.max_evaluations})"
        return f"{type(self).__name__}(params_={self.params_}, j_range_={self.j_range_})"


@dataclass
class FitReport:
    """Statistics of one least-squares fit (see :meth:`JSwFunction.fit_report`).

    Attributes
    ----------
    family : str
    params, stderr : dict[str, float]
        Fitted parameters and their standard errors (same units as the parameters).
    correlation : list[list[float]]
        Parameter correlation matrix in the order of ``params``.
    covariance : list[list[float]]
        Parameter covariance matrix in the order of ``params`` (units of the
        parameters squared), as :func:`scipy.optimize.curve_fit` estimates it; the
        Monte Carlo can draw the parameters jointly from it.
    n_points : int
    rmse : float
        Root-mean-square saturation residual [fraction].
    r2 : float
        Coefficient of determination in saturation space [-].
    aic : float
        Akaike information criterion, least-squares form [-].
    j_range : tuple[float, float]
        Range of the fitted variable covered by data (J [-], or height [m] for a
        height function); used to flag extrapolation.
    residuals_by_group : dict[str, dict]
        Per label (plug): number of points, mean, RMS and largest absolute residual.
    variable : str
        ``"j"`` or ``"height"``: what the function takes.
    """

    family: str
    params: dict[str, float]
    stderr: dict[str, float]
    correlation: list[list[float]]
    n_points: int
    rmse: float
    r2: float
    aic: float
    j_range: tuple[float, float]
    residuals_by_group: dict[str, dict] = field(default_factory=dict)
    variable: str = "j"
    covariance: list[list[float]] = field(default_factory=list)

    def to_dict(self) -> dict:
        """JSON-ready dict (NaN turned into None)."""
        def clean(v):
            if isinstance(v, float):
                return v if np.isfinite(v) else None
            if isinstance(v, dict):
                return {k: clean(x) for k, x in v.items()}
            if isinstance(v, (list, tuple)):
                return [clean(x) for x in v]
            return v
        return clean({"family": self.family, "variable": self.variable, "params": self.params,
                      "stderr": self.stderr, "correlation": self.correlation,
                      "covariance": self.covariance, "n_points": self.n_points, "rmse": self.rmse, "r2": self.r2,
                      "aic": self.aic, "j_range": list(self.j_range),
                      "residuals_by_plug": self.residuals_by_group})
