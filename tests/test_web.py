"""The local page (``dropcalc serve``) over HTTP: every endpoint, with good and hostile input.

The page adds no physics, so the checks here are about the way in and out: a form becomes the
scenario file ``dropcalc report`` reads and comes back unchanged; the loader's messages come
back beside the field they are about; files the user uploads are size-limited, read under a
fixed name and never used as a path; user text comes back as data, never as markup; the
documents are the ones ``dropcalc report``/``demo`` write for the same scenario.

The outside references are the TOML reader of the standard library (:mod:`tomllib`, TOML 1.0),
which must read back every string :func:`toml_string` writes, and the scenario loader, which
the page must agree with (the same Scenario from the form's file as from the hand-written one).
"""

from __future__ import annotations

import io
import json
import math
import re
import subprocess
import sys
import tomllib
from pathlib import Path
from typing import Any
from xml.etree import ElementTree

import pytest
from hypothesis import given
from hypothesis import strategies as st
from starlette.testclient import TestClient

from dropcalc.errors import InputError
from dropcalc.io.scenario import load_scenario
from dropcalc.resources import data_path
from dropcalc.web import service
from dropcalc.web.app import MAX_BODY_BYTES, create_app
from dropcalc.web.form import (
    MAX_OBJECTS,
    OBJECT_FIELDS,
    check_form,
    field_of_key,
    form_to_toml,
    toml_string,
    toml_to_form,
)

DEMO = data_path("templates") / "demo"
HOSTILE = '<script>alert("x")</script><img src=x onerror=alert(1)>'


def small_form(**changes: Any) -> dict[str, Any]:
    """One work area, one edge, one library object; a loose Monte Carlo precision (fast)."""
    form = service.empty_form()
    form["job"]["title"] = "Page test"
    form["wind"]["speed"] = "5 m/s"
    form["policy"]["precision"] = "0.2"
    form["work_areas"][0]["edges"][0].update(points=[[0, 0], [10, 0]], height="10 m")
    form["objects"] = [
        {**dict.fromkeys(OBJECT_FIELDS, ""), "id": "combination-spanner-19mm", "quantity": "2"}
    ]
    for path, value in changes.items():
        *parents, last = path.split(".")
        node: Any = form
        for key in parents:
            node = node[int(key)] if isinstance(node, list) else node[key]
        node[last] = value
    return form


@pytest.fixture(scope="module")
def client() -> TestClient:
    return TestClient(create_app())


# --------------------------------------------------------------------------------------------
# Form <-> scenario file


def _demo_form() -> dict[str, Any]:
    return service.demo_form()


def test_demo_form_round_trip_is_lossless() -> None:
    form = _demo_form()
    assert toml_to_form(form_to_toml(form)) == form


def test_form_file_loads_to_the_same_scenario_as_the_hand_written_one(tmp_path: Path) -> None:
    # The reference is the loader reading the demo's own file (with its objects_file).
    original = load_scenario(DEMO / "scenario.toml")
    page_file = tmp_path / "scenario.toml"
    page_file.write_text(form_to_toml(_demo_form()), encoding="utf-8")
    from_page = load_scenario(page_file)
    assert from_page.job == original.job
    assert from_page.air == original.air
    assert from_page.wind == original.wind
    assert from_page.wind_from_given == original.wind_from_given
    assert from_page.ground == original.ground
    assert from_page.origin == original.origin
    assert from_page.work_areas == original.work_areas
    assert [
        (i.label, i.quantity, i.mass, i.drag_area_min, i.drag_area_max) for i in from_page.items
    ] == [(i.label, i.quantity, i.mass, i.drag_area_min, i.drag_area_max) for i in original.items]
    assert (from_page.confidence, from_page.margin, from_page.seed, from_page.levels) == (
        original.confidence, original.margin, original.seed, original.levels,
    )  # fmt: skip


@given(st.text(alphabet=st.characters(blacklist_categories=("Cs",)), max_size=60))
def test_toml_string_is_read_back_by_tomllib(text: str) -> None:
    assert tomllib.loads(f"a = {toml_string(text)}")["a"] == text


def test_hostile_text_survives_the_file_as_text() -> None:
    form = small_form(**{"job.title": HOSTILE + '"\n\\', "objects.0.label": HOSTILE})
    again = toml_to_form(form_to_toml(form))
    assert again["job"]["title"] == HOSTILE + '"\n\\'.strip()
    assert again["objects"][0]["label"] == HOSTILE


