"""bootrung for Python: load a design, run its analyses, read the results.

A thin layer over the shared library libbootrung (ctypes, no compiled
extension): the figures are the library's, the very numbers the command
line prints.  Time series come back as numpy arrays when numpy can be
imported, as lists of floats otherwise.  A design the library refuses
raises bootrung.Error with its file, line, field and message; a run
stopped by the progress callback raises bootrung.Cancelled.

    import bootrung
    design = bootrung.load("examples/demo-3level.xml")
    result = design.analyze()
    print(result.verdict.result, result.startup.time)

Results are design aids, not a substitute for measurement on the bench."""

import ctypes
import math
from dataclasses import dataclass, field
from typing import Callable, List, Optional

from . import _lib as L

import os as _os

try:  # BOOTRUNG_NUMPY=0 asks for lists even where numpy is installed
    import numpy as _np
    if _os.environ.get("BOOTRUNG_NUMPY") == "0":
        _np = None
except ImportError:  # plain lists then
    _np = None

__all__ = ["Error", "Cancelled", "Design", "load", "load_string", "version", "Analysis",
           "Startup", "StartupRail", "SupplyProfile", "SteadyCase", "SteadyRail",
           "SteadyLink", "Holdup", "Series", "Criterion", "Verdict", "Corners",
           "CornerRow", "Yield", "YieldRow", "Window", "WindowAxis", "WindowSpan",
           "StartupWindow", "Map", "MapPoint", "Catalog", "load_catalog", "Pick",
           "PickChoice", "Size", "SizeAnswer", "Supply", "SupplyAnswer", "Explore",
           "Combination"]


class Error(Exception):
    """The library refused a design or an argument: code (a status name),
    file, line (0: not known), field and message, as the library gave
    them."""

    def __init__(self, code, file, line, field, message):
        self.code, self.file, self.line, self.field, self.message = (
            code, file, line, field, message)
        where = ":".join(p for p in (file, str(line) if line else "") if p)
        text = ": ".join(p for p in (where, field, message) if p)
        super().__init__(text)


class Cancelled(Error):
    """The progress callback asked the run to stop."""


def _raise(rc, err):
    dec = lambda b: b.decode("utf-8", "replace")
    code = L.lib().br_status_name(rc).decode()
    cls = Cancelled if rc == L.ECANCEL else Error
    raise cls(code, dec(err.file), err.line, dec(err.field), dec(err.msg))


def _check(rc, what):
    """An accessor's status: anything but OK is a broken precondition."""
    if rc != L.OK:
        raise Error(L.lib().br_status_name(rc).decode(), "", 0, what, "refused by the library")


def version() -> str:
    """The library's version."""
    return L.lib().br_version().decode()


def _array(values):
    return _np.array(values, dtype=float) if _np is not None else list(values)


@dataclass
class Series:
    """Samples of a simulated stretch: time (s), and per stage k the rail
    voltage, the link's forward current (k = 0: the supply's), the driver
    supply and the link's reverse voltage."""
    time: object
    rail: List[object]
    link_current: List[object]
    driver: List[object]
    reverse: List[object]


@dataclass
class StartupRail:
    index: int
    start: float          # when its driver starts for good, s (inf: never starts)
    first_start: float    # first crossing of UVLO rising, s (inf: never)
    dropouts: int
    dropout_times: List[float]  # the first few, s
    final_voltage: float  # V
    running: bool
    link_ipeak: float     # A (NaN for rail 0, which has no link)
    link_i2t: float       # A^2 s

    @property
    def never_starts(self) -> bool:
        return math.isinf(self.start)


@dataclass
class SupplyProfile:
    span: float
    ipeak: float
    iavg: float
    charge: float
    energy: float
    t_limit: float
    trips: int
    first_trip: float
    latched: bool


@dataclass
class Startup:
    complete: bool
    time: float           # s (inf when a rail never starts)
    simulated: float
    pwm_start: float
    first_stalled: int    # -1: none
    failed: bool          # the simulation failed numerically: nothing is decided
    why: str
    periods_integrated: int
    periods_stepped: int
    rails: List[StartupRail]
    supply: SupplyProfile
    series: Optional[Series] = None


@dataclass
class SteadyRail:
    index: int
    vmin: float
    vmax: float
    vavg: float
    ripple: float
    drv_min: float
    drv_max: float
    m_uvlo: float
    m_restart: float
    m_drive: float
    m_gate: float
    cap_peak: float
    cap_rms: float


@dataclass
class SteadyLink:
    index: int
    vrev: float
    vrrm: float
    iavg: float
    irms: float
    ipeak: float
    qrr: float
    p_diode: float
    tj: float


@dataclass
class Holdup:
    """Switching stops at the steady case's quiet instant (the design's
    hold-on switches stay on); the rails drain until the first driver
    supply crosses UVLO falling."""
    decided: bool         # False: the case has no period to start from (see its why)
    dropped: bool         # a driver dropped within the time simulated
    time: float           # hold-up time, s (inf: none dropped; NaN: not decided)
    stage: int            # the driver that dropped first, -1
    v_at: float           # its driver supply then, V
    simulated: float      # s


@dataclass
class SteadyCase:
    name: str             # "step-down", "step-up", "line-cycle", ...
    status: str           # "holds", "does not hold", "undetermined"
    why: str
    residual: float
    drift: float
    iterations: int
    periods: int
    shooting: bool
    supply_iavg: float
    supply_p: float
    rails: List[SteadyRail]
    links: List[SteadyLink]  # links 1 .. n-1
    series: Optional[Series] = None
    holdup: Optional[Holdup] = None  # with holdup=True


