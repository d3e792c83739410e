"""SD derivations (Cochrane Handbook 6.5.2) and the t quantile behind them."""

from __future__ import annotations

import math

import pytest

from extract.records.proposal import Dispersion
from extract.records.stats import ci95_to_sd, derive_sd, t_quantile


# Two-sided 95% critical values t(0.975, df) as printed in the NIST/SEMATECH e-Handbook of
# Statistical Methods, section 1.3.6.7.2 "Critical values of the Student's t distribution"
# (three decimals; values quoted from memory of that table).
@pytest.mark.parametrize(
    ("df", "expected"),
    [
        (1, 12.706),
        (2, 4.303),
        (5, 2.571),
        (9, 2.262),
        (15, 2.131),
        (24, 2.064),
        (29, 2.045),
        (60, 2.000),
    ],
)
def test_t_quantile_matches_printed_table(df: int, expected: float) -> None:
    assert t_quantile(0.975, df) == pytest.approx(expected, abs=6e-4)


def test_t_quantile_tends_to_normal_quantile() -> None:
    # z(0.975) = 1.959964 (standard normal table; common practice).
    assert t_quantile(0.975, 5000) == pytest.approx(1.959964, abs=1e-3)


def test_sd_from_sem_worked_example() -> None:
    # Cochrane Handbook 6.5.2.2: SD = SE × √N; SEM 1.5 with n = 16 gives SD 6.0.
    assert derive_sd(Dispersion("SEM", 1.5), 16) == pytest.approx(6.0)


def test_sd_is_kept_as_is_without_n() -> None:
    assert derive_sd(Dispersion("SD", 2.5), None) == 2.5


def test_sem_without_n_gives_no_sd() -> None:
    assert derive_sd(Dispersion("SEM", 1.5), None) is None


def test_ci_large_sample_uses_3_92() -> None:
    # Cochrane Handbook 6.5.2.2: for large samples SE = (upper − lower) / 3.92, SD = SE × √N.
    low, high, n = 10.0, 13.92, 100
    assert ci95_to_sd(low, high, n) == pytest.approx(math.sqrt(100) * 1.0)


def test_ci_small_sample_uses_t() -> None:
    # Cochrane Handbook 6.5.2.2: for small samples 3.92 becomes 2 × t(0.975, N − 1);
    # with N = 25, t(0.975, 24) = 2.064 (t table, NIST/SEMATECH 1.3.6.7.2, from memory).
    sd = derive_sd(Dispersion("CI95", (128.0, 136.0)), 25)
    assert sd == pytest.approx(5 * 8.0 / (2 * 2.064), rel=5e-4)


@pytest.mark.parametrize("kind", ["IQR", "range"])
def test_iqr_and_range_give_no_sd(kind: str) -> None:
    # Cochrane Handbook 6.5.2.5: IQR and range convert only under a normality assumption
    # the curator must judge, so no SD is derived automatically.
    assert derive_sd(Dispersion(kind, (3.0, 5.0)), 20) is None
