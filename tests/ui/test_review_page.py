"""review.html in a real browser: headless Chromium (Debian's package, driven by Playwright).

The page must work opened from disk with no request leaving it, log no console error, and link
lines both ways: clicking a Python step highlights the Java lines it came from.
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


def test_review_page_opens_from_disk_offline_and_links_lines(browser, converted_samples, tmp_path):
    out_dir, report = converted_samples
    page_file = out_dir / "review.html"
    requests, problems = [], []
    page = browser.new_page(viewport={"width": 1400, "height": 900})
    page.on("request", lambda r: requests.append(r.url))
    page.on("console", lambda m: problems.append(m.text) if m.type == "error" else None)
    page.on("pageerror", lambda e: problems.append(str(e)))
    page.goto(page_file.as_uri())
    page.screenshot(path=str(tmp_path / "review.png"))
    assert (tmp_path / "review.png").stat().st_size > 10_000
    assert [u for u in requests if not u.startswith(("file:", "data:"))] == []
    assert problems == []
    # the numbers on the page are report.json's
    shown = json.loads(page.locator("#report-numbers").text_content())
    assert shown["summary"] == json.loads((out_dir / "report.json").read_text())["summary"]
    assert len(page.locator("section.job").all()) == len(report["jobs"])
    # click the first Python step of the first job: the Java lines it names light up
    step = page.locator("section.job").first.locator(".python .step").first
    targets = step.get_attribute("data-java").split()
    step.click()
    for t in targets:
        assert "hl" in page.locator(f"#{t}").get_attribute("class").split()
    # and back: a Java line linked to Python lights those up
    java = page.locator(f"#{targets[0]}")
    back = java.get_attribute("data-py").split()
    java.click()
    assert all("hl" in page.locator(f"#{b}").get_attribute("class").split() for b in back)
    # a filter hides jobs of a status; `j` moves to the next visible job
    page.locator(".filters input[value=converted]").uncheck()
    visible = [s for s in page.locator("section.job").all() if "hidden" not in (s.get_attribute("class") or "")]
    assert len(visible) == sum(1 for j in report["jobs"] if j["status"] != "converted")
    page.keyboard.press("j")
    assert "current" in visible[0].get_attribute("class")
    # the job's title stands below the sticky header, not under it
    title = visible[0].locator("h2").bounding_box()
    header = page.locator("header").bounding_box()
    assert title["y"] >= header["y"] + header["height"] - 1
    # a script line wider than its pane scrolls inside the pane instead of being cut off
    pane = visible[0].locator(".python")
    widths = pane.evaluate("e => [e.scrollWidth, e.clientWidth, getComputedStyle(e).overflowX]")
    box = pane.bounding_box()
    assert widths[2] == "auto" and box["x"] + box["width"] <= 1400 + 1
    page.close()