@dataclass
class Criterion:
    key: str
    title: str
    result: str           # "pass", "fail", "warn", "undetermined", "not applicable"
    figure: float
    limit: float
    margin: float
    unit: str
    stage: int            # the binding rail or link, -1
    note: str             # where it binds, or why it is undetermined


@dataclass
class Verdict:
    result: str           # "pass", "fail" or "undetermined"
    criteria: List[Criterion] = field(default_factory=list)


@dataclass
class Analysis:
    startup: Optional[Startup]
    steady: List[SteadyCase]
    verdict: Verdict


@dataclass
class CornerRow:
    """One criterion at its worst corner (and at the nominal point)."""
    key: str
    result: str           # "pass", "fail", "warn", "undetermined", "not applicable"
    worst_figure: float
    worst_limit: float
    worst_margin: float
    nominal_figure: float
    nominal_margin: float
    undetermined: int     # corners where it could not be decided
    stage: int            # the binding rail or link at the worst corner, -1
    levels: List[int]     # per parameter at the worst corner: -1 minimum, 0 nominal, +1 maximum


@dataclass
class Corners:
    result: str           # "pass", "fail" or "undetermined" over every corner
    parameters: List[str]  # the toleranced values, in the design file's order
    rows: List[CornerRow]
    steady_points: int
    startup_points: int
    unjudged: int
    undetermined: int


def _read_corners(h):
    r = _Run(h)
    names = [r.text("br_corner_param_name", j) for j in range(r.int_("br_corner_params"))]
    rows = []
    for i in range(r.int_("br_corner_rows")):
        v = {key: r.num("br_corner_value", i, k) for k, key in enumerate(L.CORNER_KEYS)}
        v["undetermined"] = int(v["undetermined"])
        levels = [r.int_("br_corner_level", i, j) for j in range(len(names))]
        rows.append(CornerRow(r.text("br_corner_key", i),
                              L.RESULTS[r.int_("br_corner_result_of", i)],
                              stage=r.int_("br_corner_stage", i), levels=levels, **v))
    counts = {}
    for k, key in enumerate(L.CORNER_COUNTS):
        out = ctypes.c_long()
        _check(r.lib.br_corner_count_of(h, k, ctypes.byref(out)), "br_corner_count_of")
        counts[key] = out.value
    return Corners(L.RESULTS[r.int_("br_corner_result")], names, rows, **counts)


@dataclass
class WindowSpan:
    """An interval of the axis where every criterion holds: its ends, and
    whether a failing value was found just beyond each (else the range
    searched ends there)."""
    low: float
    low_found: bool
    low_outside: float    # the failing value below it (NaN when the range ends)
    high: float
    high_found: bool
    high_outside: float


@dataclass
class StartupWindow:
    """How far the axis goes either way with the cold start completing."""
    design_starts: bool
    low: float            # the furthest value found starting, low end
    low_failing: float    # the nearest failing one beyond it (NaN: none found)
    low_stalled: int      # the first stalled rail there, -1
    high: float
    high_failing: float
    high_stalled: int


@dataclass
class WindowAxis:
    name: str             # "duty", "frequency", "peak_current", "line_frequency"
    lo: float             # the range searched (duty a fraction, frequencies Hz, current A)
    hi: float
    design: float
    fixed: float          # the other coordinate, held
    resolution: float
    spans: List[WindowSpan]
    home: int             # the span holding the design point, -1 when it fails there
    startup: Optional[StartupWindow] = None

    @property
    def limits(self):
        """(lowest, highest) value around the design point, or None."""
        return None if self.home < 0 else (self.spans[self.home].low, self.spans[self.home].high)


@dataclass
class Window:
    axes: List[WindowAxis]  # only those searched (duty and frequency, or a line cycle's)

    def axis(self, name: str) -> WindowAxis:
        return next(a for a in self.axes if a.name == name)


def _read_window(h):
    r = _Run(h)
    axes = []
    for a, name in enumerate(L.WINDOW_AXES):
        v = {key: r.num("br_window_axis", a, k) for k, key in enumerate(L.WA_KEYS)}
        if not v["applies"]:
            continue
        spans = []
        for i in range(int(v["spans"])):
            sp = {key: r.num("br_window_span", a, i, k) for k, key in enumerate(L.WS_KEYS)}
            sp["low_found"], sp["high_found"] = bool(sp["low_found"]), bool(sp["high_found"])
            spans.append(WindowSpan(**sp))
        su = None
        if a < 2 and r.num("br_window_startup", a, 0):
            u = {key: r.num("br_window_startup", a, k) for k, key in enumerate(L.WU_KEYS)}
            del u["applies"]
            u["design_starts"] = bool(u["design_starts"])
            u["low_stalled"], u["high_stalled"] = int(u["low_stalled"]), int(u["high_stalled"])
            su = StartupWindow(**u)
        axes.append(WindowAxis(name, v["lo"], v["hi"], v["design"], v["fixed"],
                               v["resolution"], spans, int(v["home"]), su))
    return Window(axes)


@dataclass
class MapPoint:
    duty: float           # fraction
    fsw: float            # Hz
    margin: float         # worst margin, V (< 0 fails; NaN: a steady state was not found)
    holds: bool
    stage: int            # the binding rail, -1
    criterion: str        # the binding criterion's key; "no on-time" where the dead time
                          # leaves the bottom switches none (no operating point at all)


