"""The Python package (python/bootrung) against the C API: the numbers it
reads through ctypes are those a C program reads (tests/python/dump.c,
printed at full precision), its errors carry the library's file, line and
field, a progress callback stops a run.

Run by ctest (tests/CMakeLists.txt) with BOOTRUNG_LIBRARY, the built
libbootrung.so, BOOTRUNG_DUMP, the dump program, and BOOTRUNG_SOURCE, the
source tree, in the environment."""

import math
import os
import subprocess
import sys
import unittest

import bootrung

SOURCE = os.environ.get("BOOTRUNG_SOURCE", ".")
DUMP = os.environ.get("BOOTRUNG_DUMP")
DESIGNS = ["examples/demo-3level.xml", "examples/leg-7level.xml"]

try:
    import numpy
except ImportError:
    numpy = None


def path(rel):
    return os.path.join(SOURCE, rel)


def walk(obj, dotted):
    """obj.a.0.b -> obj.a[0].b"""
    for part in dotted.split("."):
        obj = obj[int(part)] if part.isdigit() else getattr(obj, part)
    return obj


def plain_sum(values):
    """Left to right in doubles, as the C dump sums (Python's sum() may
    compensate)."""
    s = 0.0
    for v in values:
        s += float(v)
    return s


def read_series(result, name):
    """'startup.series.rail.2.len' and the like."""
    head, _, tail = name.partition(".series.")
    quantity, k, what = tail.split(".")
    samples = getattr(walk(result, head).series, quantity)[int(k)]
    return {"len": float(len(samples)), "sum": plain_sum(samples),
            "last": float(samples[-1])}[what]


class SameAsC(unittest.TestCase):
    def check(self, design, more=None):
        out = subprocess.run([DUMP, path(design)] + ([more] if more else []),
                             check=True, capture_output=True, text=True).stdout
        loaded = bootrung.load(path(design))
        result = loaded.analyze(holdup=True)
        if more == "corners":  # the dump's names start "corners." and "yield."
            result.corners = loaded.corners()
            setattr(result, "yield", loaded.yield_(samples=200, seed=3))
        if more:
            result.window = loaded.window()
        if more == "window":
            result.map = loaded.map((0.005, 0.5, 4), (2e3, 120e3, 3))
        lines = out.splitlines()
        self.assertGreater(len(lines), 100)
        for line in lines:
            name, value = line.split()
            want = float(value)
            got = read_series(result, name) if ".series." in name else float(walk(result, name))
            with self.subTest(design=design, name=name):
                if math.isnan(want):
                    self.assertTrue(math.isnan(got))
                else:
                    self.assertEqual(got, want)

    @unittest.skipUnless(DUMP, "BOOTRUNG_DUMP is not set")
    def test_demo(self):
        self.check(DESIGNS[0], "corners")  # the demo's corners take a blink

    @unittest.skipUnless(DUMP, "BOOTRUNG_DUMP is not set")
    def test_leg(self):
        self.check(DESIGNS[1], "window")  # the demo's window has no interval to compare


class Results(unittest.TestCase):
    def test_verdicts_and_kinds(self):
        demo = bootrung.load(path(DESIGNS[0])).analyze()
        self.assertEqual(demo.verdict.result, "fail")  # the drive margin of the demo
        failing = [c.key for c in demo.verdict.criteria if c.result == "fail"]
        self.assertEqual(failing, ["drive"])
        leg = bootrung.load(path(DESIGNS[1])).analyze()
        self.assertEqual(leg.verdict.result, "pass")
        self.assertTrue(leg.startup.complete)
        self.assertTrue(all(not r.never_starts for r in leg.startup.rails))
        self.assertEqual({c.status for c in leg.steady}, {"holds"})
        listed = numpy is None or os.environ.get("BOOTRUNG_NUMPY") == "0"
        kind = list if listed else numpy.ndarray
        self.assertIsInstance(leg.startup.series.time, kind)
        self.assertIsInstance(leg.steady[0].series.rail[1], kind)

    def test_parts(self):
        design = bootrung.load(path(DESIGNS[0]))
        steady = design.steady(series=False)
        self.assertIsNone(steady.startup)
        self.assertIsNone(steady.steady[0].series)
        self.assertIsNone(steady.steady[0].holdup)
        held = design.steady(series=False, holdup=True).steady[0].holdup
        self.assertTrue(held.decided and held.dropped and 0 < held.time < held.simulated)
        self.assertTrue(all(c.key != "startup" for c in steady.verdict.criteria))
        startup = design.startup()
        self.assertEqual(startup.steady, [])
        self.assertEqual(startup.verdict.criteria[0].key, "startup")


