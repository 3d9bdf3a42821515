"""The review report in a real browser: headless Chromium lays it out and paints it.

Chromium is the consumer the report is made for. These tests render the clean example and a
flawed one, have Chromium measure every chart and label (``--dump-dom`` of a copy with a small
measuring script added; the report itself carries no script) and take a screenshot, then check
that each chart has a size, that its labels neither overlap nor spill out of it, and that the
screenshot shows the charts' colours where the charts are.

Chromium comes from Debian's ``chromium`` package (with ``fonts-dejavu-core`` for the text);
``.ci/run`` installs both. Without it the tests skip on a workstation and fail in CI (``CI`` set).
"""

from __future__ import annotations

import html as htmllib
import json
import os
import re
import shutil
import struct
import subprocess
import zlib
from pathlib import Path

import pytest

from packwarden.engine import lint
from packwarden.report import RenderOptions
from packwarden.report.html import render

REPO = Path(__file__).resolve().parents[2]
DESIGNS = {
    "clean": REPO / "example_designs" / "orchard-probe.yaml",
    "flawed": REPO / "example_designs" / "flawed" / "trip-below-load.yaml",
}
WIDTH, HEIGHT = 1280, 2400
FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
         "--disable-background-networking", "--disable-component-update", "--disable-sync",
         "--hide-scrollbars", f"--window-size={WIDTH},{HEIGHT}"]

# Added to a copy of the report only: writes each chart's box, its labels' boxes and how many of
# its shapes have a size into a hidden <pre>, which --dump-dom then carries out.
MEASURE = """<script>
(function () {
  var out = [];
  document.querySelectorAll('svg.chart').forEach(function (svg) {
    var r = svg.getBoundingClientRect();
    var item = {cls: svg.getAttribute('class'), box: [r.left + scrollX, r.top + scrollY, r.width, r.height],
                texts: [], shapes: 0};
    svg.querySelectorAll('text').forEach(function (t) {
      var b = t.getBoundingClientRect();
      item.texts.push([t.textContent, b.left + scrollX, b.top + scrollY, b.width, b.height]);
    });
    svg.querySelectorAll('rect, line, polyline, path, circle').forEach(function (e) {
      var b = e.getBoundingClientRect();
      if (b.width > 0 || b.height > 0) { item.shapes++; }
    });
    out.push(item);
  });
  var pre = document.createElement('pre');
  pre.id = 'pw-measure';
  pre.style.display = 'none';
  pre.textContent = JSON.stringify(out);
  document.body.appendChild(pre);
})();
</script>"""

# Fill colours of the stylesheet the screenshot must show inside each chart [the report's CSS].
COLOURS = {
    "trip": [(229, 115, 115), (255, 183, 77)],  # over-current and short-circuit trip bands
    "ladder": [(229, 115, 115), (165, 214, 167), (144, 202, 249)],  # detect, charger, release
    "tj": [(31, 95, 158)],  # the curves and their points
}


def chromium() -> str:
    found = shutil.which("chromium")
    if found is None:
        if os.environ.get("CI"):
            pytest.fail("chromium is required in CI (Debian packages: chromium fonts-dejavu-core)")
        pytest.skip("chromium not installed (Debian: apt-get install chromium fonts-dejavu-core)")
    return found


def run_chromium(args: list[str], profile: Path) -> subprocess.CompletedProcess:
    return subprocess.run([chromium(), *FLAGS, f"--user-data-dir={profile}", *args],
                          capture_output=True, text=True, timeout=180)


@pytest.fixture(scope="module", params=sorted(DESIGNS))
def rendered(request, tmp_path_factory) -> dict:
    """The report of one design, measured by Chromium and screenshotted."""
    name = request.param
    chromium()
    folder = tmp_path_factory.mktemp(f"browser-{name}")
    html = render(lint([str(DESIGNS[name])]), RenderOptions())
    page = folder / "report.html"
    page.write_text(html, encoding="utf-8")
    measured = folder / "measured.html"
    measured.write_text(html.replace("</body>", MEASURE + "\n</body>"), encoding="utf-8")

    dom = run_chromium(["--dump-dom", measured.as_uri()], folder / "profile-dom")
    assert dom.returncode == 0, dom.stderr[-2000:]
    m = re.search(r'<pre id="pw-measure"[^>]*>(.*?)</pre>', dom.stdout, re.S)
    assert m, "the measuring script did not run"
    charts = {item["cls"].split()[1]: item for item in json.loads(htmllib.unescape(m.group(1)))}

    png = folder / "report.png"
    shot = run_chromium([f"--screenshot={png}", page.as_uri()], folder / "profile-shot")
    assert shot.returncode == 0, shot.stderr[-2000:]
    return {"name": name, "dom": dom.stdout, "charts": charts, "png": png, "html": html}


# --- a small PNG reader (stdlib zlib): enough for Chromium's 8-bit RGB/RGBA screenshots ---------