@dataclass
class Map:
    duty: List[float]     # the grid's duties
    fsw: List[float]      # its frequencies, Hz
    points: List[List[MapPoint]]  # points[j][i] at (duty[i], fsw[j])
    design: MapPoint      # the design point itself
    margin: object        # the margins as rows per frequency (a 2-D numpy array, or lists)


def _read_map(h):
    r = _Run(h)
    nd, nf = ctypes.c_int(), ctypes.c_int()
    _check(r.lib.br_map_size(h, ctypes.byref(nd), ctypes.byref(nf)), "br_map_size")

    def point(i, j):
        v = {key: r.num("br_map_point", i, j, k) for k, key in enumerate(L.MAP_KEYS)}
        crit = int(v["criterion"])
        v["criterion"] = "no on-time" if crit < 0 else r.lib.br_criterion_key(crit).decode()
        v["holds"], v["stage"] = bool(v["holds"]), int(v["stage"])
        return MapPoint(**v)

    points = [[point(i, j) for i in range(nd.value)] for j in range(nf.value)]
    margin = [[p.margin for p in row] for row in points]
    return Map([p.duty for p in points[0]], [row[0].fsw for row in points], points,
               point(-1, -1), _np.array(margin) if _np is not None else margin)


@dataclass
class YieldRow:
    """One criterion over the samples: its counts, the quantiles of its
    margin over the samples that decide it (NaN for a status criterion),
    and each parameter's rank correlation with that margin."""
    key: str
    judged: int
    fails: int
    undetermined: int
    q_min: float
    q_0_1: float
    q_1: float
    q_10: float
    median: float
    rho: List[float]


@dataclass
class Yield:
    result: str           # "pass", "fail" or "undetermined" over the samples
    samples: int
    passed: int
    failed: int
    undetermined: int
    yield_: float         # passed / (passed + failed); NaN when none is decided
    lo: float             # exact 95 % interval (undetermined samples as failing ...
    hi: float             # ... and as passing)
    parameters: List[str]
    rows: List[YieldRow]
    values: List[object]  # per sample, the drawn values (an array per sample)
    results: List[str]    # per sample


def _read_yield(h):
    r = _Run(h)
    g = {key: r.num("br_yield_get", k) for k, key in enumerate(L.YIELD_KEYS)}
    for key in ("samples", "passed", "failed", "undetermined"):
        g[key] = int(g[key])
    names = [r.text("br_yield_param_name", j) for j in range(r.int_("br_yield_params"))]
    rows = []
    for i in range(r.lib.br_criteria()):
        v = {key: r.num("br_yield_criterion", i, k) for k, key in enumerate(L.YC_KEYS)}
        for key in ("judged", "fails", "undetermined"):
            v[key] = int(v[key])
        rho = [r.num("br_yield_rho", i, j) for j in range(len(names))]
        rows.append(YieldRow(r.lib.br_criterion_key(i).decode(), rho=rho, **v))
    values = [_array([r.num("br_yield_sample_value", i, j) for j in range(len(names))])
              for i in range(g["samples"])]
    results = [L.RESULTS[r.int_("br_yield_sample_result", i)] for i in range(g["samples"])]
    return Yield(L.RESULTS[r.int_("br_yield_result")], parameters=names, rows=rows,
                 values=values, results=results, **g)


@dataclass
class PickChoice:
    """One choice of catalog parts, judged at its worst corners."""
    cost: float           # the catalog parts placed, in the catalog's currency unit
    area: float           # their board area, m2
    margin: float         # smallest voltage margin at the worst corners, V (nan: none decided)
    result: str           # "pass", "fail" or "undetermined"
    uniform: bool         # one part on every rail and link
    startup: bool         # its start-up criteria were judged too
    criterion: int        # where the margin binds (an index of the verdict's criteria), -1
    stage: int            # the binding rail or link, -1
    unsettled: int        # corners where a steady state did not settle
    capacitors: List[Optional[str]]  # per rail k (index 0 unused): the catalog part, None: kept
    diodes: List[Optional[str]]      # per link k (index 0 unused)


@dataclass
class Pick:
    result: str               # "pass" when a choice is ranked, else "undetermined" or "fail"
    choices: List[PickChoice]  # every choice judged: one-part ones first, then per-rail ones
    ranked: List[int]         # indexes into choices, best first
    rejected: List[tuple]     # (role "capacitor" or "diode", part id, why)
    report: str               # the text report `bootrung pick` prints


@dataclass
class Combination:
    """One combination of an exploration: level count, switch class and
    frequency on the template."""
    levels: int
    fsw: float          # Hz
    switch: str         # the catalog switch
    diode: Optional[str]  # the catalog diode placed where the template's falls short
    need: float         # the voltage class the rule asks for, V
    state: str          # "feasible", "rating", "fails", "split", "margin", "startup", "cost",
                        # "corners", "undetermined" or "refused"
    cost: float         # the catalog parts placed
    loss: float         # the supply's power in steady state, W
    margin: float       # smallest margin in volts, V
    startup: float      # start-up time, s
    criterion: str      # where the margin binds or what fails ("" when nothing)
    stage: int          # the rail or link, -1
    split_at: int       # "split": the rail a second supply would feed
    front: bool         # on the Pareto front of cost, supply power and margin
    rank: int           # 1.. among the feasible (0: not feasible)
    inject_rail: int    # "split": the rail the judged split design's second supply feeds (0: none)
    note: str           # why the model refused it ("" otherwise)


