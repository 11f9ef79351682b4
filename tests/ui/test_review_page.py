"""The review in a real browser: headless Chromium (Debian's package, driven by Playwright).

The index and a job page must work opened from disk with no request leaving them and log no console
error; the index filters and searches its jobs; a job page links lines both ways (clicking a Python
step highlights the Java lines it came from) and moves to the next job and back to the index.
"""
from __future__ import annotations

import json
import os
import shutil

import pytest

CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
# .ci/run installs Chromium and sets this, so that a missing browser fails CI instead of skipping
REQUIRED = os.environ.get("MRLIFT_REQUIRE_BROWSER") == "1"
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync"]


@pytest.fixture(scope="module")
def browser():
    if CHROMIUM is None:
        if REQUIRED:
            pytest.fail("Chromium is not installed (apt-get install chromium)")
        pytest.skip("Chromium is not installed (apt-get install chromium); .ci/run installs it")
    from playwright.sync_api import sync_playwright

    with sync_playwright() as p:
        b = p.chromium.launch(executable_path=CHROMIUM, args=FLAGS)
        yield b
        b.close()


def _watch(page, requests: list, problems: list) -> None:
    page.on("request", lambda r: requests.append(r.url))
    page.on("console", lambda m: problems.append(m.text) if m.type == "error" else None)
    page.on("pageerror", lambda e: problems.append(str(e)))


def test_review_index_opens_from_disk_offline_filters_and_searches(browser, converted_samples, tmp_path):
    out_dir, report = converted_samples
    requests, problems = [], []
    page = browser.new_page(viewport={"width": 1400, "height": 900})
    _watch(page, requests, problems)
    page.goto((out_dir / "review.html").as_uri())
    page.screenshot(path=str(tmp_path / "index.png"))
    assert (tmp_path / "index.png").stat().st_size > 10_000
    assert [u for u in requests if not u.startswith(("file:", "data:"))] == []
    assert problems == []
    # the numbers on the page are report.json's, and every job is a row
    shown = json.loads(page.locator("#report-numbers").text_content())
    assert shown["summary"] == json.loads((out_dir / "report.json").read_text())["summary"]
    rows = page.locator("table.jobs tbody tr")
    assert rows.count() == len(report["jobs"])

    def visible() -> list:
        return [r for r in rows.all() if "hidden" not in (r.get_attribute("class") or "")]

    # a status filter hides the rows of that status
    page.locator(".filters input[value=converted]").uncheck()
    assert len(visible()) == sum(1 for j in report["jobs"] if j["status"] != "converted")
    assert page.locator("#shown").text_content() == str(len(visible()))
    page.locator(".filters input[value=converted]").check()
    # the search finds a job by the name of any of its classes
    job = next(j for j in report["jobs"] if j["classes"].get("mapper"))
    mapper = job["classes"]["mapper"].rsplit(".", 1)[-1]
    page.locator("#search").fill(mapper.lower())
    found = visible()
    expected = [j for j in report["jobs"]
                if mapper.lower() in " ".join([j["driver"], *j["classes"].values()]).lower()]
    assert len(found) == len(expected) >= 1
    # the header row of the table stands below the sticky page header
    header = page.locator("header").bounding_box()
    assert page.locator("table.jobs").bounding_box()["y"] >= header["y"] + header["height"] - 1
    page.close()


def test_a_job_page_links_lines_both_ways_and_moves_between_jobs(browser, converted_samples, tmp_path):
    out_dir, report = converted_samples
    requests, problems = [], []
    page = browser.new_page(viewport={"width": 1400, "height": 900})
    _watch(page, requests, problems)
    page.goto((out_dir / "review.html").as_uri())
    with page.expect_navigation():
        page.locator("table.jobs tbody tr a").first.click()  # the index's first row opens the job's page
    first = report["jobs"][0]
    assert page.url.endswith(f"review/{first['script'].removesuffix('.py')}.html")
    assert first["name"] in page.locator("h2").text_content()
    page.screenshot(path=str(tmp_path / "job.png"))
    assert (tmp_path / "job.png").stat().st_size > 10_000
    # click the first Python step: the Java lines it names light up
    step = page.locator(".python .step").first
    targets = step.get_attribute("data-java").split()
    step.click()
    for t in targets:
        assert "hl" in page.locator(f"#{t}").get_attribute("class").split()
    # and back: a Java line linked to Python lights those up
    java = page.locator(f"#{targets[0]}")
    back = java.get_attribute("data-py").split()
    java.click()
    assert all("hl" in page.locator(f"#{b}").get_attribute("class").split() for b in back)
    # a script line wider than its pane scrolls inside the pane instead of being cut off
    pane = page.locator(".python")
    widths = pane.evaluate("e => [e.scrollWidth, e.clientWidth, getComputedStyle(e).overflowX]")
    box = pane.bounding_box()
    assert widths[2] == "auto" and box["x"] + box["width"] <= 1400 + 1
    # `j` opens the next job's page, `u` the index
    with page.expect_navigation():
        page.keyboard.press("j")
    assert report["jobs"][1]["name"] in page.locator("h2").text_content()
    with page.expect_navigation():
        page.keyboard.press("u")
    assert page.url.endswith("/review.html")
    assert [u for u in requests if not u.startswith(("file:", "data:"))] == []
    assert problems == []
    page.close()