def read_png(path: Path) -> tuple[int, int, int, list[bytes]]:
    data = path.read_bytes()
    assert data[:8] == b"\x89PNG\r\n\x1a\n", "not a PNG"
    pos, idat, header = 8, [], None
    while pos < len(data):
        (length,) = struct.unpack(">I", data[pos:pos + 4])
        kind, body = data[pos + 4:pos + 8], data[pos + 8:pos + 8 + length]
        pos += 12 + length
        if kind == b"IHDR":
            header = struct.unpack(">IIBBBBB", body)
        elif kind == b"IDAT":
            idat.append(body)
    assert header is not None
    width, height, depth, colour, _, _, interlace = header
    assert depth == 8 and colour in (2, 6) and interlace == 0, header
    bpp = 3 if colour == 2 else 4
    raw = zlib.decompress(b"".join(idat))
    stride = width * bpp
    rows: list[bytes] = []
    prev = bytearray(stride)
    i = 0
    for _ in range(height):
        kind, line = raw[i], bytearray(raw[i + 1:i + 1 + stride])
        i += 1 + stride
        if kind == 1:
            for x in range(bpp, stride):
                line[x] = (line[x] + line[x - bpp]) & 255
        elif kind == 2:
            for x in range(stride):
                line[x] = (line[x] + prev[x]) & 255
        elif kind == 3:
            for x in range(stride):
                left = line[x - bpp] if x >= bpp else 0
                line[x] = (line[x] + (left + prev[x]) // 2) & 255
        elif kind == 4:
            for x in range(stride):
                a = line[x - bpp] if x >= bpp else 0
                b, c = prev[x], prev[x - bpp] if x >= bpp else 0
                p = a + b - c
                pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
                line[x] = (line[x] + (a if pa <= pb and pa <= pc else b if pb <= pc else c)) & 255
        rows.append(bytes(line))
        prev = line
    return width, height, bpp, rows


def colours_in(rows: list[bytes], bpp: int, box: list[float]) -> set[tuple[int, int, int]]:
    x, y, w, h = (int(round(v)) for v in box)
    found = set()
    for row in rows[max(y, 0):min(y + h, len(rows))]:
        for px in range(max(x, 0), min(x + w, len(row) // bpp)):
            found.add(tuple(row[px * bpp:px * bpp + 3]))
    return found


# --- the checks -------------------------------------------------------------------------------

def test_every_chart_is_laid_out_with_a_size(rendered) -> None:
    charts = rendered["charts"]
    assert set(charts) == {"ladder", "trip", "tj", "tc", "vds"}
    for name, item in charts.items():
        _, _, w, h = item["box"]
        assert w > 300 and h > 200, (name, item["box"])
        assert item["shapes"] > 20, name  # bands, lines, markers really have extent
        assert all(t[3] > 0 and t[4] > 0 for t in item["texts"]), name


def test_labels_do_not_overlap_or_spill_out(rendered) -> None:
    for name, item in rendered["charts"].items():
        x, y, w, h = item["box"]
        boxes = item["texts"]
        for text, left, top, tw, th in boxes:
            assert left >= x - 0.5 and left + tw <= x + w + 0.5, (name, text)
            assert top >= y - 0.5 and top + th <= y + h + 0.5, (name, text)
        # A font's line box is taller than its glyphs: two labels may share 2 px of it unseen.
        for i, a in enumerate(boxes):
            for b in boxes[i + 1:]:
                dx = min(a[1] + a[3], b[1] + b[3]) - max(a[1], b[1])
                dy = min(a[2] + a[4], b[2] + b[4]) - max(a[2], b[2])
                assert dx <= 0 or dy <= 2.0, (name, a[0], b[0])


def test_two_charts_sit_side_by_side_at_review_width(rendered) -> None:
    ladder, tj = rendered["charts"]["ladder"]["box"], rendered["charts"]["tj"]["box"]
    assert abs(ladder[1] - tj[1]) < 60 and tj[0] > ladder[0] + ladder[2]


def test_screenshot_shows_the_charts(rendered) -> None:
    width, height, bpp, rows = read_png(rendered["png"])
    assert (width, height) == (WIDTH, HEIGHT)
    whole = {rows[y][x * bpp:x * bpp + 3] for y in range(0, height, 7) for x in range(0, width, 7)}
    assert len(whole) > 20, "the screenshot is (nearly) one colour"
    for name, wanted in COLOURS.items():
        box = rendered["charts"][name]["box"]
        if box[1] + box[3] > height:
            continue  # below the fold of a long report; the layout checks above still cover it
        seen = colours_in(rows, bpp, box)
        assert len(seen) > 12, name
        for colour in wanted:
            near = any(all(abs(a - b) <= 4 for a, b in zip(colour, c)) for c in seen)
            assert near, (name, colour)
