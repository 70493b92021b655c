"""Each kind of report opened in a real headless Chromium: the rendered page has its tables and
pictures with a visible size, no console message, log error or script exception, loads nothing
but its own file, and its screenshot is not blank.

Without a browser the test is skipped locally; under CI (environment variable ``CI`` set) it
fails instead, since ``.ci/run`` installs Chromium first.
"""

from __future__ import annotations

import json
import os
import shutil
from importlib import resources

import headless
import pytest

from satorder.cli.main import main
from satorder.render.report import CAUTION

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
SMALL = os.path.join(ROOT, "instances", "small")
DATA = resources.files("satorder").joinpath("data")

# kind -> (arguments after the command, least tables, least pictures)
KINDS = {
    "solve": (["solve", "{demo}"], 4, 2),
    "solve-infeasible": (["solve", f"{SMALL}/042-planted-hole-n12-s1.json"], 3, 0),
    "measure": (["measure", "{rules}"], 5, 1),
    "explain": (["explain", f"{SMALL}/046-planted-antihole-n15-s1.json", "--repairs", "1"],
                5, 1),
    "count": (["count", "{demo}"], 4, 1),
    "bench": (["bench", f"{SMALL}/019-order-n8-s1.json", f"{SMALL}/042-planted-hole-n12-s1.json",
               "--backend", "forcing", "glucose4", "--timeout", "60", "--out", "{tmp}/rows.jsonl"],
              3, 1),
}


def _no_browser(why: str):
    if os.environ.get("CI"):
        pytest.fail(f"CI needs a headless browser for the report test: {why}")
    pytest.skip(f"no headless browser: {why}")


@pytest.fixture(scope="module")
def browser():
    exe = headless.find_browser()
    if exe is None:
        _no_browser("no chromium on PATH (set SATORDER_BROWSER to its path)")
    try:
        b = headless.Browser(exe)
    except (headless.BrowserError, OSError) as exc:
        _no_browser(f"{exe} did not start: {exc}")
    yield b
    b.close()


@pytest.fixture(scope="module")
def reports(tmp_path_factory):
    tmp = tmp_path_factory.mktemp("reports")
    demo, rules = tmp / "festival.json", tmp / "festival-rules.json"
    demo.write_text(DATA.joinpath("demo.json").read_text(encoding="utf-8"))
    rules.write_text(DATA.joinpath("demo-rules.json").read_text(encoding="utf-8"))
    pages = {}
    for kind, (args, _, _) in KINDS.items():
        page = tmp / f"{kind}.html"
        argv = [a.format(demo=demo, rules=rules, tmp=tmp) for a in args]
        code = main(argv + ["--report", str(page)])
        assert code == 0, (kind, code)
        pages[kind] = page
    return pages


PROBE = """(() => {
  const box = e => { const r = e.getBoundingClientRect(); return [r.width, r.height]; };
  return {
    title: document.title,
    h1: document.querySelector('h1') ? document.querySelector('h1').innerText : '',
    tables: [...document.querySelectorAll('table')].map(t => [t.rows.length, ...box(t)]),
    svgs: [...document.querySelectorAll('svg')].map(s => [
      ...box(s), s.querySelectorAll('text.title').length, s.querySelectorAll('text.caption').length,
      s.querySelectorAll('g.legend').length]),
    text: document.body.innerText,
  };
})()"""


@pytest.mark.slow
@pytest.mark.parametrize("kind", list(KINDS))
def test_report_renders_in_headless_chromium(kind, reports, browser, tmp_path):
    path = reports[kind]
    url = "file://" + str(path)
    page = browser.open(url)
    try:
        seen = page.evaluate(PROBE)
        png = page.screenshot(scale=0.3)
        messages = page.messages()
        requests = page.requests()
    finally:
        page.close()
    shutil.copy(path, tmp_path / path.name)
    (tmp_path / f"{kind}.png").write_bytes(png)  # kept with the test's files for a look
    _, least_tables, least_pictures = KINDS[kind]
    assert seen["h1"].startswith(f"satorder {kind.split('-')[0]}:")
    assert len(seen["tables"]) >= least_tables
    for rows, w, h in seen["tables"]:
        assert rows >= 1 and w > 40 and h > 10
    assert len(seen["svgs"]) >= least_pictures
    for w, h, titles, captions, legends in seen["svgs"]:
        assert w > 200 and h > 100
        assert titles == 1 and captions >= 1 and legends >= 1
    assert " ".join(CAUTION.split()) in " ".join(seen["text"].split())
    # a page with no script logs nothing: any console call, log entry or exception is a fault
    assert not messages, json.dumps(messages)[:2000]
    assert requests == [url]  # nothing fetched but the page itself
    figures = headless.pixel_figures(png)
    assert figures["non_white"] > 0.02 and figures["variance"] > 100, figures
    assert figures["colours"] > 20, figures


def test_png_decoder_reads_every_filter_type():
    # a 3x5 RGB image, row k written with filter k (None, Sub, Up, Average, Paeth: PNG
    # specification, section 9.2), decoded pixel by pixel
    import random
    import struct
    import zlib

    rng = random.Random(2)
    pixels = [[tuple(rng.randrange(256) for _ in range(3)) for _ in range(3)] for _ in range(5)]
    raw = bytearray()
    prev = bytes(9)
    for f, row in enumerate(pixels):
        flat = bytes(c for px in row for c in px)
        raw.append(f)
        for i, v in enumerate(flat):
            a = flat[i - 3] if i >= 3 else 0
            b, c = prev[i], (prev[i - 3] if i >= 3 else 0)
            p = a + b - c
            pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
            paeth = a if pa <= pb and pa <= pc else (b if pb <= pc else c)
            pred = (0, a, b, (a + b) // 2, paeth)[f]
            raw.append((v - pred) & 255)
        prev = flat

    def chunk(kind, body):
        return struct.pack(">I", len(body)) + kind + body + struct.pack(
            ">I", zlib.crc32(kind + body))

    png = (b"\x89PNG\r\n\x1a\n" + chunk(b"IHDR", struct.pack(">IIBBBBB", 3, 5, 8, 2, 0, 0, 0))
           + chunk(b"IDAT", zlib.compress(bytes(raw))) + chunk(b"IEND", b""))
    w, h, bpp, rows = headless.decode_png(png)
    assert (w, h, bpp) == (3, 5, 3)
    assert [list(r) for r in rows] == [[c for px in row for c in px] for row in pixels]
