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


# ---------------------------------------------------------------- properties of the proposed model (EFFORT.md)
import json  # noqa: E402
import random  # noqa: E402


def _random_jobs(rng: random.Random, n: int) -> list:
    jobs = []
    for k in range(n):
        total = rng.randint(10, 900)
        items = tuple((rng.choice(["P1", "P2", "P3"]), rng.randint(1, 200)) for _ in range(rng.randint(0, 4)))
        jobs.append(E.JobEffort(f"job{k}", total, items))
    return jobs


@pytest.mark.parametrize("seed", range(20))
def test_job_hours_add_up_to_the_repository_total(seed):
    est = E.repository_hours(_random_jobs(random.Random(seed), 1 + seed % 7))
    assert sum(est["jobs"].values()) == pytest.approx(est["hours"])
    assert est["range"][0] <= est["hours"] <= est["range"][1]


@pytest.mark.parametrize("seed", range(20))
def test_more_hand_work_never_lowers_the_estimate(seed):
    rng = random.Random(seed)
    jobs = _random_jobs(rng, 1 + seed % 5)
    before = E.repository_hours(jobs)["hours"]
    k = rng.randrange(len(jobs))
    j = jobs[k]
    more = E.JobEffort(j.name, j.sloc_total, j.items + ((rng.choice(["P1", "P2", "P3"]), rng.randint(1, 200)),))
    after = E.repository_hours(jobs[:k] + [more] + jobs[k + 1:])["hours"]
    assert after >= before - 1e-9


# ---------------------------------------------------------------- the team's own constants and PERT hours
JOBS = [E.JobEffort("A", 120, ()),
        E.JobEffort("B", 400, (("P2", 40, "dates"), ("P1", 20, "counter"), ("P2", 40, "dates"))),
        E.JobEffort("C", 900, (("P3", 250, "io-in-task"), ("P1", 50, "counter"), ("P1", 100, "side-files")))]


def test_the_default_model_is_the_published_one_and_says_so():
    est = E.repository_hours(JOBS)
    assert est["hours"] == pytest.approx(265.686, abs=1e-3)  # EFFORT.md repository example [D]
    assert E.DEFAULT.basis["a"].startswith("published") and E.DEFAULT.basis["unfm"].startswith("mrlift default")


def test_a_file_overrides_constants_and_labels_them(tmp_path):
    f = tmp_path / "effort.toml"
    f.write_text("[cocomo]\nhours_per_pm = 160\n[adaptation]\nunfm = 0.0\n[categories]\ncounter = \"P3\"\n")
    m = E.load_model(f)
    assert m.hours_per_pm == 160 and m.basis["hours_per_pm"] == "your file (effort.toml)"
    assert m.basis["a"].startswith("published")
    assert m.category_profiles == {"counter": "P3"}
    base = E.repository_hours(JOBS)
    est = E.repository_hours(JOBS, m)
    # job A is all automatic: its hours scale with hours per person-month only
    assert est["jobs"]["A"] == pytest.approx(base["jobs"]["A"] * 160 / 152)


def test_pert_hours_replace_cocomo_for_their_category(tmp_path):
    f = tmp_path / "effort.toml"
    f.write_text("[pert.dates]\noptimistic = 2\nlikely = 4\npessimistic = 12\n")
    m = E.load_model(f)
    est = E.repository_hours(JOBS, m)
    # the two dates items leave the COCOMO run and come back as PERT hours: 2 x mean 5.0 (EFFORT.md PERT [D])
    assert est["pert_hours"] == pytest.approx(10.0) and est["pert_sigma"] == pytest.approx((2 * 1.6667 ** 2) ** 0.5,
                                                                                           abs=1e-3)
    # by the model's arithmetic: COCOMO on the other items' ESLOC, the lines stay hand-written (not automatic)
    esloc = 20 * 0.74 + 250 * 1.18 + 50 * 0.74 + 100 * 0.74
    auto = 120 + 300 + 500
    assert est["esloc"] == pytest.approx(esloc)
    assert est["hours"] == pytest.approx((E.person_months(esloc / 1000) + auto / 2400) * 152 + 10.0)
    assert sum(est["jobs"].values()) == pytest.approx(est["hours"])
    assert est["range"][0] < est["hours"] < est["range"][1]


@pytest.mark.parametrize("text, message", [
    ("[cocomo]\nA = 3\n", "unknown key cocomo.A"),
    ("[cocomo]\nrange = 1.2\n", "cocomo.range must be two numbers"),
    ("[categories]\ndates = \"P9\"\n", "is not a profile"),
    ("[pert.dates]\noptimistic = 5\nlikely = 4\npessimistic = 6\n", "optimistic ≤ likely"),
    ("[effort]\n", "unknown table [effort]"),
    ("not toml = = 1", "effort.toml"),
])
def test_a_bad_effort_file_names_itself_and_the_key(tmp_path, text, message):
    f = tmp_path / "effort.toml"
    f.write_text(text)
    with pytest.raises(E.EffortConfigError, match=message.replace("[", r"\[").replace("]", r"\]")):
        E.load_model(f)


def test_convert_takes_an_effort_file_and_refuses_a_bad_one(tmp_path, capsys):
    from migrate.cli import main
    from tests.conftest import SAMPLES

    good = tmp_path / "good.toml"
    good.write_text("[cocomo]\nhours_per_pm = 140\n")
    assert main(["convert", str(SAMPLES), "-o", str(tmp_path / "out"), "--effort", str(good)]) == 0
    report = json.loads((tmp_path / "out" / "report.json").read_text())
    hp = [c for c in report["effort"]["constants"] if c["name"] == "hours_per_pm"]
    assert hp == [{"name": "hours_per_pm", "value": 140.0, "basis": "your file (good.toml)"}]
    bad = tmp_path / "bad.toml"
    bad.write_text("[cocomo]\nhours = 1\n")
    assert main(["convert", str(SAMPLES), "-o", str(tmp_path / "out2"), "--effort", str(bad)]) == 2
    assert "bad.toml: unknown key cocomo.hours" in capsys.readouterr().out
    assert not (tmp_path / "out2").exists()  # nothing written
