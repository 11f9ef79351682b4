"""Effort estimate on COCOMO II.2000 (post-architecture model, reuse and automatic translation).

Source: B. Boehm et al., Software Cost Estimation with COCOMO II (2000) and the COCOMO II
Model Definition Manual 2000.0; constants and check values as collected in ../shared/EFFORT.md.
The adaptation profiles P1-P3 are this project's choice (configurable), not published values.
"""
from __future__ import annotations

from dataclasses import dataclass, field

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


def exponent(sum_sf: float = NOMINAL_SF, b: float = B) -> float:
    return b + 0.01 * sum_sf


def person_months(ksloc: float, sum_sf: float = NOMINAL_SF, eaf: float = 1.0, a: float = A, b: float = B) -> float:
    """PM = A · Size^E · EAF, Size in KSLOC."""
    return a * ksloc ** exponent(sum_sf, b) * eaf if ksloc > 0 else 0.0


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
class Model:
    """The constants of the estimate. `basis` says where each came from: published (COCOMO II.2000,
    label in words), mrlift's default, or the user's file; `pert` holds the team's own
    three-point hours per hand-work item of a category, which then replace COCOMO for those items."""

    a: float = A
    b: float = B
    sum_sf: float = NOMINAL_SF
    atprod: float = ATPROD
    hours_per_pm: float = HOURS_PER_PM
    range: tuple[float, float] = RANGE
    su: float = SU
    unfm: float = UNFM
    profiles: dict = field(default_factory=lambda: dict(PROFILES))
    category_profiles: dict = field(default_factory=dict)  # category -> "P1" | "P2" | "P3"
    pert: dict = field(default_factory=dict)  # category -> (optimistic, most likely, pessimistic) hours per item
    basis: dict = field(default_factory=lambda: dict(BASIS))


# What each constant rests on, in words a report reader can follow without this repository:
# "read in the model definition" (COCOMO II Model Definition Manual 2000.0) or "as quoted by
# secondary sources that agree" where the value was checked in notes derived from it.
_MANUAL = "published: COCOMO II Model Definition Manual 2000.0"
_QUOTED = "published: COCOMO II.2000 value as quoted by secondary sources that agree"
BASIS = {"a": _MANUAL, "b": _MANUAL, "sum_sf": f"{_QUOTED} (all five scale factors at Nominal)",
         "atprod": _QUOTED, "hours_per_pm": _QUOTED, "range": _QUOTED,
         "su": "mrlift default (the Nominal software-understanding rating of the model)",
         "unfm": "mrlift default (unfamiliarity rating 0.4)",
         "profiles": "mrlift default (P1 re-express, P2 partial redesign, P3 full redesign; see the README, Effort)"}
DEFAULT = Model()


class EffortConfigError(Exception):
    """An effort file that cannot be read; the message names the file and the key."""