@pytest.mark.parametrize(
    ("form", "field"),
    [
        ({"job": {"title": ["a", "list"]}}, "job.title"),
        ({"job": {"title": {"nested": 1}}}, "job.title"),
        ({"job": {"colour": "red"}}, "job.colour"),
        ({"site": "not a table"}, "site"),
        ({"work_areas": "many"}, "work_areas"),
        ({"work_areas": [{"edges": [{"points": "0, 0; 1"}]}]}, "work_areas.0.edges.0.points"),
        ({"work_areas": [{"edges": [{"points": [[0, "x"]]}]}]}, "work_areas.0.edges.0.points[0]"),
        ({"work_areas": [{"edges": [{"points": [[0, True]]}]}]}, "work_areas.0.edges.0.points[0]"),
        ({"objects": [{"mass": 1e400}]}, "objects.0.mass"),
        ({"objects": [{}] * (MAX_OBJECTS + 1)}, "objects"),
        ({"job": {"title": "x" * 5000}}, "job.title"),
        ({"job": {"title": "\ud800"}}, "job.title"),
        ({"unknown": 1}, "form.unknown"),
        ([1, 2], "form"),
    ],
)
def test_check_form_names_the_field_of_a_malformed_form(form: Any, field: str) -> None:
    with pytest.raises(InputError, match=rf"^{re.escape(field)}[:\[ ]"):
        check_form(form)


def test_field_of_key_maps_scenario_keys_to_form_fields() -> None:
    assert field_of_key("work_area[2].edge[3].height") == "work_areas.1.edges.2.height"
    assert field_of_key("object[4].mass") == "objects.3.mass"
    assert field_of_key("site.origin.lon") == "site.origin_lon"
    assert field_of_key("site.outline") == "outline"
    assert field_of_key("wind") == "wind.speed"


def test_typed_points_are_read() -> None:
    form = check_form({"outline": "0, 0; 42 0\n42,16; (0, 16)"})
    assert form["outline"] == [[0, 0], [42, 0], [42, 16], [0, 16]]


# --------------------------------------------------------------------------------------------
# The page, the library, the demo


def test_page_is_served_with_a_strict_content_policy(client: TestClient) -> None:
    response = client.get("/")
    assert response.status_code == 200
    policy = response.headers["content-security-policy"]
    assert "script-src 'self'" in policy
    assert "unsafe-inline" not in policy
    boot = re.search(r'<script type="application/json" id="boot">(.*?)</script>', response.text)
    assert boot is not None
    data = json.loads(boot.group(1))
    assert "asphalt" in dict(data["choices"]["grounds"])
    assert "Read before use" in response.text  # the cautions are on the page
    for asset in ("/static/page.js", "/static/page.css", "/static/icon.svg"):
        assert client.get(asset).status_code == 200, asset
    assert "http" not in client.get("/static/page.js").text.replace("http://www.w3.org", "")


def test_page_answers_only_to_local_host_names(client: TestClient) -> None:
    response = client.get("/", headers={"host": "attacker.example"})
    assert response.status_code == 400


def test_static_files_do_not_leave_their_folder(client: TestClient) -> None:
    for path in ("/static/../app.py", "/static/%2e%2e/app.py", "/static/..%2fapp.py"):
        response = client.get(path)
        assert response.status_code == 404, path
        assert "create_app" not in response.text


def test_library_search_and_category(client: TestClient) -> None:
    found = client.get("/api/library", params={"search": "claw hammer"}).json()["objects"]
    assert [o["id"] for o in found][:1] == ["claw-hammer-16oz"]
    hammer = found[0]
    assert hammer["mass_kg"] > 0
    assert hammer["drag_area_min_m2"] <= hammer["drag_area_max_m2"]
    assert hammer["source"]
    listing = client.get("/api/library", params={"category": "hand-tools"}).json()
    assert "hand-tools" in listing["categories"]
    tools = listing["objects"]
    assert tools
    assert {o["category"] for o in tools} == {"hand-tools"}


@pytest.mark.parametrize(
    "params", [{"category": "<b>nope</b>"}, {"search": "x" * 10_000}, {"category": "../../etc"}]
)
def test_library_refuses_bad_queries_with_a_message(client: TestClient, params: dict) -> None:
    response = client.get("/api/library", params=params)
    assert response.status_code == 400
    (error,) = response.json()["errors"]
    assert error["field"] == "library"
    assert error["message"]


