"""Wall-clock times of the page (issue 14's targets), as a user meets them.

1. From ``dropcalc serve`` to a usable page: a fresh process is started and the clock stops when
   the page, its script and style sheet, and the library list have all been served.
2. One work area recomputed after a change: the demo job cut to its first work area (the north
   eaves, all the demo's objects, the demo's precision), computed once, then the wind changed
   by 1 m/s and computed again (the time quoted: the page's own request over HTTP, until the
   numbers and the zone are on the page); then the figures of that answer (the page's second
   request).

The machine may be shared: quote medians from one run.

    python benchmarks/web.py [--repeat 3] [--skip-compute] [--json]
"""

from __future__ import annotations

import argparse
import json
import re
import statistics
import subprocess
import sys
import time
import urllib.request
from typing import Any


def _get(url: str) -> bytes:
    with urllib.request.urlopen(url, timeout=60) as response:  # noqa: S310 (our own server)
        return response.read()


def _post(url: str, body: dict[str, Any]) -> dict[str, Any]:
    request = urllib.request.Request(
        url, json.dumps(body).encode(), {"Content-Type": "application/json"}
    )
    with urllib.request.urlopen(request, timeout=600) as response:  # noqa: S310
        return json.loads(response.read())


def start_server() -> tuple[subprocess.Popen, str, float]:
    """Start ``dropcalc serve --no-browser``; return it, its address and the seconds to usable."""
    started = time.perf_counter()
    process = subprocess.Popen(
        [sys.executable, "-m", "dropcalc", "serve", "--no-browser"],
        stdout=subprocess.PIPE,
        text=True,
    )
    line = process.stdout.readline() if process.stdout else ""
    match = re.search(r"http://\S+/", line)
    if not match:
        process.terminate()
        raise SystemExit(f"dropcalc serve printed no address: {line!r}")
    url = match.group(0)
    for path in ("", "static/page.js", "static/page.css", "api/library"):
        _get(url + path)
    return process, url, time.perf_counter() - started


def main() -> None:
    """Run the measurements and print them."""
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--repeat", type=int, default=3)
    parser.add_argument("--skip-compute", action="store_true")
    parser.add_argument("--json", action="store_true")
    args = parser.parse_args()

    startups = []
    for _ in range(args.repeat):
        process, url, seconds = start_server()
        startups.append(seconds)
        process.terminate()
        process.wait(timeout=10)
    result: dict[str, Any] = {"serve_to_usable_page_s": statistics.median(startups)}

    if not args.skip_compute:
        process, url, _ = start_server()
        try:
            form = json.loads(_get(url + "api/demo"))["form"]
            form["work_areas"] = form["work_areas"][:1]
            first = time.perf_counter()
            answer = _post(url + "api/compute", {"request_id": 1, "form": form})
            result["first_compute_s"] = time.perf_counter() - first
            times = []
            drawing = []
            speed = 8.0
            for n in range(args.repeat):
                speed += 1.0
                form["wind"]["speed"] = f"{speed:g} m/s"
                begin = time.perf_counter()
                answer = _post(url + "api/compute", {"request_id": n + 2, "form": form})
                times.append(time.perf_counter() - begin)
                begin = time.perf_counter()
                _post(url + "api/figures", {"request_id": n + 2, "form": form})
                drawing.append(time.perf_counter() - begin)
            result["recompute_one_area_s"] = statistics.median(times)
            result["figures_after_it_s"] = statistics.median(drawing)
            result["objects"] = len(form["objects"])
            result["last_distance_m"] = answer["areas"][0]["keep_clear"]
        finally:
            process.terminate()
            process.wait(timeout=10)

    if args.json:
        print(json.dumps(result))
    else:
        for key, value in result.items():
            print(f"{key:28s} {value:.3g}" if isinstance(value, float) else f"{key:28s} {value}")


if __name__ == "__main__":
    main()