class CornersRun(unittest.TestCase):
    def test_demo_corners(self):
        design = bootrung.load(path(DESIGNS[0]))
        k = design.corners()
        self.assertEqual(k.result, "fail")
        self.assertEqual(k.parameters[0], "supply: voltage")
        drive = next(r for r in k.rows if r.key == "drive")
        self.assertEqual(drive.result, "fail")
        self.assertLessEqual(drive.worst_margin, drive.nominal_margin)
        self.assertEqual(drive.levels[0], -1)  # the lowest supply drives worst
        self.assertGreater(k.startup_points, 0)
        quick = design.corners(startup=False)
        self.assertEqual(quick.startup_points, 0)
        self.assertEqual(next(r for r in quick.rows if r.key == "startup").result,
                         "not applicable")

    def test_corners_stop(self):
        with self.assertRaises(bootrung.Cancelled):
            bootrung.load(path(DESIGNS[1])).corners(progress=lambda d, t: True)


class PartsRun(unittest.TestCase):
    """pick and size (bootrung/parts.h) on the demo with the example stock."""

    def test_demo_pick(self):
        design = bootrung.load(path(DESIGNS[0]))
        stock = bootrung.load_catalog(path("examples/parts/catalog.xml"))
        self.assertEqual(len(stock.ids("capacitor")), 12)  # the catalog's own heading
        p = design.pick(stock, top=3, per_rail=False, startup=False)
        self.assertTrue(p.report.startswith("part pick of design demo-3level"))
        self.assertIn(p.result, ("pass", "fail", "undetermined"))
        # x5r-22u-10v is rated 10 V (catalog.xml), below the demo's supply
        # at its maximum: 12 V +5 % = 12.6 V
        why = dict((pid, w) for role, pid, w in p.rejected if role == "capacitor")
        self.assertIn("rated 10 V", why["x5r-22u-10v"])
        self.assertIn("12.6 V", why["x5r-22u-10v"])
        self.assertGreater(len(p.choices), 1)
        rated_out = [pid for pid, w in why.items() if w.startswith("rated ")]
        self.assertIn("x5r-22u-10v", rated_out)
        for ch in p.choices:  # one-part choices only: one part on every rail and link
            self.assertTrue(ch.uniform)
            self.assertEqual(len(set(ch.capacitors[1:])), 1)
            self.assertNotIn(ch.capacitors[1], rated_out)  # never placed
        self.assertEqual(p.ranked, [i for i in p.ranked if p.choices[i].result == "pass"])
        with self.assertRaises(bootrung.Cancelled):
            design.pick(stock, progress=lambda d, t: True)

    def test_demo_size(self):
        design = bootrung.load(path(DESIGNS[0]))
        z = design.size(target=0.05, links=False)
        self.assertTrue(z.report.startswith("sizing of design demo-3level"))
        self.assertEqual(z.target, 0.05)
        self.assertIsNone(z.link)
        self.assertIsNone(z.rails[0])
        self.assertEqual(len(z.rails), 4)  # the demo's four switches, three rails
        self.assertIn(z.rails[1].kind, ("found", "end", "none", "undetermined", "kept"))
        sized = bootrung.load_string(z.design_file, "sized.xml")  # reads back
        self.assertEqual(sized.name, "sized.xml")