def test_demo_form_matches_the_demo_files(client: TestClient) -> None:
    form = client.get("/api/demo").json()["form"]
    assert form["job"]["title"].startswith("Re-roofing")
    assert len(form["work_areas"]) == 2
    listed = sum(1 for line in (DEMO / "items.csv").read_text().splitlines()[1:] if line.strip())
    inline = len(tomllib.loads((DEMO / "scenario.toml").read_text())["object"])
    assert len(form["objects"]) == listed + inline


# --------------------------------------------------------------------------------------------
# Computing


def test_compute_answers_with_the_loader_and_the_job(client: TestClient) -> None:
    form = small_form(**{"job.title": HOSTILE, "objects.0.label": HOSTILE})
    response = client.post("/api/compute", json={"request_id": 7, "form": form})
    assert response.status_code == 200, response.text
    answer = response.json()
    assert answer["request_id"] == 7
    (area,) = answer["areas"]
    assert area["finite"]
    assert area["radius_m"] > 0
    assert float(area["keep_clear"]) >= area["radius_m"]  # rounded up, never down
    assert area["zone"]
    assert area["zone"][0][0][0] == area["zone"][0][0][-1]
    assert answer["caution"].startswith("Estimates from a simplified model")
    # Every item with the control rules that apply to it, as a list of texts.
    assert answer["controls"]
    assert all(isinstance(c["item"], str) for c in answer["controls"])
    assert all(c["controls"] and isinstance(c["controls"], list) for c in answer["controls"])
    assert answer["objects"][0]["label"] == HOSTILE  # data, shown with textContent
    assert "figures" not in answer  # they follow in their own request
    drawn = client.post("/api/figures", json={"request_id": 7, "form": form}).json()
    assert drawn["request_id"] == 7
    for name in ("side_view", "energy_height"):
        uri = drawn["figures"][name]
        assert uri.startswith("data:image/svg+xml;base64,")
        import base64

        svg = base64.b64decode(uri.split(",", 1)[1]).decode("utf-8")
        # The labels are in the drawing as text, never as elements or event attributes.
        root = ElementTree.fromstring(svg)
        tags = {element.tag.rsplit("}", 1)[-1] for element in root.iter()}
        attributes = {name for element in root.iter() for name in element.attrib}
        assert "svg" in tags
        assert not tags & {"script", "foreignObject", "img", "iframe"}
        assert not [name for name in attributes if name.lower().startswith("on")]
    # The same input again comes from the cache with the same numbers.
    again = client.post("/api/compute", json={"request_id": 8, "form": form}).json()
    assert again["cached"]
    assert again["areas"][0]["radius_m"] == area["radius_m"]


def test_compute_puts_the_cli_message_beside_the_field(client: TestClient, tmp_path: Path) -> None:
    form = small_form(**{"work_areas.0.edges.0.height": "twelve"})
    response = client.post("/api/compute", json={"request_id": 1, "form": form})
    assert response.status_code == 422
    (error,) = response.json()["errors"]
    assert error["field"] == "work_areas.0.edges.0.height"
    # The same message as dropcalc report gives for the same file, without file and line.
    path = tmp_path / "scenario.toml"
    path.write_text(form_to_toml(check_form(form)), encoding="utf-8")
    with pytest.raises(InputError) as cli_error:
        load_scenario(path)
    assert str(cli_error.value).endswith(error["message"])
    assert error["message"].startswith("work_area[1].edge[1].height: ")


@pytest.mark.parametrize(
    ("change", "field"),
    [
        ({"wind.speed": "fast"}, "wind.speed"),
        ({"site.ground": "lava"}, "site.ground"),
        ({"objects.0.id": "no-such-thing"}, "objects.0.id"),
        ({"objects.0.quantity": "-3"}, "objects.0.quantity"),
        ({"policy.confidence": "2"}, "policy.confidence"),
        ({"site.origin_lat": "north"}, "site.origin_lat"),
        ({"work_areas.0.edges.0.points": [[0, 0]]}, "work_areas.0.edges.0.points"),
    ],
)
def test_compute_errors_name_their_field(client: TestClient, change: dict, field: str) -> None:
    response = client.post("/api/compute", json={"request_id": 1, "form": small_form(**change)})
    assert response.status_code == 422, response.text
    (error,) = response.json()["errors"]
    assert error["field"] == field, error