@dataclass
class Explore:
    result: str                     # "pass": some combination is feasible
    combinations: List[Combination]  # in the order judged
    report: str                     # the text `bootrung explore` prints
    csv: str                        # every combination, as `--csv` writes it

    def design_file(self, i: int) -> str:
        """Combination i's design file (kept from the run)."""
        return self._files[i]


@dataclass
class SupplyAnswer:
    """One answer of the supply window, judged by the whole verdict at the
    worst corners."""
    applies: bool   # searched (else why says why not)
    kind: str       # "found", "end" (passes to the end of the range), "none" or "undetermined"
    from_: float    # the design's own value, A or V
    lo: float       # the range searched
    hi: float
    value: float    # the furthest value that passes (nan: none)
    failing: float  # the nearest value beyond it that fails or is undetermined
    criterion: str  # what fails there ("" when nothing)
    stage: int      # where, -1
    points: int     # values judged
    why: str        # why it was not searched ("" when it was)


@dataclass
class Supply:
    result: str          # at the design's own supply, every worst corner
    limit: SupplyAnswer  # the smallest current limit, A
    vmin: SupplyAnswer   # the lowest supply voltage, V
    vmax: SupplyAnswer   # the highest, V
    report: str          # the text report `bootrung supply` prints


@dataclass
class SizeAnswer:
    kind: str     # "found", "end", "none", "undetermined" or "kept"
    from_: float  # the design's own value, F or ohm
    value: float  # the answer, F or ohm (nan unless found or end)
    part: int     # the catalog capacitor's index (-1: a continuous value or a resistance)
    margin: float  # its smallest voltage margin, V
    trials: int   # values judged


@dataclass
class Size:
    result: str                 # "pass" when the sized design qualifies, cold start included
    rails: List[Optional[SizeAnswer]]  # per rail k (index 0: None)
    link: Optional[SizeAnswer]  # the link resistance (None: not sized)
    target: float               # V
    margin: float               # the result's smallest voltage margin, V
    headroom: float             # its rails' smallest headroom, V
    reg_vout: float
    reg_dropout: float
    points: int                 # corners judged
    report: str                 # the text report `bootrung size` prints
    design_file: str            # the sized design as a design file


def _render(h, fn, what):
    """A study's text render (fn(h, out, err) or fn(h, format, out, err))."""
    lib = L.lib()
    t = lib.br_text_create()
    if not t:
        raise MemoryError("bootrung: out of memory")
    try:
        err = L.BrError()
        form = L.FORMAT_CSV if what == "csv" else L.FORMAT_TEXT
        args = (h, t, ctypes.byref(err)) if what == "file" else (h, form, t, ctypes.byref(err))
        rc = getattr(lib, fn)(*args)
        if rc != L.OK:
            _raise(rc, err)
        return lib.br_text_data(t).decode("utf-8", "replace")
    finally:
        lib.br_text_free(t)


def _read_pick(h, catalog):
    r = _Run(h)
    roles = {L.CATALOG_CAPACITOR: "capacitor", L.CATALOG_DIODE: "diode"}

    def parts(i, role, stages):
        ks = [r.int_("br_pick_choice_part", i, role, k) for k in range(1, stages)]
        return [None] + [catalog.part_id(role, p) if p >= 0 else None for p in ks]

    choices = []
    stages = catalog._stages
    for i in range(r.int_("br_pick_choices")):
        v = {key: r.num("br_pick_choice_value", i, k) for k, key in enumerate(L.CHOICE_KEYS)}
        v["result"] = L.RESULTS[int(v["result"])]
        for key in ("uniform", "startup"):
            v[key] = bool(v[key])
        for key in ("criterion", "stage", "unsettled"):
            v[key] = int(v[key])
        choices.append(PickChoice(capacitors=parts(i, L.CATALOG_CAPACITOR, stages),
                                  diodes=parts(i, L.CATALOG_DIODE, stages), **v))
    ranked = [r.int_("br_pick_ranked_choice", j) for j in range(r.int_("br_pick_ranked"))]
    rejected = []
    for j in range(r.int_("br_pick_rejects")):
        role, part, why = ctypes.c_int(), ctypes.c_int(), ctypes.c_char_p()
        _check(r.lib.br_pick_reject(h, j, ctypes.byref(role), ctypes.byref(part),
                                    ctypes.byref(why)), "br_pick_reject")
        rejected.append((roles[role.value], catalog.part_id(role.value, part.value),
                         why.value.decode("utf-8", "replace")))
    return Pick(L.RESULTS[r.int_("br_pick_result")], choices, ranked, rejected,
                _render(h, "br_pick_study_render", "text"))


def _size_answer(r, k):
    out = ctypes.c_double()
    if r.lib.br_size_answer_get(r.h, k, 0, ctypes.byref(out)) != L.OK:
        return None  # not sized
    v = {key: r.num("br_size_answer_get", k, j) for j, key in enumerate(L.SZ_KEYS)}
    v["kind"] = L.SIZE_KINDS[int(v["kind"])]
    v["part"], v["trials"] = int(v["part"]), int(v["trials"])
    return SizeAnswer(**v)


def _supply_answer(r, a):
    v = {key: r.num("br_supply_answer", a, j) for j, key in enumerate(L.SA_KEYS)}
    v["applies"] = bool(v["applies"])
    v["kind"] = L.SUPPLY_KINDS[int(v["kind"])] if v["applies"] else ""
    crit = int(v["criterion"]) if v["applies"] else -1
    v["criterion"] = r.lib.br_criterion_key(crit).decode() if crit >= 0 else ""
    v["stage"], v["points"] = int(v["stage"]), int(v["points"])
    v["why"] = r.text("br_supply_answer_why", a)
    return SupplyAnswer(**v)