class SupplyRun(unittest.TestCase):
    """The supply window (bootrung/parts.h) on the demo: the demo misses its
    minimum drive at its own supply, so no smaller limit or lower voltage
    passes, and the highest voltage is bounded by the regulator's power."""

    def test_demo_supply(self):
        s = bootrung.load(path(DESIGNS[0])).supply()
        self.assertTrue(s.report.startswith("supply window of design demo-3level"))
        self.assertEqual(s.result, "fail")
        for a in (s.limit, s.vmin):
            self.assertTrue(a.applies)
            self.assertEqual(a.kind, "none")
            self.assertTrue(math.isnan(a.value))
            self.assertEqual(a.failing, a.from_)  # fails where it starts
            self.assertEqual(a.criterion, "drive")
        hi = s.vmax
        self.assertEqual((hi.kind, hi.from_, hi.criterion), ("found", 12.0, "regulator-power"))
        self.assertTrue(hi.from_ <= hi.value < hi.failing <= hi.hi)
        self.assertLess(hi.failing - hi.value, 0.011)  # searched to 10 mV
        self.assertEqual(hi.why, "")


class ExploreRun(unittest.TestCase):
    """The exploration (bootrung/parts.h) around the 12-switch example: 5 to
    7 levels on a 1.1 kV bus at 60 kHz with the example switch catalog."""

    def test_leg_explore(self):
        design = bootrung.load(path(DESIGNS[1]))
        stock = bootrung.load_catalog(path("examples/parts/switches.xml"))
        x = design.explore(stock, 1100, (5, 7), [60e3])
        self.assertEqual(len(x.combinations), 9)  # 3 level counts x 3 switch classes
        self.assertEqual(x.csv.count("\n"), 10)  # a header and a row each
        feasible = [c for c in x.combinations if c.state == "feasible"]
        # pass when some combination is feasible, never pass otherwise
        self.assertEqual(x.result == "pass", bool(feasible))
        self.assertIn(f"9 combinations, {len(feasible)} feasible", x.report)
        self.assertEqual(sorted(c.rank for c in feasible), list(range(1, len(feasible) + 1)))
        for c in x.combinations:
            # common practice: each of the N - 1 series switches blocks Vin / (N - 1),
            # used up to the 80 % derating
            self.assertAlmostEqual(c.need, 1100 / (c.levels - 1) / 0.8, places=9)
            self.assertEqual(c.rank > 0, c.state == "feasible")
            if c.inject_rail:  # only a chain too long for one supply is judged split
                self.assertEqual(c.state, "split")
        best = next(i for i, c in enumerate(x.combinations) if c.rank == 1)
        self.assertTrue(x.combinations[best].front)
        c = x.combinations[best]
        self.assertIn(f"{c.levels} levels, switch {c.switch}", x.design_file(best))
        bootrung.load_string(x.design_file(best), "best.xml")  # reads back


class WindowRun(unittest.TestCase):
    def test_demo_window(self):
        w = bootrung.load(path(DESIGNS[0])).window()
        self.assertEqual([a.name for a in w.axes], ["duty", "frequency"])
        duty = w.axis("duty")
        self.assertEqual(duty.design, 0.5)
        self.assertIsNone(duty.limits)  # the demo fails its drive margin at its design point
        self.assertEqual(duty.home, -1)
        self.assertIsNone(duty.startup)

    def test_window_stop(self):
        with self.assertRaises(bootrung.Cancelled):
            bootrung.load(path(DESIGNS[0])).window(progress=lambda d, t: True)


class MapRun(unittest.TestCase):
    def test_leg_map(self):
        m = bootrung.load(path(DESIGNS[1])).map((0.005, 0.5, 4), (2e3, 120e3, 3))
        self.assertEqual(len(m.points), 3)
        self.assertEqual(len(m.points[0]), 4)
        self.assertEqual(m.duty[0], 0.005)
        self.assertEqual(m.fsw[-1], 120e3)
        self.assertTrue(m.design.holds)  # the leg holds at its design point
        kinds = {p.holds for row in m.points for p in row}
        self.assertEqual(kinds, {True, False})
        self.assertEqual(float(m.margin[2][3]), m.points[2][3].margin)

    def test_bad_grid(self):
        with self.assertRaises(bootrung.Error) as ctx:
            bootrung.load(path(DESIGNS[1])).map((0.2, 1.5, 3), (50e3, 100e3, 2))
        self.assertEqual(ctx.exception.field, "duty")


