"""The page in a real browser: headless Chromium driven as a user would drive it.

``dropcalc serve --no-browser`` is started as a separate process (the command a user types) and
Debian's Chromium is driven through chromedriver (selenium). One job is built by hand, as a site
safety advisor would: the job and the conditions typed in, the outline typed, a work edge
drawn by clicking on the plan, objects added from the library, a list with one bad row read,
the wind changed (the distance must change, and the old answer must never show as current),
the PDF downloaded and read (pypdf), the scenario file downloaded, the page cleared and the file
read back (the same numbers). Script in user text must stay text.

Each state is saved as a PNG in ``tests/artifacts/web`` (or ``$DROPCALC_ARTIFACTS``) for a
person to look at. Without Chromium and chromedriver the tests are skipped, saying so; CI
installs them (``.ci/run``).
"""

from __future__ import annotations

import os
import re
import shutil
import subprocess
import sys
import tempfile
import time
from collections.abc import Iterator
from pathlib import Path
from typing import Any
from urllib.parse import urlencode

import pytest

CHROMIUM = shutil.which("chromium") or "/usr/bin/chromium"
CHROMEDRIVER = shutil.which("chromedriver") or "/usr/bin/chromedriver"
NO_CHROMIUM = not (Path(CHROMIUM).exists() and Path(CHROMEDRIVER).exists())
#: The flags the brief for this test set: no network of its own, no first-run screens.
CHROMIUM_FLAGS = (
    "--headless=new", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
    "--disable-component-update", "--disable-sync", "--no-first-run", "--window-size=1500,1900",
)  # fmt: skip
#: Longest wait for one answer [s]: the machine running the tests may be shared and slow.
ANSWER_TIMEOUT = 300
ARTIFACTS = Path(
    os.environ.get("DROPCALC_ARTIFACTS", Path(__file__).resolve().parent / "artifacts" / "web")
)

if NO_CHROMIUM:
    pytest.skip(
        "no Chromium: install Debian's chromium and chromium-driver "
        "(apt-get install -y chromium chromium-driver) to run the page in a browser",
        allow_module_level=True,
    )

webdriver = pytest.importorskip("selenium.webdriver")
from selenium.common.exceptions import NoAlertPresentException  # noqa: E402
from selenium.webdriver.chrome.service import Service  # noqa: E402
from selenium.webdriver.common.action_chains import ActionChains  # noqa: E402
from selenium.webdriver.common.by import By  # noqa: E402
from selenium.webdriver.support.ui import Select, WebDriverWait  # noqa: E402


@pytest.fixture(scope="module")
def server() -> Iterator[str]:
    """``dropcalc serve --no-browser`` on a free port; its printed address."""
    ARTIFACTS.mkdir(parents=True, exist_ok=True)
    with (ARTIFACTS / "server.log").open("w") as log:
        process = subprocess.Popen(
            [sys.executable, "-m", "dropcalc", "serve", "--no-browser"],
            stdout=subprocess.PIPE,
            stderr=log,
            text=True,
        )
        try:
            line = process.stdout.readline() if process.stdout else ""
            match = re.search(r"http://127\.0\.0\.1:\d+/", line)
            assert match, (line, (ARTIFACTS / "server.log").read_text())
            yield match.group(0)
        finally:
            process.terminate()
            process.wait(timeout=10)
            if process.stdout:
                process.stdout.close()


@pytest.fixture(scope="module")
def downloads() -> Iterator[Path]:
    with tempfile.TemporaryDirectory(prefix="dropcalc-downloads-") as folder:
        yield Path(folder)


@pytest.fixture(scope="module")
def browser(downloads: Path) -> Iterator[Any]:
    options = webdriver.ChromeOptions()
    options.binary_location = CHROMIUM
    for flag in CHROMIUM_FLAGS:
        options.add_argument(flag)
    profile = tempfile.mkdtemp(prefix="dropcalc-chromium-")
    options.add_argument(f"--user-data-dir={profile}")
    options.add_experimental_option(
        "prefs",
        {"download.default_directory": str(downloads), "download.prompt_for_download": False},
    )
    options.set_capability("goog:loggingPrefs", {"browser": "ALL"})
    driver = webdriver.Chrome(options=options, service=Service(CHROMEDRIVER))
    driver.execute_cdp_cmd(
        "Page.setDownloadBehavior", {"behavior": "allow", "downloadPath": str(downloads)}
    )
    ARTIFACTS.mkdir(parents=True, exist_ok=True)
    try:
        yield driver
    finally:
        driver.quit()
        shutil.rmtree(profile, ignore_errors=True)