def _combination(r, i, catalog):
    v = {key: r.num("br_explore_value", i, j) for j, key in enumerate(L.XV_KEYS)}
    for key in ("levels", "switch", "diode", "state", "criterion", "stage", "split_at", "rank",
                "inject_rail"):
        v[key] = int(v[key])
    v["state"] = L.COMBO_STATES[v["state"]]
    v["switch"] = catalog.part_id(L.CATALOG_SWITCH, v["switch"]) if v["switch"] >= 0 else ""
    v["diode"] = catalog.part_id(L.CATALOG_DIODE, v["diode"]) if v["diode"] >= 0 else None
    crit = v["criterion"]
    v["criterion"] = r.lib.br_criterion_key(crit).decode() if crit >= 0 else ""
    v["front"] = bool(v["front"])
    v["note"] = r.text("br_explore_note", i)
    return Combination(**v)


def _design_file(h, i):
    lib, err = L.lib(), L.BrError()
    t = lib.br_text_create()
    if not t:
        raise MemoryError("bootrung: out of memory")
    try:
        if lib.br_explore_design_file(h, i, t, ctypes.byref(err)) != L.OK:
            return None  # the rule left it no switch or diode
        return lib.br_text_data(t).decode("utf-8", "replace")
    finally:
        lib.br_text_free(t)


def _read_explore(h, catalog):
    r = _Run(h)
    n = r.int_("br_explore_combinations")
    x = Explore(L.RESULTS[r.int_("br_explore_result")],
                [_combination(r, i, catalog) for i in range(n)],
                report=_render(h, "br_explore_study_render", "text"),
                csv=_render(h, "br_explore_study_render", "csv"))
    x._files = [_design_file(h, i) for i in range(n)]
    return x


def _read_supply(h):
    r = _Run(h)
    answers = {name: _supply_answer(r, a) for a, name in enumerate(L.SUPPLY_ANSWERS)}
    return Supply(L.RESULTS[r.int_("br_supply_result")],
                  report=_render(h, "br_supply_study_render", "text"), **answers)


def _read_size(h, stages):
    r = _Run(h)
    figures = {key: r.num("br_size_get", k) for k, key in enumerate(L.SIZE_FIGURES)}
    figures["points"] = int(figures["points"])
    return Size(L.RESULTS[r.int_("br_size_result")],
                [None] + [_size_answer(r, k) for k in range(1, stages)], _size_answer(r, 0),
                report=_render(h, "br_size_study_render", "text"),
                design_file=_render(h, "br_size_design_file", "file"), **figures)


class Catalog:
    """A part catalog (docs/catalog.md), loaded and checked."""

    def __init__(self, handle, path):
        self._lib, self._h, self.path = L.lib(), handle, path
        self._stages = 0

    def close(self):
        if self._h:
            self._lib.br_catalog_free(self._h)
            self._h = None

    def __del__(self):
        self.close()

    def parts(self, role: int) -> int:
        out = ctypes.c_int()
        _check(self._lib.br_catalog_parts(self._h, role, ctypes.byref(out)), "br_catalog_parts")
        return out.value

    def part_id(self, role: int, i: int) -> str:
        out = ctypes.c_char_p()
        _check(self._lib.br_catalog_part_id(self._h, role, i, ctypes.byref(out)),
               "br_catalog_part_id")
        return out.value.decode("utf-8", "replace")

    def ids(self, role: str) -> List[str]:
        """The ids of the "diode", "capacitor", "switch" or "driver" parts."""
        k = ("diode", "capacitor", "switch", "driver").index(role)
        return [self.part_id(k, i) for i in range(self.parts(k))]


def load_catalog(path: str) -> Catalog:
    """Load and check the part catalog at path."""
    lib, err, c = L.lib(), L.BrError(), ctypes.c_void_p()
    rc = lib.br_catalog_load(str(path).encode(), ctypes.byref(c), ctypes.byref(err))
    if rc != L.OK:
        _raise(rc, err)
    return Catalog(c, str(path))


def _hook(progress, failure):
    """A C progress hook around a Python callable (None: no hook); an
    exception it raises is kept in failure and stops the run."""
    if not progress:
        return L.PROGRESS()

    def hook(_ctx, done, total):
        try:
            return 1 if progress(done, total) else 0
        except BaseException as e:  # KeyboardInterrupt included
            failure.append(e)
            return 1

    return L.PROGRESS(hook)


