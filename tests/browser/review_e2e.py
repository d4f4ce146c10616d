#!/usr/bin/env python3
"""End-to-end test of `lodestone review` in a real headless Chromium, driven through ChromeDriver's
WebDriver HTTP API (W3C WebDriver, https://www.w3.org/TR/webdriver2/) with the standard library only.

It writes a synthetic project with 20 demagnetization steps per specimen (`lodestone simulate
section`), serves it, loads the page, steps to another specimen with the keyboard, changes the
range and the anchor, saves, and checks picks.csv. It also measures the refit round trip (choose a
range -> new fit drawn) as the page reports it and prints it: a measurement, not a pass/fail condition
(performance targets live in BENCHMARKS.md).

Usage: python3 tests/browser/review_e2e.py [path/to/lodestone]
Needs Debian's chromium and chromium-driver (/usr/bin/chromium, /usr/bin/chromedriver).
"""

import json
import os
import socket
import statistics
import subprocess
import sys
import tempfile
import time
import urllib.request

ROOT = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
BIN = sys.argv[1] if len(sys.argv) > 1 else os.path.join(ROOT, "target", "debug", "lodestone")
CHROMIUM = os.environ.get("CHROMIUM", "/usr/bin/chromium")
CHROMEDRIVER = os.environ.get("CHROMEDRIVER", "/usr/bin/chromedriver")
ELEMENT = "element-6066-11e4-a52e-4f735466cecf"  # the W3C WebDriver element key
STEPS = "0,25,50,75,100,125,150,175,200,250,300,350,400,450,500,520,540,560,570,580"


def free_port():
    s = socket.socket()
    s.bind(("127.0.0.1", 0))
    port = s.getsockname()[1]
    s.close()
    return port


def http(method, url, body=None):
    data = None if body is None else json.dumps(body).encode()
    req = urllib.request.Request(url, data=data, method=method, headers={"Content-Type": "application/json"})
    with urllib.request.urlopen(req, timeout=60) as r:
        return json.loads(r.read() or b"null")


class Driver:
    def __init__(self, base, profile):
        self.base = base
        caps = {
            "capabilities": {
                "alwaysMatch": {
                    "browserName": "chrome",
                    "goog:chromeOptions": {
                        "binary": CHROMIUM,
                        "args": [
                            "--headless", "--no-sandbox", "--disable-gpu", "--disable-background-networking",
                            "--disable-component-update", "--disable-sync", "--no-first-run", "--disable-quic",
                            "--user-data-dir=" + profile, "--window-size=1300,900",
                        ],
                    },
                }
            }
        }
        self.sid = http("POST", base + "/session", caps)["value"]["sessionId"]

    def cmd(self, method, path, body=None):
        return http(method, f"{self.base}/session/{self.sid}{path}", body)["value"]

    def go(self, url):
        self.cmd("POST", "/url", {"url": url})

    def js(self, script, *args):
        return self.cmd("POST", "/execute/sync", {"script": script, "args": list(args)})

    def find(self, css):
        return self.cmd("POST", "/element", {"using": "css selector", "value": css})[ELEMENT]

    def click(self, css):
        self.cmd("POST", f"/element/{self.find(css)}/click", {})

    def keys(self, css, text):
        self.cmd("POST", f"/element/{self.find(css)}/value", {"text": text})

    def wait(self, script, what, timeout=20.0):
        end = time.time() + timeout
        while time.time() < end:
            v = self.js(script)
            if v:
                return v
            time.sleep(0.05)
        raise AssertionError("timed out waiting for " + what)

    def quit(self):
        try:
            http("DELETE", f"{self.base}/session/{self.sid}")
        except Exception:
            pass


