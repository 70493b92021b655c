"""A small client for a real headless Chromium, driven by the DevTools protocol over a pipe
(``--remote-debugging-pipe``: commands on the browser's file descriptor 3, replies and events
on 4, each message JSON ended by a NUL byte), and a PNG decoder built on zlib.

Only what the report tests need: open a page, wait for it to load, evaluate an expression,
collect console messages, log entries, script exceptions and network requests, take a
screenshot.  The browser runs in its own session (process group) and is closed through the
protocol, or its group is killed by id.
"""

from __future__ import annotations

import json
import os
import select
import shutil
import signal
import struct
import tempfile
import time
import zlib

FLAGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
         "--disable-component-update", "--disable-sync", "--no-first-run",
         "--disable-default-apps", "--mute-audio", "--hide-scrollbars",
         "--remote-debugging-pipe", "--window-size=1280,1600"]


class BrowserError(RuntimeError):
    pass


def find_browser() -> str | None:
    """The Chromium executable: $SATORDER_BROWSER, else the first of the usual names."""
    env = os.environ.get("SATORDER_BROWSER")
    if env:
        return env
    for name in ("chromium", "chromium-browser", "google-chrome", "chrome"):
        path = shutil.which(name)
        if path:
            return path
    return None


class Browser:
    def __init__(self, exe: str, timeout: float = 60.0):
        self.timeout = timeout
        self.tmp = tempfile.mkdtemp(prefix="satorder-browser-")
        self.log_path = os.path.join(self.tmp, "browser.log")
        to_r, to_w = os.pipe()
        from_r, from_w = os.pipe()
        log = os.open(self.log_path, os.O_WRONLY | os.O_CREAT | os.O_TRUNC, 0o644)
        args = [exe, *FLAGS, f"--user-data-dir={os.path.join(self.tmp, 'profile')}",
                "about:blank"]
        self.pid = os.posix_spawn(exe, args, dict(os.environ), file_actions=[
            (os.POSIX_SPAWN_OPEN, 0, os.devnull, os.O_RDONLY, 0),
            (os.POSIX_SPAWN_DUP2, log, 1), (os.POSIX_SPAWN_DUP2, log, 2),
            (os.POSIX_SPAWN_DUP2, to_r, 3), (os.POSIX_SPAWN_DUP2, from_w, 4)], setsid=True)
        for fd in (to_r, from_w, log):
            os.close(fd)
        self.w, self.r = to_w, from_r
        self.buf = b""
        self.next_id = 0
        self.events: list[dict] = []
        self.send("Browser.getVersion")  # fails here when the browser did not start

    # ---------------------------------------------------------------- protocol
    def _read(self, deadline: float) -> dict:
        while b"\0" not in self.buf:
            left = deadline - time.monotonic()
            if left <= 0:
                raise BrowserError("no answer from the browser in time; its log: "
                                   + self.log_tail())
            ready, _, _ = select.select([self.r], [], [], left)
            if ready:
                chunk = os.read(self.r, 1 << 20)
                if not chunk:
                    raise BrowserError("the browser closed its pipe; its log: " + self.log_tail())
                self.buf += chunk
        msg, self.buf = self.buf.split(b"\0", 1)
        return json.loads(msg)

    def send(self, method: str, params: dict | None = None, session: str | None = None):
        self.next_id += 1
        mid = self.next_id
        msg = {"id": mid, "method": method, "params": params or {}}
        if session:
            msg["sessionId"] = session
        os.write(self.w, json.dumps(msg).encode() + b"\0")
        deadline = time.monotonic() + self.timeout
        while True:
            reply = self._read(deadline)
            if reply.get("id") == mid:
                if "error" in reply:
                    raise BrowserError(f"{method}: {reply['error']}")
                return reply.get("result", {})
            self.events.append(reply)

    def wait_event(self, method: str, session: str) -> dict:
        deadline = time.monotonic() + self.timeout
        while True:
            for ev in self.events:
                if ev.get("method") == method and ev.get("sessionId") == session:
                    return ev
            self.events.append(self._read(deadline))

    def log_tail(self) -> str:
        try:
            with open(self.log_path, encoding="utf-8", errors="replace") as f:
                return f.read()[-1500:]
        except OSError:
            return "(no log)"

    # ---------------------------------------------------------------- pages
    def open(self, url: str) -> Page:
        target = self.send("Target.createTarget", {"url": "about:blank"})["targetId"]
        session = self.send("Target.attachToTarget", {"targetId": target,
                                                      "flatten": True})["sessionId"]
        for domain in ("Page", "Runtime", "Log", "Network"):
            self.send(f"{domain}.enable", session=session)
        self.events = [e for e in self.events if e.get("sessionId") != session]
        self.send("Page.navigate", {"url": url}, session=session)
        self.wait_event("Page.loadEventFired", session)
        return Page(self, target, session)

    def close(self) -> None:
        try:
            self.send("Browser.close")
        except (BrowserError, OSError):
            pass
        deadline = time.monotonic() + 10
        while time.monotonic() < deadline:
            pid, _ = os.waitpid(self.pid, os.WNOHANG)
            if pid:
                break
            time.sleep(0.05)
        else:
            os.killpg(self.pid, signal.SIGKILL)  # our own session: the browser and its helpers
            os.waitpid(self.pid, 0)
        for fd in (self.w, self.r):
            os.close(fd)
        shutil.rmtree(self.tmp, ignore_errors=True)