class _Run:
    """One br_analysis, read into plain objects and freed."""

    def __init__(self, handle):
        self.h, self.lib = handle, L.lib()

    def num(self, fn, *args):
        out = ctypes.c_double()
        _check(getattr(self.lib, fn)(self.h, *args, ctypes.byref(out)), fn)
        return out.value

    def int_(self, fn, *args):
        out = ctypes.c_int()
        _check(getattr(self.lib, fn)(self.h, *args, ctypes.byref(out)), fn)
        return out.value

    def text(self, fn, *args):
        out = ctypes.c_char_p()
        _check(getattr(self.lib, fn)(self.h, *args, ctypes.byref(out)), fn)
        return out.value.decode("utf-8", "replace")

    def column(self, series, key, k):
        n = ctypes.c_size_t()
        _check(self.lib.br_series_get(self.h, series, key, k, None, 0, ctypes.byref(n)),
               "br_series_get")
        buf = (ctypes.c_double * n.value)()
        _check(self.lib.br_series_get(self.h, series, key, k, buf, n.value, ctypes.byref(n)),
               "br_series_get")
        if _np is not None:
            return _np.ctypeslib.as_array(buf).copy()
        return list(buf)

    def series(self, which, stages):
        cols = [[self.column(which, key, k) for k in range(stages)]
                for key in range(1, len(L.SERIES_KEYS))]
        return Series(self.column(which, 0, 0), *cols)

    def startup(self, stages, keep):
        g = {key: self.num("br_startup_get", i) for i, key in enumerate(L.SU_KEYS)}
        rails = []
        for k in range(stages):
            r = {key: self.num("br_startup_rail", k, i) for i, key in enumerate(L.SUR_KEYS)}
            n = min(int(r["dropouts"]), L.DROPOUT_TIMES)
            times = [self.num("br_startup_dropout", k, i) for i in range(n)]
            rails.append(StartupRail(k, r["start"], r["first_start"], int(r["dropouts"]), times,
                                     r["final_voltage"], bool(r["running"]), r["link_ipeak"],
                                     r["link_i2t"]))
        s = {key: self.num("br_startup_supply", i) for i, key in enumerate(L.SUP_KEYS)}
        s["trips"], s["latched"] = int(s["trips"]), bool(s["latched"])
        return Startup(bool(g["complete"]), g["time"], g["simulated"], g["pwm_start"],
                       int(g["first_stalled"]), bool(g["failed"]), self.text("br_startup_why"),
                       int(g["periods_integrated"]), int(g["periods_stepped"]), rails,
                       SupplyProfile(**s),
                       self.series(L.SERIES_STARTUP, stages) if keep else None)

    def holdup(self, d):
        h = {key: self.num("br_holdup_get", d, i) for i, key in enumerate(L.HU_KEYS)}
        return Holdup(bool(h["decided"]), h["dropped"] == 1, h["time"], int(h["stage"]),
                      h["v_at"], h["simulated"])

    def case(self, d, stages, keep, holdup):
        g = {key: self.num("br_steady_get", d, i) for i, key in enumerate(L.SS_KEYS)}
        rails = [SteadyRail(k, **{key: self.num("br_steady_rail", d, k, i)
                                  for i, key in enumerate(L.RAIL_KEYS)}) for k in range(stages)]
        links = [SteadyLink(k, **{key: self.num("br_steady_link", d, k, i)
                                  for i, key in enumerate(L.LINK_KEYS)})
                 for k in range(1, stages)]
        return SteadyCase(self.text("br_steady_case_name", d), L.STEADY_STATUS[int(g["status"])],
                          self.text("br_steady_why", d), g["residual"], g["drift"],
                          int(g["iterations"]), int(g["periods"]), bool(g["shooting"]),
                          g["supply_iavg"], g["supply_p"], rails, links,
                          self.series(L.SERIES_STEADY + d, stages) if keep else None,
                          self.holdup(d) if holdup else None)

    def criterion(self, i):
        v = [self.num("br_verdict_value", i, j) for j in range(len(L.VERDICT_KEYS))]
        return Criterion(self.text("br_verdict_key", i), self.text("br_verdict_title", i),
                         L.RESULTS[self.int_("br_verdict_result_of", i)], v[0], v[1], v[2],
                         self.text("br_verdict_unit", i), self.int_("br_verdict_stage", i),
                         self.text("br_verdict_note", i))

    def verdict(self):
        rows = [self.criterion(i) for i in range(self.int_("br_verdict_rows"))]
        return Verdict(L.RESULTS[self.int_("br_verdict_result")], rows)

    def read(self, parts, keep):
        stages = self.lib.br_analysis_stages(self.h)
        su = self.startup(stages, keep) if parts & L.PART_STARTUP else None
        cases = []
        if parts & L.PART_STEADY:
            cases = [self.case(d, stages, keep, parts & L.PART_HOLDUP)
                     for d in range(self.int_("br_steady_cases"))]
        return Analysis(su, cases, self.verdict())