def main():
    work = tempfile.mkdtemp(prefix="lodestone-review-e2e-")
    proj = os.path.join(work, "project")
    subprocess.run(
        [BIN, "simulate", "section", proj, "--seed", "5", "--base-age", "1.2", "--lat", "41.3", "--lon", "247.6",
         "--timescale", os.path.join(ROOT, "records", "timescales", "chrons-0-6ma.csv"), "--spacing", "2",
         "--steps", STEPS, "--overprint", "5/58", "--overprint-ratio", "0.6", "--quiet"],
        check=True, stdout=subprocess.DEVNULL)
    assert not os.path.exists(os.path.join(proj, "picks.csv"))
    server = subprocess.Popen([BIN, "review", proj], stdout=subprocess.PIPE, stderr=subprocess.DEVNULL, text=True)
    dport = free_port()
    driver_proc = subprocess.Popen([CHROMEDRIVER, f"--port={dport}"], stdout=subprocess.DEVNULL,
                                   stderr=subprocess.DEVNULL)
    d = None
    try:
        line = server.stdout.readline().strip()
        assert line.startswith("review: http://127.0.0.1:"), line
        url = line[len("review: "):]
        base = f"http://127.0.0.1:{dport}"
        for _ in range(200):
            try:
                if http("GET", base + "/status")["value"]["ready"]:
                    break
            except Exception:
                time.sleep(0.05)
        d = Driver(base, os.path.join(work, "profile"))
        d.go(url)
        d.wait("return document.body.dataset.ready === '1'", "the page to load")
        names = d.js("return [...document.querySelectorAll('#list li')].map(li => li.dataset.specimen)")
        assert len(names) >= 2, names
        first = d.js("return document.getElementById('title').textContent")
        assert first.startswith(names[0]), first
        # The three views are drawn from the library's fit: steps, a fitted line or circle, and labels
        # that never overlap.
        assert d.js("return document.querySelectorAll('#ve circle.step').length") == 2 * 20
        assert d.js("return document.querySelectorAll('#md circle.step').length") == 20
        overlap = d.js("""
            const b = [...document.querySelectorAll('svg text.label')].map(t => [t.ownerSVGElement.id, t.getBBox()]);
            for (let i = 0; i < b.length; i++) for (let j = i + 1; j < b.length; j++) {
              const [s, p] = b[i], [u, q] = b[j];
              if (s === u && p.x < q.x + q.width && q.x < p.x + p.width && p.y < q.y + q.height && q.y < p.y + p.height) return true;
            }
            return false;""")
        assert overlap is False, "step labels overlap"
        # Keyboard: next specimen.
        d.keys("body", "j")
        d.wait(f"return document.getElementById('title').textContent.startsWith({json.dumps(names[1])})",
               "the next specimen")
        name = names[1]
        # Choose ranges by the selects and time each refit as the page measures it (request sent ->
        # fit received and the three views redrawn).
        timings = []
        for lo, hi in [(300, 580), (350, 580), (400, 580), (350, 560), (300, 570), (350, 580)]:
            for sel, step in [("to", hi), ("from", lo)]:
                i = STEPS.split(",").index(str(step))
                if d.js(f"return document.getElementById('{sel}').value") == str(i):
                    continue  # already chosen: choosing it again fires no change
                d.js("document.getElementById('readout').dataset.ms = ''")
                d.click(f"#{sel} option[value='{i}']")
                timings.append(float(d.wait("return document.getElementById('readout').dataset.ms", "a refit")))
            text = d.js("return document.getElementById('readout').textContent")
            assert f"steps {lo}–{hi}" in text, text
        d.click("input[name=anchor][value=origin]")
        d.wait("return document.getElementById('readout').textContent.includes('line origin')", "the anchored fit")
        shown = d.js("return document.getElementById('readout').textContent")
        d.click("#save")
        d.wait("return document.getElementById('status').textContent === 'saved to picks.csv'", "the save")
        with open(os.path.join(proj, "picks.csv"), encoding="utf-8") as f:
            saved = f.read()
        assert saved == f"specimen,from,to,kind,anchor\n{name},350,580,line,origin\n", saved
        badge = d.js(f"return document.querySelector('#list li[data-specimen={json.dumps(name)}] .g').textContent")
        assert badge == "pick", badge
        assert "steps 350–580" in shown and "n=9" in shown, shown
        print(f"review e2e: saved {name} 350–580 line origin; refit round trip over 20 steps: "
              f"median {statistics.median(timings):.1f} ms, max {max(timings):.1f} ms ({len(timings)} refits)")
    finally:
        if d is not None:
            d.quit()
        driver_proc.terminate()
        server.terminate()
        driver_proc.wait(timeout=10)
        server.wait(timeout=10)
    print("review e2e: passed")


if __name__ == "__main__":
    main()
