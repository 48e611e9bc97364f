#!/usr/bin/env python3
"""sweep.py - sweep one value of a design and watch the start-up and the
rail margins move.

    examples/python/sweep.py DESIGN [--param PATH@ATTR] --from A --to B [--steps N]
                             [--plot FILE.png]

PATH@ATTR names the attribute to sweep: PATH an ElementTree path from the
design's root element, ATTR the attribute; its leading number is replaced
and the rest of its text (the unit, a tolerance) kept.  The default is the
supply voltage, "supply@voltage"; a rail capacitor of the demo is
".//capacitor[@id='x7r-2u2-25v']@c" (in its unit, uF).

For each value the design is analysed (start-up, steady state, verdict)
through the bootrung package; the script prints a table of the start-up
time, the smallest driver-supply margin to UVLO falling, the smallest
margin to the minimum drive, and the verdict, and with matplotlib
installed (and --plot given) plots the first two against the value.

Needs the bootrung package on PYTHONPATH (python/ in the source tree) and
libbootrung where the system finds it, or its path in BOOTRUNG_LIBRARY.
Results are design aids, not a substitute for measurement on the bench."""

import argparse
import math
import re
import sys
import xml.etree.ElementTree as ET

import bootrung

NUMBER = re.compile(r"^\s*[-+]?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?")


def variant(root, param, value):
    """The design's text with the attribute's leading number set to value."""
    path, _, attr = param.rpartition("@")
    node = root if path in ("", ".") else root.find(path)
    if node is None or attr not in node.attrib:
        raise SystemExit(f"sweep.py: {param}: no such element or attribute in the design")
    old = node.attrib[attr]
    if not NUMBER.match(old):
        raise SystemExit(f"sweep.py: {param}: '{old}' does not start with a number")
    node.set(attr, NUMBER.sub(f"{value:.6g}", old, count=1))
    return ET.tostring(root, encoding="unicode")


def smallest(result, key):
    """The smallest rail margin of kind key over every rail and case."""
    values = [getattr(r, key) for case in result.steady for r in case.rails]
    values = [v for v in values if not math.isnan(v)]
    return min(values) if values else math.nan


def row(value, result):
    su = result.startup
    t = "never" if math.isinf(su.time) else f"{su.time * 1e3:.3f}"
    return (value, su.time, smallest(result, "m_uvlo"), smallest(result, "m_drive"),
            result.verdict.result, t)


def plot(rows, param, path):
    try:
        import matplotlib
        matplotlib.use("Agg")
        import matplotlib.pyplot as plt
    except ImportError:
        print("(matplotlib is not installed: the table above is the result)")
        return
    xs = [r[0] for r in rows]
    fig, (a, b) = plt.subplots(2, 1, sharex=True, figsize=(6, 6))
    a.plot(xs, [r[1] * 1e3 if math.isfinite(r[1]) else math.nan for r in rows], "o-")
    a.set_ylabel("start-up time (ms)")
    b.plot(xs, [r[2] for r in rows], "o-", label="to UVLO falling")
    b.plot(xs, [r[3] for r in rows], "s-", label="to the minimum drive")
    b.axhline(0, color="red", linewidth=0.8, label="limit")
    b.set_ylabel("smallest margin (V)")
    b.set_xlabel(param)
    b.legend()
    fig.savefig(path, dpi=120)
    print(f"plot written to {path}")


def main():
    ap = argparse.ArgumentParser(description="Sweep one value of a bootrung design.")
    ap.add_argument("design")
    ap.add_argument("--param", default="supply@voltage", help="PATH@ATTR (default supply@voltage)")
    ap.add_argument("--from", dest="lo", type=float, required=True)
    ap.add_argument("--to", dest="hi", type=float, required=True)
    ap.add_argument("--steps", type=int, default=6)
    ap.add_argument("--plot", help="write a PNG plot there (needs matplotlib)")
    args = ap.parse_args()
    if args.steps < 2:
        ap.error("--steps: expected 2 or more")
    root = ET.parse(args.design).getroot()
    rows = []
    print(f"{args.param:>12}  {'start-up ms':>11}  {'UVLO margin V':>13}  "
          f"{'drive margin V':>14}  verdict")
    for i in range(args.steps):
        value = args.lo + (args.hi - args.lo) * i / (args.steps - 1)
        text = variant(root, args.param, value)
        try:
            with bootrung.load_string(text, name=f"{args.design} ({args.param}={value:g})") as d:
                r = row(value, d.analyze(series=False))
        except bootrung.Error as e:
            print(f"{value:>12.6g}  refused: {e}")
            continue
        rows.append(r)
        print(f"{value:>12.6g}  {r[5]:>11}  {r[2]:>13.3f}  {r[3]:>14.3f}  {r[4]}")
    if args.plot and rows:
        plot(rows, args.param, args.plot)
    return 0


if __name__ == "__main__":
    sys.exit(main())