def load_model(path) -> Model:
    """An effort TOML file: [cocomo] a, b, sum_sf, atprod, hours_per_pm, range; [adaptation] su,
    unfm; [profiles.P1] dm, cm, im, aa; [categories] name = "P2"; [pert.<category>] optimistic,
    likely, pessimistic (hours per item). Anything not given keeps its default."""
    import tomllib
    from pathlib import Path

    path = Path(path)
    try:
        data = tomllib.loads(path.read_text(encoding="utf-8"))
    except (OSError, ValueError) as exc:
        raise EffortConfigError(f"{path}: {exc}") from None
    known = {"cocomo": {"a", "b", "sum_sf", "atprod", "hours_per_pm", "range"}, "adaptation": {"su", "unfm"},
             "profiles": None, "categories": None, "pert": None}
    for key in data:
        if key not in known:
            raise EffortConfigError(f"{path}: unknown table [{key}] (one of {', '.join(known)})")
    values, basis = {}, dict(BASIS)
    for table in ("cocomo", "adaptation"):
        for k, v in data.get(table, {}).items():
            if k not in known[table]:
                raise EffortConfigError(f"{path}: unknown key {table}.{k}")
            ok = isinstance(v, list) and len(v) == 2 and all(isinstance(x, (int, float)) for x in v) if k == "range" \
                else isinstance(v, (int, float)) and not isinstance(v, bool)
            if not ok or (k != "range" and v < 0):
                raise EffortConfigError(f"{path}: {table}.{k} must be {'two numbers' if k == 'range' else 'a number ≥ 0'}")
            values[k] = tuple(v) if k == "range" else float(v)
            basis[k] = f"your file ({path.name})"
    profiles = dict(PROFILES)
    for name, prof in data.get("profiles", {}).items():
        try:
            profiles[name] = Profile(*(float(prof[x]) for x in ("dm", "cm", "im", "aa")))
        except (KeyError, TypeError, ValueError):
            raise EffortConfigError(f"{path}: [profiles.{name}] needs numbers dm, cm, im and aa") from None
        basis["profiles"] = f"mrlift default and your file ({path.name})"
    cats = {}
    for cat, prof in data.get("categories", {}).items():
        if prof not in profiles:
            raise EffortConfigError(f"{path}: categories.{cat} = {prof!r} is not a profile ({', '.join(profiles)})")
        cats[cat] = prof
    pert = {}
    for cat, t in data.get("pert", {}).items():
        try:
            o, m, p_ = (float(t[x]) for x in ("optimistic", "likely", "pessimistic"))
        except (KeyError, TypeError, ValueError):
            raise EffortConfigError(f"{path}: [pert.{cat}] needs numbers optimistic, likely, pessimistic") from None
        if not 0 <= o <= m <= p_:
            raise EffortConfigError(f"{path}: [pert.{cat}] needs 0 ≤ optimistic ≤ likely ≤ pessimistic")
        pert[cat] = (o, m, p_)
    return Model(**values, profiles=profiles, category_profiles=cats, pert=pert, basis=basis)


@dataclass(frozen=True)
class JobEffort:
    """Inputs of one job (legacy Java SLOC) and its share of the repository estimate."""

    name: str
    sloc_total: int
    items: tuple[tuple, ...]  # (profile, sloc covered[, category]) per hand-work item

    @property
    def sloc_manual(self) -> int:
        return min(sum(i[1] for i in self.items), self.sloc_total)

    @property
    def sloc_auto(self) -> int:
        return max(self.sloc_total - self.sloc_manual, 0)

    @property
    def esloc(self) -> float:
        return self.esloc_under(DEFAULT)

    def esloc_under(self, model: Model) -> float:
        """Adapted ESLOC of the items COCOMO estimates (not those the team gave PERT hours for)."""
        total = 0.0
        for item in self.items:
            prof, sloc, cat = item[0], item[1], (item[2] if len(item) > 2 else None)
            if cat in model.pert:
                continue
            p = model.profiles[model.category_profiles.get(cat, prof)]
            total += max(sloc, 10) * aam(p.dm, p.cm, p.im, p.aa, model.su, model.unfm)
        return total

    def pert_items(self, model: Model) -> list[tuple[float, float, float]]:
        return [model.pert[i[2]] for i in self.items if len(i) > 2 and i[2] in model.pert]


def repository_hours(jobs: list[JobEffort], model: Model = DEFAULT) -> dict:
    """One COCOMO run on the repository's ΣESLOC, apportioned to jobs by ESLOC share, plus the
    PERT hours the team gave for whole categories (means add; σ by root-sum-square)."""
    eslocs = {j.name: j.esloc_under(model) for j in jobs}
    total_esloc = sum(eslocs.values())
    manual_pm = person_months(total_esloc / 1000.0, model.sum_sf, a=model.a, b=model.b)
    per_job, cocomo_hours, pert_all = {}, 0.0, []
    for j in jobs:
        share = manual_pm * (eslocs[j.name] / total_esloc) if total_esloc else 0.0
        cocomo = (share + j.sloc_auto / model.atprod) * model.hours_per_pm
        items = j.pert_items(model)
        pert_all += items
        per_job[j.name] = cocomo + sum(pert(*i)[0] for i in items)
        cocomo_hours += cocomo
    hours = sum(per_job.values())
    pert_mean, pert_sigma = pert_sum(pert_all)
    low = cocomo_hours * model.range[0] + sum(o for o, _, _ in pert_all)
    high = cocomo_hours * model.range[1] + sum(p for _, _, p in pert_all)
    return {"jobs": per_job, "hours": hours, "range": (low, high), "esloc": total_esloc, "manual_pm": manual_pm,
            "pert_hours": pert_mean, "pert_sigma": pert_sigma}