# --------------------------------------------------------------------------------------------
# What a user does


def shot(driver: Any, name: str) -> None:
    """Save the whole page as ARTIFACTS/<name>.png."""
    height = driver.execute_script("return document.documentElement.scrollHeight")
    driver.set_window_size(1500, max(1200, min(int(height), 6000)))
    driver.save_screenshot(str(ARTIFACTS / f"{name}.png"))


def field(driver: Any, path: str) -> Any:
    return driver.find_element(By.CSS_SELECTOR, f'[data-field="{path}"]')


def type_into(driver: Any, path: str, text: str) -> None:
    element = field(driver, path)
    element.clear()
    element.send_keys(text)


def state(driver: Any) -> str:
    return driver.find_element(By.ID, "answer").get_attribute("data-state")


def wait_for_answer(driver: Any) -> str:
    """Wait until the page shows a current answer (or an error); return the state."""
    WebDriverWait(driver, ANSWER_TIMEOUT, poll_frequency=0.2).until(
        lambda d: state(d) in ("current", "error")
    )
    return state(driver)


def distances(driver: Any) -> list[str]:
    return [e.text for e in driver.find_elements(By.CSS_SELECTOR, "#area-cards .metres")]


def click_plan(driver: Any, x: float, y: float) -> None:
    """Click the plan at (x, y) in site metres, where the drawing shows that point."""
    plan = driver.find_element(By.ID, "plan")
    at = driver.execute_script(
        "const m = document.getElementById('plan-world').getScreenCTM();"
        "const r = document.getElementById('plan').getBoundingClientRect();"
        "return [m.a * arguments[0] + m.c * arguments[1] + m.e - (r.left + r.width / 2),"
        "        m.b * arguments[0] + m.d * arguments[1] + m.f - (r.top + r.height / 2)];",
        x,
        y,
    )
    ActionChains(driver).move_to_element_with_offset(
        plan, round(at[0]), round(at[1])
    ).click().perform()


def add_from_library(driver: Any, search: str, object_id: str) -> None:
    box = driver.find_element(By.ID, "library-search")
    box.clear()
    box.send_keys(search)
    category = driver.find_element(By.ID, "library-category").get_attribute("value")
    shows = urlencode({"search": search, "category": category})
    WebDriverWait(driver, 20).until(
        lambda d: d.find_element(By.ID, "library-list").get_attribute("data-search") == shows
    )
    button = WebDriverWait(driver, 10).until(
        lambda d: d.find_element(By.CSS_SELECTOR, f'.library-item[data-id="{object_id}"] button')
    )
    button.click()


def wait_for_file(folder: Path, name: str, timeout: float = 60) -> Path:
    target = folder / name
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        if target.exists() and not list(folder.glob("*.crdownload")):
            return target
        time.sleep(0.2)
    raise AssertionError(f"{name} not downloaded; the folder holds {os.listdir(folder)}")


# --------------------------------------------------------------------------------------------
# The job, built by hand


