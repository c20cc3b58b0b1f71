"""A small client for headless Chromium over the DevTools protocol (``--remote-debugging-pipe``).

Used by tests/test_browser.py to open a report the way a reader does and to record what the
page did: every network request, every console message and uncaught exception, the DOM as
rendered, and a screenshot. The protocol is Chromium's own (JSON messages separated by NUL
bytes on file descriptors 3 and 4); no library and no network port is involved.
"""

from __future__ import annotations

import base64
import contextlib
import json
import os
import select
import shutil
import subprocess
import time
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

FLAGS = (
    "--headless",
    "--no-sandbox",
    "--disable-gpu",
    "--disable-background-networking",
    "--disable-component-update",
    "--disable-sync",
    "--no-first-run",
    "--no-default-browser-check",
    "--disable-extensions",
    "--hide-scrollbars",
    "--remote-debugging-pipe",
    # Nothing a page asks for can reach the network: every host name fails to resolve (the
    # request is still recorded, which is what the test looks for).
    "--host-resolver-rules=MAP * ~NOTFOUND",
)
INSTALL_HINT = (
    "headless Chromium is needed for this test: install it with `sudo apt-get install "
    "chromium` (Debian, Ubuntu) or your system's chromium package"
)


def find_chromium() -> str | None:
    for name in ("chromium", "chromium-browser", "google-chrome", "google-chrome-stable"):
        found = shutil.which(name)
        if found:
            return found
    return None


@dataclass
class PageVisit:
    """What happened while a page was open."""

    requests: list[str] = field(default_factory=list)
    console: list[str] = field(default_factory=list)
    errors: list[str] = field(default_factory=list)
    facts: Any = None
    screenshot: bytes = b""


class Browser:
    """One headless Chromium, driven over the pipe; use as a context manager."""

    def __init__(self, binary: str, profile: Path, timeout: float = 60.0) -> None:
        self.timeout = timeout
        to_child, self._write = os.pipe()
        self._read, from_child = os.pipe()

        def wire() -> None:  # in the child: the protocol's descriptors are 3 (in) and 4 (out)
            os.dup2(to_child, 3)
            os.dup2(from_child, 4)

        self.process = subprocess.Popen(
            [binary, *FLAGS, f"--user-data-dir={profile}", "about:blank"],
            stdin=subprocess.DEVNULL,
            stdout=subprocess.DEVNULL,
            stderr=subprocess.DEVNULL,
            preexec_fn=wire,
            pass_fds=(3, 4),
        )
        os.close(to_child)
        os.close(from_child)
        self._buffer = b""
        self._next = 0
        self.events: list[dict[str, Any]] = []

    def __enter__(self) -> Browser:
        return self

    def __exit__(self, *_: object) -> None:
        with contextlib.suppress(OSError, TimeoutError, RuntimeError):
            self.send("Browser.close")
        try:
            self.process.wait(timeout=10)
        except subprocess.TimeoutExpired:
            self.process.kill()
            self.process.wait()
        os.close(self._write)
        os.close(self._read)

    def send(self, method: str, session: str | None = None, **params: Any) -> Any:
        self._next += 1
        message: dict[str, Any] = {"id": self._next, "method": method, "params": params}
        if session:
            message["sessionId"] = session
        os.write(self._write, json.dumps(message).encode() + b"\0")
        while True:
            reply = self._receive()
            if reply.get("id") == self._next:
                if "error" in reply:
                    raise RuntimeError(f"{method}: {reply['error']}")
                return reply.get("result", {})
            self.events.append(reply)

    def wait_for(self, method: str) -> dict[str, Any]:
        for index, event in enumerate(self.events):
            if event.get("method") == method:
                return self.events.pop(index)
        while True:
            event = self._receive()
            if event.get("method") == method:
                return event
            self.events.append(event)

    def _receive(self) -> dict[str, Any]:
        deadline = time.monotonic() + self.timeout
        while b"\0" not in self._buffer:
            left = deadline - time.monotonic()
            ready, _, _ = select.select([self._read], [], [], max(left, 0))
            if not ready:
                raise TimeoutError("Chromium did not answer in time")
            chunk = os.read(self._read, 1 << 16)
            if not chunk:
                raise RuntimeError("Chromium closed the protocol pipe")
            self._buffer += chunk
        message, _, self._buffer = self._buffer.partition(b"\0")
        loaded: dict[str, Any] = json.loads(message)
        return loaded

    def visit(self, url: str, script: str, width: int = 1280, media: str = "screen") -> PageVisit:
        """Open ``url``, wait for it to load, run ``script`` (its value comes back as
        ``facts``), and take a screenshot of the whole page."""
        target = self.send("Target.createTarget", url="about:blank")["targetId"]
        session = self.send("Target.attachToTarget", targetId=target, flatten=True)["sessionId"]
        for domain in ("Page", "Network", "Runtime", "Log"):
            self.send(f"{domain}.enable", session)
        self.send(
            "Emulation.setDeviceMetricsOverride",
            session,
            width=width,
            height=900,
            deviceScaleFactor=1,
            mobile=False,
        )
        self.send("Emulation.setEmulatedMedia", session, media=media)
        self.events.clear()
        self.send("Page.navigate", session, url=url)
        self.wait_for("Page.loadEventFired")
        result = self.send("Runtime.evaluate", session, expression=script, returnByValue=True)
        shot = self.send(
            "Page.captureScreenshot", session, format="png", captureBeyondViewport=True
        )
        # Give late console messages or requests a moment to arrive.
        time.sleep(0.3)
        self.send("Runtime.evaluate", session, expression="0")
        visit = PageVisit(facts=result.get("result", {}).get("value"))
        visit.screenshot = base64.b64decode(shot["data"])
        for event in self.events:
            method, params = event.get("method"), event.get("params", {})
            if method == "Network.requestWillBeSent":
                visit.requests.append(params["request"]["url"])
            elif method == "Runtime.consoleAPICalled":
                texts = [
                    str(arg.get("value", arg.get("description", ""))) for arg in params["args"]
                ]
                visit.console.append(f"{params['type']}: {' '.join(texts)}")
            elif method == "Runtime.exceptionThrown":
                visit.errors.append(str(params["exceptionDetails"].get("text")))
            elif method == "Log.entryAdded":
                entry = params["entry"]
                visit.console.append(f"{entry['level']}: {entry['text']} ({entry.get('url', '')})")
        self.send("Target.closeTarget", targetId=target)
        return visit
