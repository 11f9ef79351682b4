"""Effort model against COCOMO II.2000 check values (Boehm et al. 2000; values as tabulated in
../shared/EFFORT.md, where [D] marks values derived there by arithmetic from the published
formulas, and the 194 PM / 832 PM cases are the Model Definition Manual's examples, page from memory)."""
from __future__ import annotations

import pytest

from migrate.report import effort as E


def test_nominal_100_ksloc():
    assert E.exponent() == pytest.approx(1.0997)
    pm = E.person_months(100)
    assert pm == pytest.approx(465.32, abs=0.01)
    assert E.schedule_months(pm) == pytest.approx(25.87, abs=0.01)


@pytest.mark.parametrize("sum_sf,expected", [(0.0, 194.24), (31.6, 832.43)])
def test_scale_factor_extremes(sum_sf, expected):
    assert E.person_months(100, sum_sf) == pytest.approx(expected, abs=0.01)


def test_automatic_translation_productivity():
    assert E.pm_auto(20000, 30) == pytest.approx(2.5)  # Sommerville, Software Engineering ch. 23 (page from memory)


@pytest.mark.parametrize("dm,cm,im,aa,su,unfm,expected", [
    (10, 20, 30, 4, 30, 0.4, 0.2756),  # AAF 19, low branch
    (50, 100, 100, 4, 30, 0.4, 0.96),  # high branch
    (50, 50, 50, 0, 30, 1.0, 0.80),  # boundary: both branches agree
    (0, 0, 10, 2, 30, 0.4, 0.05),  # unmodified code: SU ignored
])
def test_adaptation_adjustment_modifier(dm, cm, im, aa, su, unfm, expected):
    assert E.aam(dm, cm, im, aa, su, unfm) == pytest.approx(expected, abs=1e-4)


def test_reuse_example_counts_translated_code_once():
    assert E.reuse_esloc(3500, 15, 20, 10, 10, 2, 40, 0) == pytest.approx(476, abs=0.5)
    assert E.pm_auto(3500, 15) == pytest.approx(0.21875)


def test_pert():
    assert E.pert(2, 4, 12) == pytest.approx((5.0, 1.6667), abs=1e-4)
    assert E.pert_sum([(2, 4, 12), (1, 2, 3)]) == pytest.approx((7.0, 1.6997), abs=1e-4)


def test_default_profiles():
    assert [round(E.aam(p.dm, p.cm, p.im, p.aa), 2) for p in E.PROFILES.values()] == [0.74, 0.96, 1.18]


def test_repository_example_apportions_one_cocomo_run():
    jobs = [E.JobEffort("A", 120, ()),
            E.JobEffort("B", 400, (("P2", 40), ("P1", 20), ("P2", 40))),
            E.JobEffort("C", 900, (("P3", 250), ("P1", 50), ("P1", 100)))]
    est = E.repository_hours(jobs)
    assert est["esloc"] == pytest.approx(497.6)
    assert est["manual_pm"] == pytest.approx(1.364604, abs=1e-6)
    assert est["jobs"]["A"] == pytest.approx(7.600, abs=1e-3)
    assert est["jobs"]["B"] == pytest.approx(57.183, abs=1e-3)
    assert est["jobs"]["C"] == pytest.approx(200.904, abs=1e-3)
    assert est["hours"] == pytest.approx(265.686, abs=1e-3)
    assert est["range"] == pytest.approx((212.549, 332.108), abs=1e-3)