class Page:
    def __init__(self, browser: Browser, target: str, session: str):
        self.browser, self.target, self.session = browser, target, session

    def evaluate(self, expression: str):
        res = self.browser.send("Runtime.evaluate", {"expression": expression,
                                                     "returnByValue": True}, self.session)
        if "exceptionDetails" in res:
            raise BrowserError(f"evaluation failed: {res['exceptionDetails']}")
        return res["result"].get("value")

    def messages(self) -> list[dict]:
        """Console calls, log entries and uncaught exceptions of this page."""
        kinds = ("Runtime.consoleAPICalled", "Runtime.exceptionThrown", "Log.entryAdded")
        return [e for e in self.browser.events
                if e.get("sessionId") == self.session and e.get("method") in kinds]

    def requests(self) -> list[str]:
        return [e["params"]["request"]["url"] for e in self.browser.events
                if e.get("sessionId") == self.session
                and e.get("method") == "Network.requestWillBeSent"]

    def screenshot(self, scale: float = 0.5) -> bytes:
        size = self.evaluate("[document.documentElement.clientWidth, window.innerHeight]")
        clip = {"x": 0, "y": 0, "width": size[0], "height": size[1], "scale": scale}
        import base64

        data = self.browser.send("Page.captureScreenshot", {"format": "png", "clip": clip},
                                 self.session)["data"]
        return base64.b64decode(data)

    def close(self) -> None:
        self.browser.send("Target.closeTarget", {"targetId": self.target})


# -------------------------------------------------------------------- PNG
def decode_png(data: bytes) -> tuple[int, int, int, list[bytearray]]:
    """``(width, height, bytes per pixel, rows)`` of an 8-bit RGB or RGBA PNG (PNG
    specification, W3C 2003: chunks, zlib stream, per-row filters None/Sub/Up/Average/Paeth)."""
    if data[:8] != b"\x89PNG\r\n\x1a\n":
        raise ValueError("not a PNG")
    pos, idat = 8, []
    width = height = bpp = 0
    while pos < len(data):
        length, kind = struct.unpack(">I4s", data[pos:pos + 8])
        body = data[pos + 8:pos + 8 + length]
        if kind == b"IHDR":
            width, height, depth, colour = struct.unpack(">IIBB", body[:10])
            if depth != 8 or colour not in (2, 6):
                raise ValueError(f"unsupported PNG: depth {depth}, colour type {colour}")
            bpp = 3 if colour == 2 else 4
        elif kind == b"IDAT":
            idat.append(body)
        pos += 12 + length
    raw = zlib.decompress(b"".join(idat))
    stride = width * bpp
    rows: list[bytearray] = []
    prev = bytearray(stride)
    for y in range(height):
        f = raw[y * (stride + 1)]
        line = bytearray(raw[y * (stride + 1) + 1:(y + 1) * (stride + 1)])
        if f == 1:
            for i in range(bpp, stride):
                line[i] = (line[i] + line[i - bpp]) & 255
        elif f == 2:
            line = bytearray((a + b) & 255 for a, b in zip(line, prev))
        elif f == 3:
            for i in range(stride):
                left = line[i - bpp] if i >= bpp else 0
                line[i] = (line[i] + ((left + prev[i]) >> 1)) & 255
        elif f == 4:
            for i in range(stride):
                a = line[i - bpp] if i >= bpp else 0
                b = prev[i]
                c = prev[i - bpp] if i >= bpp else 0
                p = a + b - c
                pa, pb, pc = abs(p - a), abs(p - b), abs(p - c)
                pred = a if pa <= pb and pa <= pc else (b if pb <= pc else c)
                line[i] = (line[i] + pred) & 255
        rows.append(line)
        prev = line
    return width, height, bpp, rows


def pixel_figures(png: bytes) -> dict:
    """Grey-level variance, share of non-white pixels and number of distinct colours."""
    width, height, bpp, rows = decode_png(png)
    n = width * height
    total = total2 = dark = 0
    colours = set()
    for line in rows:
        for i in range(0, len(line), bpp):
            r, g, b = line[i], line[i + 1], line[i + 2]
            grey = (r * 299 + g * 587 + b * 114) // 1000
            total += grey
            total2 += grey * grey
            dark += grey < 245
            colours.add((r, g, b))
    mean = total / n
    return {"width": width, "height": height, "variance": total2 / n - mean * mean,
            "non_white": dark / n, "colours": len(colours)}