class Design:
    """A loaded design and its chain at nominal values."""

    def __init__(self, design, chain, name):
        self._lib, self._design, self._chain, self.name = L.lib(), design, chain, name

    def close(self):
        """Free the library's objects now (else when garbage-collected)."""
        if self._chain:
            self._lib.br_chain_free(self._chain)
            self._chain = None
        if self._design:
            self._lib.br_design_free(self._design)
            self._design = None

    def __del__(self):
        self.close()

    def __enter__(self):
        return self

    def __exit__(self, *exc):
        self.close()

    def _run(self, parts, series, progress):
        if not self._chain:
            raise Error(L.lib().br_status_name(L.EUSAGE).decode(), "", 0, "design",
                        "the design was closed; load it again")
        lib = self._lib
        h = lib.br_analysis_create()
        if not h:
            raise MemoryError("bootrung: out of memory")
        # The callback lives until the run returns; a Python exception in
        # it stops the run rather than vanish.
        failure = []
        cb = _hook(progress, failure)
        try:
            _check(lib.br_analysis_set_progress(h, cb, L.STOP(), None), "progress")
            _check(lib.br_analysis_set_series(h, 1 if series else 0), "series")
            err = L.BrError()
            rc = lib.br_analysis_run(h, self._chain, parts, ctypes.byref(err))
            if failure:
                raise failure[0]
            if rc != L.OK:
                _raise(rc, err)
            return _Run(h).read(parts, series)
        finally:
            lib.br_analysis_free(h)

    def startup(self, series: bool = True,
                progress: Optional[Callable[[float, float], bool]] = None) -> Analysis:
        """The cold start and its criteria.  progress(done, total) is
        called now and then (simulated seconds); a true return stops the
        run with Cancelled."""
        return self._run(L.PART_STARTUP, series, progress)

    def steady(self, series: bool = True, holdup: bool = False,
               progress: Optional[Callable[[float, float], bool]] = None) -> Analysis:
        """The periodic steady state of each current direction, and its
        criteria; with holdup=True each case's hold-up time too."""
        return self._run(L.PART_STEADY | (L.PART_HOLDUP if holdup else 0), series, progress)

    def analyze(self, series: bool = True, holdup: bool = False,
                progress: Optional[Callable[[float, float], bool]] = None) -> Analysis:
        """Both, and the full verdict (and the hold-up times with
        holdup=True)."""
        return self._run(L.PART_ALL | (L.PART_HOLDUP if holdup else 0), series, progress)


    def corners(self, startup: bool = True,
                progress: Optional[Callable[[float, float], bool]] = None) -> Corners:
        """The worst-case corners of every criterion over the design's
        tolerances (startup=False: the steady-state criteria alone, no
        cold starts).  progress(done, total) counts corners judged."""
        if not self._design:
            raise Error(L.lib().br_status_name(L.EUSAGE).decode(), "", 0, "design",
                        "the design was closed; load it again")
        lib = self._lib
        h = lib.br_corner_search_create()
        if not h:
            raise MemoryError("bootrung: out of memory")
        failure = []
        cb = _hook(progress, failure)
        try:
            _check(lib.br_corner_search_set_progress(h, cb, L.STOP(), None), "progress")
            _check(lib.br_corner_search_set_startup(h, 1 if startup else 0), "startup")
            err = L.BrError()
            rc = lib.br_corner_search_run(h, self._design, ctypes.byref(err))
            if failure:
                raise failure[0]
            if rc != L.OK:
                _raise(rc, err)
            return _read_corners(h)
        finally:
            lib.br_corner_search_free(h)


    def _study(self, prefix, reader, progress, setup, catalog=None, with_catalog=False):
        """Create, set up, run on the design (and a catalog: pick and size),
        read and free one of the design-level studies."""
        if not self._design:
            raise Error(L.lib().br_status_name(L.EUSAGE).decode(), "", 0, "design",
                        "the design was closed; load it again")
        lib = self._lib
        h = getattr(lib, prefix + "_create")()
        if not h:
            raise MemoryError("bootrung: out of memory")
        failure = []
        cb = _hook(progress, failure)
        try:
            _check(getattr(lib, prefix + "_set_progress")(h, cb, L.STOP(), None), "progress")
            setup(h)
            err = L.BrError()
            run = getattr(lib, prefix + "_run")
            if catalog is not None or with_catalog:  # pick and size take a catalog
                rc = run(h, self._design, catalog, ctypes.byref(err))
            else:
                rc = run(h, self._design, ctypes.byref(err))
            if failure:
                raise failure[0]
            if rc != L.OK:
                _raise(rc, err)
            return reader(h)
        finally:
            getattr(lib, prefix + "_free")(h)

    def window(self, startup: bool = False,
               progress: Optional[Callable[[float, float], bool]] = None) -> Window:
        """How far duty and frequency (or a line cycle's peak current and
        frequency) can move with every criterion holding; startup=True
        also the start-up window (a cold start per point: slow)."""
        setup = lambda h: _check(self._lib.br_window_study_set_startup(h, int(startup)),
                                 "startup")
        return self._study("br_window_study", _read_window, progress, setup)

    def map(self, duty: tuple, fsw: tuple,
            progress: Optional[Callable[[float, float], bool]] = None) -> Map:
        """The worst margin over a grid: duty=(from, to, n) as fractions,
        fsw=(from, to, n) in Hz (spaced by equal ratios); n up to 400."""
        setup = lambda h: _check(self._lib.br_map_study_set_grid(
            h, float(duty[0]), float(duty[1]), int(duty[2]), float(fsw[0]), float(fsw[1]),
            int(fsw[2])), "grid")
        return self._study("br_map_study", _read_map, progress, setup)

    def yield_(self, samples: int = 1000, seed: int = 1, startup: bool = False,
               progress: Optional[Callable[[float, float], bool]] = None) -> Yield:
        """Monte Carlo yield over the design's tolerances: samples drawn
        from one generator seeded with seed; startup=True judges the
        start-up criteria too (a cold start per sample)."""
        if not self._design:
            raise Error(L.lib().br_status_name(L.EUSAGE).decode(), "", 0, "design",
                        "the design was closed; load it again")
        lib = self._lib
        h = lib.br_yield_study_create()
        if not h:
            raise MemoryError("bootrung: out of memory")
        failure = []
        cb = _hook(progress, failure)
        try:
            _check(lib.br_yield_study_set_progress(h, cb, L.STOP(), None), "progress")
            _check(lib.br_yield_study_set_samples(h, samples, seed), "samples")
            _check(lib.br_yield_study_set_startup(h, 1 if startup else 0), "startup")
            err = L.BrError()
            rc = lib.br_yield_study_run(h, self._design, ctypes.byref(err))
            if failure:
                raise failure[0]
            if rc != L.OK:
                _raise(rc, err)
            return _read_yield(h)
        finally:
            lib.br_yield_study_free(h)


    def pick(self, catalog: Catalog, top: int = 10, min_margin: Optional[float] = None,
             startup: bool = True, per_rail: bool = True, threads: int = 0,
             progress: Optional[Callable[[float, float], bool]] = None) -> Pick:
        """Rail capacitors and link diodes from catalog, judged at their
        worst corners and ranked by cost (`bootrung pick`); min_margin in
        volts (None: a quarter of the smallest UVLO hysteresis)."""
        lib = self._lib
        catalog._stages = lib.br_chain_stages(self._chain)

        def setup(h):
            _check(lib.br_pick_study_set_top(h, top), "top")
            _check(lib.br_pick_study_set_min_margin(
                h, math.nan if min_margin is None else float(min_margin)), "min_margin")
            _check(lib.br_pick_study_set_startup(h, int(startup)), "startup")
            _check(lib.br_pick_study_set_per_rail(h, int(per_rail)), "per_rail")
            _check(lib.br_pick_study_set_threads(h, threads), "threads")

        return self._study("br_pick_study", lambda h: _read_pick(h, catalog), progress, setup,
                           catalog._h)

    def explore(self, catalog: "Catalog", vbus: float, levels: tuple, frequencies,
                vmax: Optional[float] = None, load_current: Optional[float] = None,
                derating: Optional[float] = None, target: Optional[float] = None,
                max_startup: Optional[float] = None, max_cost: Optional[float] = None,
                corners: bool = False, scale_caps: bool = False, threads: int = 0,
                progress: Optional[Callable[[float, float], bool]] = None) -> Explore:
        """Explore level counts (lo, hi), the switch classes of catalog and
        the frequencies (Hz) around this design as a template, as `bootrung
        explore` does; vbus and vmax in volts, the limits in SI (None: the
        template's or the tool's default)."""
        lib = self._lib
        freqs = [float(f) for f in frequencies]
        limits = (load_current, derating, target, max_startup, max_cost)

        def setup(h):
            _check(lib.br_explore_study_set_bus(h, float(vbus),
                                                float(vbus if vmax is None else vmax)), "vbus")
            _check(lib.br_explore_study_set_levels(h, int(levels[0]), int(levels[1])), "levels")
            arr = (ctypes.c_double * len(freqs))(*freqs)
            _check(lib.br_explore_study_set_frequencies(h, arr, len(freqs)), "frequencies")
            for j, value in enumerate(limits):
                if value is not None:
                    _check(lib.br_explore_study_set(h, j, float(value)), L.EXPLORE_LIMITS[j])
            _check(lib.br_explore_study_set_corners(h, int(corners)), "corners")
            _check(lib.br_explore_study_set_scale_caps(h, int(scale_caps)), "scale_caps")
            _check(lib.br_explore_study_set_threads(h, threads), "threads")

        return self._study("br_explore_study", lambda h: _read_explore(h, catalog), progress,
                           setup, catalog._h)

    def supply(self, threads: int = 0,
               progress: Optional[Callable[[float, float], bool]] = None) -> Supply:
        """What the chain asks of its supply (`bootrung supply`): the smallest
        current limit and the supply voltage window, each judged by the
        whole verdict at the design's worst corners."""
        lib = self._lib

        def setup(h):
            _check(lib.br_supply_study_set_threads(h, threads), "threads")

        return self._study("br_supply_study", _read_supply, progress, setup)

    def size(self, catalog: Optional[Catalog] = None, target: Optional[float] = None,
             links: bool = True, supply: bool = False, threads: int = 0,
             progress: Optional[Callable[[float, float], bool]] = None) -> Size:
        """Size the design to a margin target in volts (None: a quarter of
        the smallest UVLO hysteresis), rail capacitors from catalog (None:
        continuous values), as `bootrung size` does."""
        lib = self._lib
        stages = lib.br_chain_stages(self._chain)

        def setup(h):
            _check(lib.br_size_study_set_target(
                h, math.nan if target is None else float(target)), "target")
            _check(lib.br_size_study_set_links(h, int(links)), "links")
            _check(lib.br_size_study_set_supply(h, int(supply)), "supply")
            _check(lib.br_size_study_set_threads(h, threads), "threads")

        return self._study("br_size_study", lambda h: _read_size(h, stages), progress, setup,
                           catalog._h if catalog else None, with_catalog=True)

def _build(rc, err, design):
    lib = L.lib()
    if rc != L.OK:
        _raise(rc, err)
    chain = ctypes.c_void_p()
    rc = lib.br_chain_build(design, ctypes.byref(chain), ctypes.byref(err))
    if rc != L.OK:
        lib.br_design_free(design)
        _raise(rc, err)
    return chain


def load(path: str) -> Design:
    """Load, check and build the design file at path."""
    lib, err, d = L.lib(), L.BrError(), ctypes.c_void_p()
    rc = lib.br_design_load(str(path).encode(), ctypes.byref(d), ctypes.byref(err))
    chain = _build(rc, err, d)
    return Design(d, chain, str(path))


def load_string(text: str, name: str = "<string>") -> Design:
    """The same from the text of a design file; name appears in errors."""
    lib, err, d = L.lib(), L.BrError(), ctypes.c_void_p()
    data = text.encode("utf-8")
    rc = lib.br_design_load_memory(data, len(data), name.encode(), ctypes.byref(d),
                                   ctypes.byref(err))
    chain = _build(rc, err, d)
    return Design(d, chain, name)