@pytest.mark.parametrize(
    ("body", "headers"),
    [
        (b"not json", {"content-type": "application/json"}),
        (b"[1, 2, 3]", {"content-type": "application/json"}),
        (b'{"form": {}}', {"content-type": "application/json"}),
        (b'{"request_id": "7", "form": {}}', {"content-type": "application/json"}),
        (b'{"request_id": 1, "form": {}}', {"content-type": "text/plain"}),
        (b"[" * 100_000 + b"]" * 100_000, {"content-type": "application/json"}),
    ],
)
def test_compute_refuses_malformed_requests(client: TestClient, body: bytes, headers: dict) -> None:
    response = client.post("/api/compute", content=body, headers=headers)
    assert response.status_code in (400, 422), response.text
    assert response.json()["errors"][0]["message"]


def test_compute_refuses_a_form_of_the_wrong_shape(client: TestClient) -> None:
    response = client.post("/api/compute", json={"request_id": 1, "form": {"objects": "all"}})
    assert response.status_code == 422
    assert response.json()["errors"][0]["field"] == "objects"


# --------------------------------------------------------------------------------------------
# Uploads

GOOD_AND_BAD = (
    "id,label,quantity,mass,drag_area\n"
    "claw-hammer-16oz,Hammer,2,,\n"
    ",Heavy thing,1,heavy,0.01 m2\n"
    ",Custom block,3,2 kg,0.01 m2\n"
)


def test_object_list_keeps_good_rows_and_names_bad_ones(client: TestClient) -> None:
    files = {"file": ("../../../../etc/passwd.csv", GOOD_AND_BAD.encode(), "text/csv")}
    response = client.post("/api/objects", files=files)
    assert response.status_code == 200, response.text
    answer = response.json()
    assert [o["label"] for o in answer["objects"]] == ["Hammer", "Custom block"]
    (bad,) = answer["row_errors"]
    assert bad["row"] == 3
    assert bad["label"] == "Heavy thing"
    assert "mass" in bad["message"]
    assert "heavy" in bad["message"]
    assert not Path("/etc/passwd.csv").exists()


def test_object_list_from_xlsx(client: TestClient) -> None:
    import openpyxl

    book = openpyxl.Workbook()
    sheet = book.active
    for row in (["id", "quantity"], ["claw-hammer-16oz", 3], ["nothing-like-this", 1]):
        sheet.append(row)
    data = io.BytesIO()
    book.save(data)
    files = {"file": ("list.xlsx", data.getvalue(), "application/octet-stream")}
    answer = client.post("/api/objects", files=files).json()
    assert [o["id"] for o in answer["objects"]] == ["claw-hammer-16oz"]
    assert answer["row_errors"][0]["row"] == 3


@pytest.mark.parametrize(
    ("name", "data", "words"),
    [
        ("list.exe", b"id\nclaw-hammer-16oz\n", "must end in .csv or .xlsx"),
        ("list.xlsx", b"not a zip file", "cannot read the table"),
        ("list.csv", b"colour\nred\n", "needs an 'id' column"),
        ("list.csv", b"", "list.csv"),
        ("C:\\Users\\me\\secret\\list.csv", b"colour\nred\n", "list.csv: needs"),
    ],
)
def test_object_list_refuses_unreadable_files(
    client: TestClient, name: str, data: bytes, words: str
) -> None:
    response = client.post("/api/objects", files={"file": (name, data, "text/csv")})
    assert response.status_code == 400, response.text
    message = response.json()["errors"][0]["message"]
    assert words in message
    assert "/tmp" not in message
    assert "dropcalc-page-" not in message


def test_object_list_without_a_file(client: TestClient) -> None:
    response = client.post("/api/objects", data={"file": "just text"})
    assert response.status_code == 400


