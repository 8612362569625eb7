#!/usr/bin/env python3
"""Writes the fuzz targets' seed corpus under tests/fuzz/corpus/<target>/: small, valid and
nearly valid inputs of each parser, from which libFuzzer mutates. Run from anywhere; rewrites the
seed files it names and leaves any others (inputs libFuzzer found worth keeping) alone.

The row parser's target reads its first byte as the chunk size and the restart point, so each
probe-file seed is written with a few different first bytes."""
import os
import shutil

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(os.path.dirname(HERE))
# The shipped configs, copied: every key the loader knows, and the demo's.
SHIPPED_CONFIGS = {"example.yaml": "config/example.yaml", "demo_channel.yaml": "demo/channel.yaml"}

PROBE_FILES = {
    "header_space": "# wall shear stress\n# time tau_lower tau_upper\n0.0 0.28 0.29\n0.1 0.27 0.30\n",
    "csv_names": "time,u,v,w\n0.0,1.0,0.1,-0.1\n0.5,1.1,0.0,0.2\n",
    "semicolon_tab": "# t\tp;q\n1;2;3\n2\t3\t4\n",
    "vector_groups": "# time U\n0.0 (1.0 0.1 0.0)\n0.1 (1.1 0.0 0.1)\n",
    "fortran_exponent": "# time cd\n1.0D+00 1.5D-01\n2.0d0 +1.6E-01\n",
    "bad_values": "# time x\n0 nan\n1 inf\n2 1e999\n3 abc\n4 5 6\n5 7\n",
    "partial_last_line": "# time x y\n0 1 2\n1 3 4\n2 5",
    "crlf_and_blank": "# time x\r\n\r\n0 1\r\n1 2\r\n",
    "no_header": "0 1 2\n1 2 3\n2 3 4\n",
    "chatter": "# time x\n0 1\n*** time step reduced ***\n1 2\n",
    # Multi-line probe descriptions and a surface average (our own invented numbers).
    "probe_vectors": "# Probe 0 (2.05 0.0048 1.0333)\n# Probe 1 (2.05 0.012 1.0333)\n"
    "#   Probe   0   1\n#   Time\n0.002 (0.41 0.002 -0.01) (0.63 0.004 0.02)\n"
    "0.004 (0.42 0.001 -0.02) (0.64 0.005 0.01)\n",
    "probe_scalars": "# Probe 4 (0.5 0.01 0)\n# Probe 7 (0.5 0.02 0) # Not Found\n"
    "#  Probe  4  7\n#  Time\n0.1 -1.5e-02 3.25e-03\n0.2 -1.4e-02 3.5e-03\n",
    "surface_average": "# Region type : patch lowerWall\n# Faces : 1200\n# Area : 8\n"
    "# Time\tareaAverage(wallShearStress)\n0.002\t(-2.81e-04 1.2e-07 -3.5e-08)\n"
    "0.004\t(-2.79e-04 1.1e-07 -3.1e-08)\n",
}

CONFIGS = {
    "minimal": """run: r
sources:
  - name: wall
    files: "wall*.dat"
statistics:
  - name: tau
    source: wall
    kind: mean
    column: tau
    target: {relative: 0.01}
""",
    "kinds_and_groups": """sources:
  - {name: line, files: "line.dat", time_column: 1, columns: [time, u, v, w]}
statistics:
  - {name: uv, source: line, kind: covariance, columns: [u, v], target: {absolute: 1.0e-5, confidence: 0.99}}
  - {source: line, kind: tke, columns: [u, v, w], target: {relative: 0.05}, minimum_time: 2}
  - {source: line, kind: third_moment, columns: [u, u, v]}
  - {name: a, source: line, kind: mean, column: u, target: {relative: 0.01}, reference: 1.5}
groups:
  - {name: g, members: [uv, a], bonferroni: true, required: true}
""",
    "profile_wall_units": """sources:
  - {name: wall, files: "wall.dat"}
  - {name: line, files: "line.dat"}
statistics:
  - {name: tau_w, source: wall, kind: average, columns: [lo, up], target: {relative: 0.01}}
wall_units: {viscosity: 1.0e-6, density: 998, wall_shear: tau_w, half_height: 0.025}
profiles:
  - name: p
    source: line
    positions: [0.001, 0.002]
    columns: {u: "u{i}", v: "v{i}", w: "w{i}"}
    quantities: [U, uu, uv, k, uuv]
    targets: {U: {relative: 0.02}}
    momentum_balance: true
""",
    "alerts_metrics": """evaluate_every: 5
poll_every: 1
warmup: 3.5
metrics: {listen: "127.0.0.1:9464"}
alerts:
  events: [met, run_met, stalled]
  stall_after: 60
  email: {host: localhost, port: 25, from: a@b, to: [c@d], starttls: false, password_env: X}
  command: [/bin/true]
  stop_file: STOP
sources: [{name: s, files: "*.dat"}]
statistics: [{source: s, kind: mean, column: x}]
""",
    "broken_yaml": "sources: [\n  - name: x\nstatistics: {",
    "unknown_key": "run: r\nsorces: []\n",
}

REQUESTS = {
    "status": '{"request": "status"}',
    "check": '{"request": "check", "stat": "tau_w"}',
    "events": '{"request": "events", "after": 12}',
    "reload": '{"request": "reload"}',
    "nested": '{"request": "status", "x": [1, 2.5e3, true, null, {"y": "\\u00e9\\n"}]}',
    "malformed": '{"request": "check", "stat": 5',
    "deep": "[" * 40 + "]" * 40,
}


def write(target, name, data):
    folder = os.path.join(HERE, "corpus", target)
    os.makedirs(folder, exist_ok=True)
    with open(os.path.join(folder, name), "wb") as f:
        f.write(data)


def main():
    for name, text in PROBE_FILES.items():
        for first in (0, 5, 200):  # chunk sizes 1, 6 and 14; restart early, late, at the end
            write("row_parser", f"{name}_{first}", bytes([first]) + text.encode())
    for name, text in CONFIGS.items():
        write("config_loader", name + ".yaml", text.encode())
    for name, path in SHIPPED_CONFIGS.items():
        shutil.copyfile(os.path.join(ROOT, path), os.path.join(HERE, "corpus", "config_loader", name))
    for name, text in REQUESTS.items():
        write("query_request", name + ".json", text.encode())


if __name__ == "__main__":
    main()