class YieldRun(unittest.TestCase):
    def test_demo_yield(self):
        design = bootrung.load(path(DESIGNS[0]))
        y = design.yield_(samples=50, seed=5)
        self.assertEqual(y.samples, 50)
        self.assertEqual(len(y.values), 50)
        self.assertEqual(y.passed + y.failed + y.undetermined, 50)
        self.assertEqual(y.results.count("fail"), y.failed)
        self.assertTrue(y.lo <= y.yield_ <= y.hi)
        self.assertEqual(y.parameters[0], "supply: voltage")
        self.assertTrue(all(11.4 <= v[0] <= 12.6 for v in y.values))  # 12 V +-5 %
        self.assertEqual(y.rows[0].key, "startup")
        again = design.yield_(samples=50, seed=5)
        self.assertEqual(again.values[7][1], y.values[7][1])  # one seed, one draw

    def test_yield_stop(self):
        with self.assertRaises(bootrung.Cancelled):
            bootrung.load(path(DESIGNS[0])).yield_(samples=50, progress=lambda d, t: True)


class Errors(unittest.TestCase):
    def test_bad_file(self):
        bad = path("tests/bad/bad-version.xml")
        with self.assertRaises(bootrung.Error) as ctx:
            bootrung.load(bad)
        e = ctx.exception
        self.assertEqual(e.file, bad)
        self.assertEqual(e.line, 3)
        self.assertEqual(e.field, "bootrung-design: version")
        self.assertEqual(e.code, "bad input")
        self.assertIn("expected 1", e.message)
        self.assertTrue(str(e).startswith(bad + ":3: "))

    def test_missing_file_and_string(self):
        with self.assertRaises(bootrung.Error) as ctx:
            bootrung.load(path("no/such/design.xml"))
        self.assertIn("design.xml", ctx.exception.file)
        with self.assertRaises(bootrung.Error) as ctx:
            bootrung.load_string("<bootrung-design", name="typed-in")
        self.assertEqual(ctx.exception.file, "typed-in")

    def test_closed(self):
        design = bootrung.load(path(DESIGNS[0]))
        design.close()
        with self.assertRaises(bootrung.Error):
            design.startup()


class Stop(unittest.TestCase):
    def test_progress_stops(self):
        design = bootrung.load(path(DESIGNS[1]))
        calls = []

        def hook(done, total):
            calls.append((done, total))
            return len(calls) >= 2

        with self.assertRaises(bootrung.Cancelled) as ctx:
            design.startup(progress=hook)
        self.assertEqual(len(calls), 2)
        self.assertEqual(ctx.exception.code, "cancelled")
        self.assertTrue(design.startup(progress=lambda d, t: False).startup.complete)

    def test_exception_in_callback(self):
        design = bootrung.load(path(DESIGNS[1]))

        def hook(done, total):
            raise KeyboardInterrupt

        with self.assertRaises(KeyboardInterrupt):
            design.startup(progress=hook)


class SweepExample(unittest.TestCase):
    """examples/python/sweep.py: one row per value, the nominal row the
    figures of the unchanged design."""

    def test_supply_sweep(self):
        script = path("examples/python/sweep.py")
        design = path(DESIGNS[0])
        out = subprocess.run([sys.executable, script, design, "--from", "11", "--to", "13",
                              "--steps", "3"], check=True, capture_output=True, text=True,
                             env=os.environ).stdout
        rows = [l.split() for l in out.splitlines()[1:] if l.strip() and l.split()[0][0].isdigit()]
        self.assertEqual([r[0] for r in rows], ["11", "12", "13"])
        nominal = bootrung.load(design).analyze(series=False)  # the demo's supply is 12 V
        self.assertEqual(rows[1][1], f"{nominal.startup.time * 1e3:.3f}")
        drive = min(r.m_drive for c in nominal.steady for r in c.rails)
        self.assertEqual(rows[1][3], f"{drive:.3f}")
        self.assertEqual(rows[1][4], nominal.verdict.result)
        self.assertNotEqual(rows[0][2], rows[2][2])  # the UVLO margin follows the supply


if __name__ == "__main__":
    unittest.main()
