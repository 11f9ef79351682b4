"""Effort estimate on COCOMO II.2000 (post-architecture model, reuse and automatic translation).

Source: B. Boehm et al., Software Cost Estimation with COCOMO II (2000) and the COCOMO II
Model Definition Manual 2000.0; constants and check values as collected in ../shared/EFFORT.md.
The adaptation profiles P1-P3 are this project's choice (configurable), not published values.
"""
from __future__ import annotations

from dataclasses import dataclass

A = 2.94  # [P]
B = 0.91  # [P]
NOMINAL_SF = 18.97  # sum of the five scale factors at Nominal [S]
C, D = 3.67, 0.28  # schedule equation [S]
ATPROD = 2400.0  # automatically translated statements per person-month [S]
HOURS_PER_PM = 152.0  # [S]
RANGE = (0.80, 1.25)  # post-architecture estimate range [S]


@dataclass(frozen=True)
class Profile:
    """How much of a hand-work item must be redesigned, coded and re-tested (percent)."""

    dm: float
    cm: float
    im: float
    aa: float


PROFILES = {
    "P1": Profile(0, 100, 100, 2),  # re-express the same logic
    "P2": Profile(50, 100, 100, 4),  # partial redesign
    "P3": Profile(100, 100, 100, 6),  # full redesign
}
SU, UNFM = 30.0, 0.4  # software understanding Nominal, unfamiliarity "mostly unfamiliar" (our defaults)


def exponent(sum_sf: float = NOMINAL_SF) -> float:
    return B + 0.01 * sum_sf


def person_months(ksloc: float, sum_sf: float = NOMINAL_SF, eaf: float = 1.0) -> float:
    """PM = A · Size^E · EAF, Size in KSLOC."""
    return A * ksloc ** exponent(sum_sf) * eaf if ksloc > 0 else 0.0


def schedule_months(pm: float, sum_sf: float = NOMINAL_SF) -> float:
    return C * pm ** (D + 0.2 * (exponent(sum_sf) - B))


def aaf(dm: float, cm: float, im: float) -> float:
    return 0.4 * dm + 0.3 * cm + 0.3 * im


def aam(dm: float, cm: float, im: float, aa: float, su: float = SU, unfm: float = UNFM) -> float:
    """Adaptation adjustment modifier; SU does not apply to unmodified code (DM = CM = 0)."""
    f = aaf(dm, cm, im)
    if dm == 0 and cm == 0:
        su = 0.0
    if f <= 50:
        return (aa + f * (1 + 0.02 * su * unfm)) / 100
    return (aa + f + su * unfm) / 100


def reuse_esloc(asloc: float, at: float, dm: float, cm: float, im: float, aa: float, su: float, unfm: float) -> float:
    """ESLOC = ASLOC · (1 − AT/100) · AAM: automatically translated lines are not counted twice."""
    return asloc * (1 - at / 100) * aam(dm, cm, im, aa, su, unfm)


def pm_auto(asloc: float, at: float, atprod: float = ATPROD) -> float:
    return asloc * (at / 100) / atprod


def pert(o: float, m: float, p: float) -> tuple[float, float]:
    return (o + 4 * m + p) / 6, (p - o) / 6


def pert_sum(items: list[tuple[float, float, float]]) -> tuple[float, float]:
    """Means add; standard deviations add by root-sum-square."""
    means, sigmas = zip(*(pert(*i) for i in items)) if items else ((), ())
    return sum(means), sum(s * s for s in sigmas) ** 0.5


@dataclass(frozen=True)
class JobEffort:
    """Inputs of one job (legacy Java SLOC) and its share of the repository estimate."""

    name: str
    sloc_total: int
    items: tuple[tuple[str, int], ...]  # (profile, sloc covered) per hand-work item

    @property
    def sloc_manual(self) -> int:
        return min(sum(s for _, s in self.items), self.sloc_total)

    @property
    def sloc_auto(self) -> int:
        return max(self.sloc_total - self.sloc_manual, 0)

    @property
    def esloc(self) -> float:
        total = 0.0
        for prof, sloc in self.items:
            p = PROFILES[prof]
            total += max(sloc, 10) * aam(p.dm, p.cm, p.im, p.aa)
        return total


def repository_hours(jobs: list[JobEffort]) -> dict:
    """One COCOMO run on the repository's ΣESLOC, apportioned to jobs by ESLOC share."""
    total_esloc = sum(j.esloc for j in jobs)
    manual_pm = person_months(total_esloc / 1000.0)
    per_job = {}
    for j in jobs:
        share = manual_pm * (j.esloc / total_esloc) if total_esloc else 0.0
        per_job[j.name] = (share + j.sloc_auto / ATPROD) * HOURS_PER_PM
    hours = sum(per_job.values())
    return {"jobs": per_job, "hours": hours, "range": (hours * RANGE[0], hours * RANGE[1]),
            "esloc": total_esloc, "manual_pm": manual_pm}