def test_a_job_built_by_hand(server: str, browser: Any, downloads: Path, tmp_path: Path) -> None:
    from pypdf import PdfReader

    driver = browser
    driver.get(server)
    assert driver.find_element(By.ID, "status").text.startswith("Fill in the job")
    shot(driver, "01-new-job")

    # The job and the day's conditions, typed as the demo job has them.
    type_into(driver, "job.title", "Re-roofing, Block B north elevation")
    type_into(driver, "job.site", "Larkfield Mill (Block B), Canal Row, Thornbury Vale")
    type_into(driver, "job.prepared_by", "A. Okonkwo")
    type_into(driver, "site.elevation", "85 m")
    type_into(driver, "site.air_temperature", "9 degC")
    type_into(driver, "site.humidity", "80 %")
    type_into(driver, "wind.speed", "8 m/s")
    Select(field(driver, "wind.terrain")).select_by_value("en-iii")
    Select(field(driver, "site.ground")).select_by_value("asphalt")
    # A loose Monte Carlo precision keeps each answer quick on a shared test machine.
    driver.find_element(By.CSS_SELECTOR, "#panel-method summary").click()
    type_into(driver, "policy.precision", "0.1")
    type_into(driver, "outline", "0, 0; 42, 0; 42, 16; 0, 16")

    # The north eaves: drawn on the plan, two clicks on the outline's north side.
    type_into(driver, "work_areas.0.name", "North roof edge")
    type_into(driver, "work_areas.0.edges.0.name", "north eaves")
    type_into(driver, "work_areas.0.edges.0.height", "17.5 m")
    driver.find_element(By.CSS_SELECTOR, "#areas .draw-edge").click()
    click_plan(driver, 0, 16)
    click_plan(driver, 42, 16)
    shot(driver, "02-drawing-an-edge")
    driver.find_element(By.ID, "draw-finish").click()
    assert field(driver, "work_areas.0.edges.0.points").get_attribute("value") == "0, 16; 42, 16"

    # Objects from the library.
    add_from_library(driver, "claw hammer", "claw-hammer-16oz")
    add_from_library(driver, "coupler", "double-coupler-drop-forged")
    library_text = driver.find_element(By.ID, "library-list").text
    assert " kg" in library_text
    assert "Cd·A" in library_text
    assert "mass:" in library_text  # the source of each value
    assert wait_for_answer(driver) == "current", driver.find_element(By.ID, "status").text
    first = distances(driver)
    assert len(first) == 1
    assert float(first[0]) > 2  # at least the 2 m margin
    assert driver.find_elements(By.CSS_SELECTOR, "#plan path.zone")  # drawn over the plan
    caution = driver.find_element(By.ID, "caution-short").text
    assert caution.startswith("Estimates from a simplified model")
    WebDriverWait(driver, ANSWER_TIMEOUT).until(
        lambda d: (d.find_element(By.ID, "figure-side").get_attribute("src") or "").startswith(
            "data:image/svg"
        )
    )
    shot(driver, "03-answer")

    # A list with one bad row: the good rows join, the bad one is shown with its reason.
    listing = tmp_path / "tools.csv"
    listing.write_text(
        "id,label,quantity,mass,drag_area\n"
        "cordless-drill-18v,Drill,2,,\n"
        ",Mystery box,1,heavy,0.05 m2\n",
        encoding="utf-8",
    )
    driver.find_element(By.CSS_SELECTOR, "#list-box summary").click()
    driver.find_element(By.ID, "list-file").send_keys(str(listing))
    left_out = WebDriverWait(driver, 30).until(
        lambda d: d.find_element(By.CSS_SELECTOR, "#object-rows tr.left-out")
    )
    assert "row 3" in left_out.text
    assert "Mystery box" in left_out.text
    assert "heavy" in left_out.text
    rows = driver.find_elements(By.CSS_SELECTOR, "#object-rows tr[data-field]")
    assert len(rows) == 3  # hammer, coupler, drill
    assert wait_for_answer(driver) == "current"
    shot(driver, "04-list-with-a-bad-row")

    # More wind: the old answer is marked out of date at once, then the distance grows.
    before = distances(driver)
    type_into(driver, "wind.speed", "16 m/s")
    assert state(driver) != "current"  # never the old numbers shown as current
    shot(driver, "05-out-of-date")
    assert wait_for_answer(driver) == "current"
    after = distances(driver)
    assert float(after[0]) > float(before[0]), (before, after)
    answer = driver.find_element(By.ID, "answer")
    assert answer.get_attribute("data-shown") == answer.get_attribute("data-request")
    shot(driver, "06-more-wind")

    # The report, as a site would file it.
    driver.find_element(By.CSS_SELECTOR, 'button[data-document="pdf"]').click()
    pdf = wait_for_file(downloads, "report.pdf", ANSWER_TIMEOUT)
    text = " ".join(page.extract_text() for page in PdfReader(pdf).pages)
    assert "Re-roofing, Block B north elevation" in text
    assert f"{after[0]} m" in text
    assert "Estimates from a simplified model" in text or "simplified" in text

    # The scenario file, then a new job, then the file read back: the same numbers.
    driver.find_element(By.CSS_SELECTOR, 'button[data-document="toml"]').click()
    scenario = wait_for_file(downloads, "scenario.toml")
    driver.find_element(By.ID, "new-job").click()
    assert field(driver, "job.title").get_attribute("value") == ""
    assert distances(driver) == []
    driver.find_element(By.ID, "scenario-file").send_keys(str(scenario))
    WebDriverWait(driver, 30).until(
        lambda d: field(d, "job.title").get_attribute("value").startswith("Re-roofing")
    )
    assert field(driver, "wind.speed").get_attribute("value") == "16 m/s"
    assert wait_for_answer(driver) == "current"
    assert distances(driver) == after
    shot(driver, "07-scenario-read-back")


