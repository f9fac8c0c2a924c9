"""The HTML reports in a real browser: headless Chromium (Debian's ``chromium``, installed by
``make browser``), driven over the DevTools protocol on a pipe with the standard library only.

For each report: every figure has a size on the page, the console shows no error, no request
leaves the file, and the page prints to PDF on A4 and on Letter in the expected number of pages.
A screenshot and the PDFs are left in the test's tmp folder for a person to look at.

The protocol on a pipe (``--remote-debugging-pipe``): the browser reads commands from its file
descriptor 3 and writes replies and events to its descriptor 4, each a JSON message ended by a
NUL byte. One browser serves the module; it is ended by its own pid whatever happens.
"""
from __future__ import annotations

import base64
import json
import os
import re
import select
import shutil
import subprocess
import sys
import time

import pytest

CHROMIUM = shutil.which("chromium") or ("/usr/bin/chromium" if os.path.exists("/usr/bin/chromium") else None)
pytestmark = pytest.mark.skipif(
    CHROMIUM is None, reason="no chromium browser: `make browser` installs Debian's chromium (as root, with apt-get); "
                             "the browser checks of the HTML report are skipped")
# Bounds on the browser's work [s]: a hung browser fails the test instead of holding the suite.
REPLY_TIMEOUT_S = 30.0
# Paper sizes [inch]: ISO 216 A4 (210 x 297 mm) and US Letter (8.5 x 11 in).
PAPERS = {"A4": (210 / 25.4, 297 / 25.4), "Letter": (8.5, 11.0)}


