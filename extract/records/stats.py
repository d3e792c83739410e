"""Standard deviations derived from what an article reports (SD, SEM, 95% CI).

The conversions follow the Cochrane Handbook for Systematic Reviews of Interventions, section 6.5.2
("Extracting estimates of standard deviations"): 6.5.2.2 gives the SD of a group mean from its
standard error (``SD = SE × √N``) and from a 95% confidence interval (``SE = (upper − lower) / 3.92``
for large samples; for small samples 3.92 is replaced by ``2 × t(0.975, N − 1)``, the t quantile
with N − 1 degrees of freedom; the Handbook uses t below about 60 per group).

scipy is not a dependency, so the t quantile is computed here from the t density (a closed form)
by numerical integration and bisection; the unit tests check it against printed t tables.
IQR and range are not converted: the Handbook warns that they give an SD only under assumptions
of normality that the curator must judge.
"""

from __future__ import annotations

import math
from functools import lru_cache

from extract.records.proposal import Dispersion

#: Below this n a 95% CI is converted with the t quantile, from it up with 1.96 (Cochrane 6.5.2.2).
SMALL_SAMPLE_LIMIT = 60

#: 2 × 1.96, the width of a 95% normal interval in standard errors (Cochrane 6.5.2.2).
NORMAL_CI95_WIDTH = 3.92

_SIMPSON_STEPS = 600


@lru_cache(maxsize=256)
def _t_log_norm(df: int) -> float:
    return math.lgamma((df + 1) / 2) - math.lgamma(df / 2) - 0.5 * math.log(df * math.pi)


def _t_cdf(x: float, df: int) -> float:
    """P(T <= x) for x >= 0, by Simpson's rule on the density from 0 to x."""
    h = x / _SIMPSON_STEPS
    log_norm = _t_log_norm(df)
    power = (df + 1) / 2

    def density(t: float) -> float:
        return math.exp(log_norm - power * math.log1p(t * t / df))

    total = density(0.0) + density(x)
    for i in range(1, _SIMPSON_STEPS):
        total += (4 if i % 2 else 2) * density(i * h)
    return 0.5 + total * h / 3


@lru_cache(maxsize=256)
def t_quantile(p: float, df: int) -> float:
    """The ``p`` quantile of Student's t distribution with ``df`` degrees of freedom.

    Args:
        p: probability, 0.5 < p < 1 (e.g. 0.975 for a two-sided 95% interval).
        df: degrees of freedom, >= 1.

    Returns:
        x with P(T <= x) = p, to about 1e-6.

    Raises:
        ValueError: p or df out of range.
    """
    if not 0.5 < p < 1.0:
        raise ValueError(f"p must lie in (0.5, 1), got {p}")
    if df < 1:
        raise ValueError(f"degrees of freedom must be >= 1, got {df}")
    low, high = 0.0, 1.0
    while _t_cdf(high, df) < p:
        high *= 2
    while high - low > 1e-9:
        mid = (low + high) / 2
        if _t_cdf(mid, df) < p:
            low = mid
        else:
            high = mid
    return (low + high) / 2


def ci95_to_sd(low: float, high: float, n: int) -> float:
    """SD of a group from the 95% CI of its mean and its size (Cochrane Handbook 6.5.2.2).

    Args:
        low: lower limit of the 95% confidence interval.
        high: upper limit.
        n: number of subjects in the group (>= 2).

    Returns:
        ``√n × (high − low) / w`` with ``w = 2 × t(0.975, n − 1)`` below
        :data:`SMALL_SAMPLE_LIMIT` and ``w = 3.92`` from it up.
    """
    if n < 2:
        raise ValueError(f"a CI needs n >= 2, got {n}")
    width = NORMAL_CI95_WIDTH if n >= SMALL_SAMPLE_LIMIT else 2 * t_quantile(0.975, n - 1)
    return math.sqrt(n) * abs(high - low) / width


def derive_sd(dispersion: Dispersion | None, n: int | None) -> float | None:
    """The SD where the dispersion and n allow it, else ``None``.

    SD is taken as is; SEM gives ``SEM × √n``; a 95% CI gives :func:`ci95_to_sd`. IQR and range
    give ``None`` (see the module docstring).
    """
    if dispersion is None:
        return None
    value = dispersion.value
    if dispersion.kind == "SD" and isinstance(value, float | int):
        return float(value)
    if n is None or n < 1:
        return None
    if dispersion.kind == "SEM" and isinstance(value, float | int):
        return float(value) * math.sqrt(n)
    if dispersion.kind == "CI95" and isinstance(value, tuple) and n >= 2:
        return ci95_to_sd(value[0], value[1], n)
    return None