def test_script_in_user_text_stays_text(server: str, browser: Any) -> None:
    driver = browser
    driver.get(server)
    hostile = "<img src=x onerror=\"document.title='owned'\"><script>alert(1)</script>"
    type_into(driver, "job.title", hostile)
    type_into(driver, "work_areas.0.name", hostile)
    type_into(driver, "work_areas.0.edges.0.height", "6 m")
    type_into(driver, "work_areas.0.edges.0.points", "0, 0; 8, 0")
    driver.find_element(By.CSS_SELECTOR, "#panel-method summary").click()
    type_into(driver, "policy.precision", "0.2")
    driver.find_element(By.CSS_SELECTOR, "#custom-box summary").click()
    driver.find_element(By.ID, "custom-label").send_keys(hostile)
    driver.find_element(By.ID, "custom-mass").send_keys("0.5 kg")
    driver.find_element(By.ID, "custom-drag").send_keys("0.004 m2")
    driver.find_element(By.ID, "custom-add").click()
    assert wait_for_answer(driver) == "current", driver.find_element(By.ID, "status").text
    with pytest.raises(NoAlertPresentException):
        driver.switch_to.alert.text  # noqa: B018
    assert driver.title != "owned"
    card = driver.find_element(By.CSS_SELECTOR, "#area-cards h3").text
    assert card == hostile
    assert not driver.find_elements(By.CSS_SELECTOR, "#result img:not([id^=figure])")
    shot(driver, "08-script-stays-text")


def test_an_input_error_is_shown_beside_its_field(server: str, browser: Any) -> None:
    driver = browser
    driver.get(server)
    driver.find_element(By.CSS_SELECTOR, "#panel-method summary").click()
    type_into(driver, "policy.precision", "0.2")
    add_from_library(driver, "claw hammer", "claw-hammer-16oz")
    type_into(driver, "work_areas.0.edges.0.points", "0, 0; 8, 0")
    type_into(driver, "work_areas.0.edges.0.height", "8 m")
    # A new job has no title yet: the loader asks for one, beside the title.
    assert wait_for_answer(driver) == "error"
    title = field(driver, "job.title")
    assert "invalid" in title.get_attribute("class")
    note = title.find_element(By.XPATH, "./following-sibling::span[@class='field-error']")
    assert note.text == "job.title: missing: every report needs a title"
    type_into(driver, "job.title", "Error test")
    type_into(driver, "work_areas.0.edges.0.height", "twelve")
    WebDriverWait(driver, ANSWER_TIMEOUT).until(
        lambda d: "invalid" in field(d, "work_areas.0.edges.0.height").get_attribute("class")
    )
    assert state(driver) == "error"
    assert "invalid" not in field(driver, "job.title").get_attribute("class")
    height = field(driver, "work_areas.0.edges.0.height")
    assert "invalid" in height.get_attribute("class")
    note = height.find_element(By.XPATH, "./following-sibling::span[@class='field-error']")
    assert 'work_area[1].edge[1].height: could not read "twelve" as a length' in note.text
    shot(driver, "09-error-beside-the-field")


def test_the_demo_job_fills_the_form_and_shows_it_is_computing(server: str, browser: Any) -> None:
    driver = browser
    driver.get(server)
    driver.find_element(By.ID, "load-demo").click()
    WebDriverWait(driver, 30).until(
        lambda d: field(d, "job.title").get_attribute("value").startswith("Re-roofing")
    )
    assert field(driver, "wind.speed").get_attribute("value") == "8 m/s"
    assert (
        field(driver, "work_areas.1.edges.0.points").get_attribute("value") == "43.5, -1; 43.5, 17"
    )
    assert len(driver.find_elements(By.CSS_SELECTOR, "#object-rows tr[data-field]")) == 14
    WebDriverWait(driver, 30).until(lambda d: state(d) == "computing")
    assert driver.find_element(By.ID, "status").text == "Computing…"
    shot(driver, "10-demo-computing")