class Browser:
    """Headless Chromium on a DevTools pipe: `call` sends a command and returns its result; the
    events that arrive meanwhile are kept in `events` as (method, params)."""

    def __init__(self, user_data_dir):
        to_browser_read, self._to_browser = os.pipe()
        self._from_browser, from_browser_write = os.pipe()
        arguments = [CHROMIUM, "--headless", "--remote-debugging-pipe", "--no-sandbox", "--disable-gpu",
                     "--no-first-run", "--no-default-browser-check", "--disable-extensions",
                     "--disable-background-networking", "--disable-component-update", "--disable-sync",
                     "--disable-dev-shm-usage", f"--user-data-dir={user_data_dir}", "about:blank"]
        # the pipe ends must be descriptors 3 and 4 in the browser: a small Python trampoline moves
        # them there and becomes the browser (execv keeps the pid)
        trampoline = ("import os, sys; r, w = int(sys.argv[1]), int(sys.argv[2]); "
                      "r, w = os.dup(r), os.dup(w); os.dup2(r, 3); os.dup2(w, 4); "
                      "os.set_inheritable(3, True); os.set_inheritable(4, True); "
                      "os.execv(sys.argv[3], sys.argv[3:])")
        self.process = subprocess.Popen([sys.executable, "-c", trampoline, str(to_browser_read),
                                         str(from_browser_write), *arguments],
                                        pass_fds=(to_browser_read, from_browser_write), stdin=subprocess.DEVNULL,
                                        stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        for fd in (to_browser_read, from_browser_write):
            os.close(fd)
        self._buffer, self._next_id, self.events = b"", 0, []

    def _read_message(self, deadline):
        while b"\0" not in self._buffer:
            left = deadline - time.monotonic()
            if left <= 0 or not select.select([self._from_browser], [], [], left)[0]:
                raise TimeoutError("the browser did not answer in time")
            chunk = os.read(self._from_browser, 1 << 20)
            if not chunk:
                raise EOFError("the browser closed its pipe")
            self._buffer += chunk
        message, self._buffer = self._buffer.split(b"\0", 1)
        return json.loads(message)

    def call(self, method, session=None, **params):
        self._next_id += 1
        message = {"id": self._next_id, "method": method, "params": params}
        if session is not None:
            message["sessionId"] = session
        os.write(self._to_browser, json.dumps(message).encode() + b"\0")
        deadline = time.monotonic() + REPLY_TIMEOUT_S
        while True:
            reply = self._read_message(deadline)
            if reply.get("id") == self._next_id:
                if "error" in reply:
                    raise RuntimeError(f"{method}: {reply['error']}")
                return reply["result"]
            if "method" in reply:
                self.events.append((reply["method"], reply.get("params", {})))

    def wait_for(self, method, deadline_s=REPLY_TIMEOUT_S):
        """Wait until an event ``method`` has arrived (it may have come already)."""
        deadline = time.monotonic() + deadline_s
        while not any(name == method for name, _ in self.events):
            message = self._read_message(deadline)
            if "method" in message:
                self.events.append((message["method"], message.get("params", {})))

    def close(self):
        """End the browser by its own pid: politely, then by force."""
        try:
            if self.process.poll() is None:
                try:
                    os.write(self._to_browser, json.dumps({"id": 0, "method": "Browser.close"}).encode() + b"\0")
                except OSError:
                    pass
                try:
                    self.process.wait(timeout=5)
                except subprocess.TimeoutExpired:
                    self.process.kill()
                    self.process.wait(timeout=5)
        finally:
            for fd in (self._to_browser, self._from_browser):
                try:
                    os.close(fd)
                except OSError:
                    pass


@pytest.fixture(scope="module")
def browser(tmp_path_factory):
    browser = Browser(tmp_path_factory.mktemp("chromium-profile"))
    try:
        yield browser
    finally:
        browser.close()


def _open(browser, url):
    """A new tab showing ``url``, with console, log and network events on; its session id, once loaded."""
    target = browser.call("Target.createTarget", url="about:blank")["targetId"]
    session = browser.call("Target.attachToTarget", targetId=target, flatten=True)["sessionId"]
    for domain in ("Page", "Runtime", "Log", "Network"):
        browser.call(f"{domain}.enable", session)
    # a desktop window's width [CSS px], for the screenshot
    browser.call("Emulation.setDeviceMetricsOverride", session, width=1000, height=800, deviceScaleFactor=1,
                 mobile=False)
    browser.events.clear()
    browser.call("Page.navigate", session, url=url)
    browser.wait_for("Page.loadEventFired")
    return session


def _problems(browser):
    """Console errors, uncaught exceptions, log entries of level error, and the URLs requested."""
    errors, requests = [], []
    for method, params in browser.events:
        if method == "Runtime.consoleAPICalled" and params.get("type") in ("error", "assert"):
            errors.append(f"console.{params['type']}: {params.get('args')}")
        elif method == "Runtime.exceptionThrown":
            errors.append(f"exception: {params.get('exceptionDetails')}")
        elif method == "Log.entryAdded" and params["entry"].get("level") == "error":
            errors.append(f"log: {params['entry'].get('text')} {params['entry'].get('url', '')}")
        elif method == "Network.requestWillBeSent":
            requests.append(params["request"]["url"])
    return errors, requests


def _pdf_pages(data: bytes) -> int:
    """The number of page objects in a PDF (``/Type /Page``, not ``/Pages``), as Chromium writes it
    (ISO 32000-1, section 7.7.3.3: each page is a dictionary of type Page)."""
    return len(re.findall(rb"/Type\s*/Page(?![s\w])", data))


# name -> (figures drawn, least and most printed pages on either paper; the explanations add a few)
EXPECTED = {"orchard-doublet": (5, 7, 12), "shack-reading": (2, 3, 6)}


@pytest.mark.parametrize("name", sorted(EXPECTED))
def test_report_in_the_browser(browser, report_pages, tmp_path, name):
    page = report_pages[name]
    url = page.resolve().as_uri()
    session = _open(browser, url)
    sizes = json.loads(browser.call("Runtime.evaluate", session, returnByValue=True, expression=(
        "JSON.stringify([...document.querySelectorAll('figure svg')].map("
        "s => { const r = s.getBoundingClientRect(); return [r.width, r.height]; }))"))["result"]["value"])
    figures, least_pages, most_pages = EXPECTED[name]
    assert len(sizes) == figures
    assert all(width > 300 and height > 150 for width, height in sizes), sizes
    metrics = browser.call("Page.getLayoutMetrics", session)["cssContentSize"]
    shot = browser.call("Page.captureScreenshot", session, format="png", captureBeyondViewport=True,
                        clip={"x": 0, "y": 0, "width": metrics["width"], "height": metrics["height"], "scale": 1})
    (tmp_path / f"{name}.png").write_bytes(base64.b64decode(shot["data"]))
    for paper, (width_in, height_in) in PAPERS.items():
        pdf = base64.b64decode(browser.call("Page.printToPDF", session, paperWidth=width_in, paperHeight=height_in,
                                            printBackground=True)["data"])
        (tmp_path / f"{name}-{paper}.pdf").write_bytes(pdf)
        assert pdf.startswith(b"%PDF-")
        assert least_pages <= _pdf_pages(pdf) <= most_pages, (paper, _pdf_pages(pdf))
    errors, requests = _problems(browser)
    assert errors == []
    assert requests and all(request == url or request.startswith("data:") for request in requests), requests


def test_the_checks_catch_a_page_that_fetches(browser, tmp_path):
    # the checks above would pass a page that loads nothing because they see nothing: a page that
    # does fetch (an image from an address that answers nothing) must show up in the requests
    page = tmp_path / "fetches.html"
    page.write_text('<!DOCTYPE html><html><body><img src="http://127.0.0.1:9/x.png" alt=""></body></html>')
    _open(browser, page.as_uri())
    _, requests = _problems(browser)
    assert "http://127.0.0.1:9/x.png" in requests
