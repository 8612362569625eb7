#!/usr/bin/python3
"""The report of a live run opens in a headless browser and its SVG is well-formed.

Runs the real plateau binary (argv[1]) on a temporary run folder: a solver-like writer appends
probe rows while `plateau watch` follows, so the history plots have many cycles; then
`plateau report`. Checks every <svg> element with an XML parser (Python's xml.etree), loads the
page in Debian's headless Chromium (which must exit 0 and show the same number of <svg> elements
in its DOM) and takes a screenshot. Without Chromium the browser part is skipped, saying so.
"""
import math
import os
import random
import re
import shutil
import signal
import subprocess
import sys
import tempfile
import time
import xml.etree.ElementTree as ET

PLATEAU = sys.argv[1]


def write_rows(f, start, count, rng, state):
    for t in range(start, start + count):
        row = ["%.3f" % (0.01 * t)]
        for k in range(len(state)):
            state[k] = 0.8 * state[k] + 0.6 * rng.gauss(0.0, 1.0)
        row.append("%.6g" % (0.28 * (1 + 0.3 * state[0])))
        for p in range(3):
            u = (5.0 + 4.0 * p) * 0.0168 + 0.03 * state[1 + 3 * p]
            v = -0.4 * 0.03 * state[1 + 3 * p] + 0.015 * state[2 + 3 * p]
            w = 0.02 * state[3 + 3 * p]
            row += ["%.6g" % u, "%.6g" % v, "%.6g" % w]
        f.write(" ".join(row) + "\n")
    f.flush()


def main():
    run = tempfile.mkdtemp(prefix="plrep")
    try:
        with open(os.path.join(run, "run.yaml"), "w") as c:
            c.write("run: report-check\nsources:\n  - name: probes\n    files: probes.dat\n"
                    "statistics:\n  - {name: tau_w, kind: mean, columns: [tau_w], "
                    "target: {relative: 0.005}, reference: 0.28}\n"
                    "wall_units: {viscosity: 1.0e-6, density: 998, wall_shear: tau_w, "
                    "half_height: 0.025}\n"
                    "profiles:\n  - name: line\n    positions: [0.0005, 0.002, 0.008]\n"
                    "    columns: {u: \"u{i}\", v: \"v{i}\", w: \"w{i}\"}\n"
                    "    quantities: [U, uu, uv]\n    momentum_balance: true\n")
        probe = open(os.path.join(run, "probes.dat"), "w")
        probe.write("# time tau_w u0 v0 w0 u1 v1 w1 u2 v2 w2\n")
        rng = random.Random(3)
        state = [0.0] * 10
        write_rows(probe, 0, 2000, rng, state)
        log = open(os.path.join(run, "watch.log"), "w")
        daemon = subprocess.Popen([PLATEAU, "watch", os.path.join(run, "run.yaml"),
                                   "--evaluate-every", "0.1", "--poll-every", "0.05", "--quiet"],
                                  stdout=log, stderr=log)
        for step in range(1, 15):
            time.sleep(0.15)
            write_rows(probe, 2000 * step, 2000, rng, state)
        time.sleep(0.5)
        daemon.send_signal(signal.SIGTERM)
        if daemon.wait(timeout=20) != 0:
            print("FAIL: plateau watch did not stop cleanly")
            return 1
        report = os.path.join(run, "report.html")
        result = subprocess.run([PLATEAU, "report", os.path.join(run, "run.yaml"), "--out", report,
                                 "--csv", os.path.join(run, "history.csv")],
                                capture_output=True, text=True)
        if result.returncode != 0:
            print("FAIL: plateau report:", result.stderr)
            return 1
        html = open(report, encoding="utf-8").read()
        svgs = re.findall(r"<svg .*?</svg>", html, re.S)
        if len(svgs) < 8:
            print("FAIL: expected at least 8 plots, found %d" % len(svgs))
            return 1
        for i, svg in enumerate(svgs):
            try:
                ET.fromstring(svg)
            except ET.ParseError as e:
                print("FAIL: svg %d is not well-formed XML: %s" % (i, e))
                return 1
        if "not enough data to plot yet" in svgs[0]:
            print("FAIL: the running value of tau_w has no history to plot")
            return 1
        if "<polyline" not in svgs[1] or "1/sqrt(T)" not in svgs[1]:
            print("FAIL: the half-width plot lacks its line or the 1/sqrt(T) slope")
            return 1
        if "http://" in html.replace("http://www.w3.org/2000/svg", "") or "<script" in html:
            print("FAIL: the report must not load anything or run scripts")
            return 1
        rows = open(os.path.join(run, "history.csv")).read().splitlines()
        if len(rows) < 10 or not rows[0].startswith("cycle,wall_time,statistic"):
            print("FAIL: the CSV history is missing or short")
            return 1
        print("%d plots, each well-formed SVG; %d CSV rows" % (len(svgs), len(rows) - 1))

        chromium = shutil.which("chromium")
        if chromium is None:
            print("SKIPPED the browser check: Debian's chromium is not installed "
                  "(tests/install_dependencies installs it)")
            return 0
        profile = tempfile.mkdtemp(prefix="plrep-browser")
        flags = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
                 "--no-first-run", "--disable-background-networking",
                 "--disable-component-update", "--disable-sync", "--user-data-dir=" + profile]
        dom = subprocess.run([chromium] + flags + ["--dump-dom", "file://" + report],
                             capture_output=True, text=True, timeout=120)
        if dom.returncode != 0:
            print("FAIL: chromium exited with %d: %s" % (dom.returncode, dom.stderr[-2000:]))
            return 1
        shown = dom.stdout.count("<svg")
        if shown != len(svgs):
            print("FAIL: the browser's DOM has %d svg elements, the file %d" % (shown, len(svgs)))
            return 1
        shot = os.path.join(run, "report.png")
        subprocess.run([chromium] + flags + ["--window-size=1200,2000", "--screenshot=" + shot,
                                             "file://" + report],
                       capture_output=True, timeout=120)
        if not os.path.exists(shot) or os.path.getsize(shot) < 10000:
            print("FAIL: no screenshot of the report")
            return 1
        print("the report opens in headless chromium: %d svg elements in its DOM, screenshot %d "
              "bytes" % (shown, os.path.getsize(shot)))
        return 0
    finally:
        if os.environ.get("PLATEAU_KEEP_TEST_FOLDERS"):
            print("run folder kept:", run)
        else:
            shutil.rmtree(run, ignore_errors=True)


if __name__ == "__main__":
    sys.exit(main())