def test_huge_uploads_are_refused(client: TestClient) -> None:
    big = b"id\n" + b"claw-hammer-16oz\n" * (MAX_BODY_BYTES // 17 + 10)
    response = client.post("/api/objects", files={"file": ("big.csv", big, "text/csv")})
    assert response.status_code == 413
    assert "limit" in response.json()["errors"][0]["message"]


def test_huge_bodies_without_a_length_are_refused(client: TestClient) -> None:
    def chunks():  # streamed: no Content-Length to refuse it by
        for _ in range(MAX_BODY_BYTES // 65536 + 2):
            yield b"[" * 65536

    response = client.post(
        "/api/compute", content=chunks(), headers={"content-type": "application/json"}
    )
    assert response.status_code == 413


def test_a_file_just_over_the_upload_limit_is_refused(client: TestClient) -> None:
    data = b"id\n" + b"x" * service.MAX_UPLOAD_BYTES
    response = client.post("/api/objects", files={"file": ("list.csv", data, "text/csv")})
    assert response.status_code == 400
    assert "MB limit" in response.json()["errors"][0]["message"]


def test_scenario_upload_fills_the_form(client: TestClient) -> None:
    files = {
        "scenario": ("scenario.toml", (DEMO / "scenario.toml").read_bytes(), "application/toml"),
        "list": ("items.csv", (DEMO / "items.csv").read_bytes(), "text/csv"),
    }
    response = client.post("/api/scenario", files=files)
    assert response.status_code == 200, response.text
    answer = response.json()
    assert answer["errors"] == []
    assert answer["row_errors"] == []
    assert answer["form"] == service.demo_form()


@pytest.mark.parametrize(
    ("text", "words"),
    [
        ('objects_file = "items.csv"\n[job]\ntitle = "t"\n', "choose that file together"),
        ('[job]\ntitle = "t"\n[policy]\nrules_file = "/etc/passwd"\n', "reads no other file"),
        ("[job\n", "not valid TOML"),
        ('[job]\ntitle = "t"\n[[work_area]]\nedge = 3\n', "work_area[1].edge"),
    ],
)
def test_scenario_upload_refusals(client: TestClient, text: str, words: str) -> None:
    files = {"scenario": ("s.toml", text.encode(), "application/toml")}
    response = client.post("/api/scenario", files=files)
    assert response.status_code == 400, response.text
    assert words in response.json()["errors"][0]["message"]


def test_scenario_upload_not_utf8(client: TestClient) -> None:
    files = {"scenario": ("s.toml", b'[job]\ntitle = "\xff\xfe"\n', "application/toml")}
    response = client.post("/api/scenario", files=files)
    assert response.status_code == 400
    assert "UTF-8" in response.json()["errors"][0]["message"]


def test_scenario_upload_with_a_bad_value_fills_the_form_and_marks_the_field(
    client: TestClient,
) -> None:
    text = form_to_toml(check_form(small_form(**{"wind.speed": "a gale"})))
    files = {"scenario": ("s.toml", text.encode(), "application/toml")}
    answer = client.post("/api/scenario", files=files).json()
    assert answer["form"]["wind"]["speed"] == "a gale"
    assert [e["field"] for e in answer["errors"]] == ["wind.speed"]


# --------------------------------------------------------------------------------------------
# Documents


def test_scenario_download_is_what_dropcalc_report_reads(
    client: TestClient, tmp_path: Path
) -> None:
    form = small_form()
    response = client.post("/download/toml", json=form)
    assert response.status_code == 200
    assert 'filename="scenario.toml"' in response.headers["content-disposition"]
    path = tmp_path / "scenario.toml"
    path.write_bytes(response.content)
    scenario = load_scenario(path)
    assert scenario.job["title"] == "Page test"
    # ...and reads back into the same form.
    files = {"scenario": ("scenario.toml", response.content, "application/toml")}
    assert client.post("/api/scenario", files=files).json()["form"] == check_form(form)


def test_documents_of_a_computed_job(client: TestClient) -> None:
    from pypdf import PdfReader

    form = small_form(**{"site.origin_lat": "53.74", "site.origin_lon": "-2.01"})
    answer = client.post("/api/compute", json={"request_id": 1, "form": form}).json()
    keep = answer["areas"][0]["keep_clear"]
    pdf = client.post("/download/pdf", data={"form": json.dumps(form)})
    assert pdf.status_code == 200
    assert pdf.content.startswith(b"%PDF")
    text = " ".join(page.extract_text() for page in PdfReader(io.BytesIO(pdf.content)).pages)
    assert "Page test" in text
    assert keep in text
    results = client.post("/download/json", json=form).json()
    assert math.isclose(
        results["summary"]["work_areas"][0]["radius_m"], answer["areas"][0]["radius_m"]
    )
    csv = client.post("/download/csv", json=form).text
    assert csv.splitlines()[0].startswith("row,label,id")
    geojson = client.post("/download/geojson", json=form).json()
    assert geojson["type"] == "FeatureCollection"
    assert geojson["features"]


def test_geojson_needs_the_origin(client: TestClient) -> None:
    response = client.post("/download/geojson", json=small_form())
    assert response.status_code == 422
    assert response.json()["errors"][0]["field"] == "site.origin_lat"


@pytest.mark.parametrize(
    ("path", "kwargs", "status"),
    [
        ("/download/exe", {"json": {}}, 404),
        ("/download/pdf", {"data": {"form": "{not json"}}, 400),
        ("/download/pdf", {"data": {"other": "1"}}, 400),
        ("/download/pdf", {"json": {"job": {"title": 5, "site": []}}}, 422),
    ],
)
def test_download_refusals(client: TestClient, path: str, kwargs: dict, status: int) -> None:
    response = client.post(path, **kwargs)
    assert response.status_code == status, response.text
    assert response.json()["errors"][0]["message"]


# --------------------------------------------------------------------------------------------
# Layers


def test_nothing_below_the_page_imports_it() -> None:
    package = Path(__file__).resolve().parents[1] / "dropcalc"
    offenders = [
        str(path.relative_to(package))
        for path in package.rglob("*.py")
        if "web" not in path.relative_to(package).parts
        and path.name != "cli.py"
        and re.search(r"^\s*(from|import) dropcalc\.web", path.read_text(), re.M)
    ]
    assert offenders == []


# --------------------------------------------------------------------------------------------
# Superseded requests and the command


def test_a_superseded_compute_stops(tmp_path: Path) -> None:
    import threading

    cancelled = threading.Event()
    cancelled.set()  # the page has already moved on
    cache = service.JobCache()
    with pytest.raises(service.Superseded):
        service.compute(small_form(), cache, cancelled)
    # Nothing half-done is cached: the same input later runs in full.
    answer = service.compute(small_form(), cache)
    assert answer["cached"] is False
    assert answer["areas"][0]["finite"]


def _serve(*args: str) -> subprocess.Popen:
    return subprocess.Popen(
        [sys.executable, "-m", "dropcalc", "serve", "--no-browser", *args],
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )


def test_serve_prints_its_address_and_warns_beyond_this_computer() -> None:
    process = _serve("--host", "0.0.0.0")  # noqa: S104 (the point of the test)
    try:
        assert process.stdout is not None
        assert process.stderr is not None
        line = process.stdout.readline()
        assert re.fullmatch(r"dropcalc page: http://127\.0\.0\.1:\d+/ +\(Ctrl\+C to stop\)\n", line)
        warning = process.stderr.readline()
        assert warning.startswith("dropcalc serve: warning: listening on 0.0.0.0")
        assert "no login" in warning
    finally:
        process.terminate()
        process.communicate(timeout=10)


def test_serve_refuses_a_port_in_use_in_one_line() -> None:
    import socket

    with socket.socket() as taken:
        taken.bind(("127.0.0.1", 0))
        taken.listen(1)
        port = taken.getsockname()[1]
        process = _serve("--port", str(port))
        out, err = process.communicate(timeout=60)
    assert process.returncode == 2
    assert err.count("\n") == 1
    assert f"cannot listen on 127.0.0.1:{port}" in err
    assert "Traceback" not in err


def test_serve_port_range() -> None:
    from typer.testing import CliRunner

    from dropcalc.cli import app

    result = CliRunner().invoke(app, ["serve", "--no-browser", "--port", "70000"])
    assert result.exit_code == 2, result.output


def test_the_form_has_every_key_of_the_scenario_file() -> None:
    """A key added to the scenario loader must reach the page (or a round trip loses it)."""
    from dropcalc.io.scenario import _KEYS
    from dropcalc.web import form

    assert set(form.JOB_FIELDS) == _KEYS["job"]
    site = set(form.SITE_FIELDS) - {"origin_lat", "origin_lon"} | {"origin", "outline"}
    assert site == _KEYS["site"]
    assert set(form.WIND_FIELDS) == _KEYS["wind"]
    assert set(form.POLICY_FIELDS) == _KEYS["policy"] - {"rules_file"}  # no files on the page
    assert set(form.AREA_FIELDS) | {"edge"} == _KEYS["work_area"]
    assert set(form.EDGE_FIELDS) | {"points"} == _KEYS["edge"]
    assert set(form.OBJECT_FIELDS) == _KEYS["object"]
