"""The ctypes binding of libbootrung: the library found, every function
the package calls declared with its argument and result types.

The library is looked up, in order, at the path in the environment
variable BOOTRUNG_LIBRARY, then by the system's search
(ctypes.util.find_library), then as "libbootrung.so"."""

import ctypes
import ctypes.util
import os

c_double_p = ctypes.POINTER(ctypes.c_double)
c_int_p = ctypes.POINTER(ctypes.c_int)
c_char_pp = ctypes.POINTER(ctypes.c_char_p)


class BrError(ctypes.Structure):
    """struct br_error of bootrung.h."""

    _fields_ = [
        ("code", ctypes.c_int),
        ("file", ctypes.c_char * 512),
        ("line", ctypes.c_int),
        ("field", ctypes.c_char * 96),
        ("msg", ctypes.c_char * 768),
    ]


PROGRESS = ctypes.CFUNCTYPE(ctypes.c_int, ctypes.c_void_p, ctypes.c_double, ctypes.c_double)
STOP = ctypes.CFUNCTYPE(ctypes.c_int, ctypes.c_void_p)

# name: (result type, argument types)
_P = ctypes.c_void_p
_INT = ctypes.c_int
_SIGNATURES = {
    "br_version": (ctypes.c_char_p, []),
    "br_status_name": (ctypes.c_char_p, [_INT]),
    "br_design_load": (_INT, [ctypes.c_char_p, ctypes.POINTER(_P), ctypes.POINTER(BrError)]),
    "br_design_load_memory": (
        _INT,
        [ctypes.c_char_p, ctypes.c_size_t, ctypes.c_char_p, ctypes.POINTER(_P),
         ctypes.POINTER(BrError)],
    ),
    "br_design_free": (None, [_P]),
    "br_chain_build": (_INT, [_P, ctypes.POINTER(_P), ctypes.POINTER(BrError)]),
    "br_chain_free": (None, [_P]),
    "br_analysis_create": (_P, []),
    "br_analysis_free": (None, [_P]),
    "br_analysis_set_progress": (_INT, [_P, PROGRESS, STOP, _P]),
    "br_analysis_set_series": (_INT, [_P, _INT]),
    "br_analysis_run": (_INT, [_P, _P, _INT, ctypes.POINTER(BrError)]),
    "br_analysis_parts": (_INT, [_P]),
    "br_analysis_stages": (_INT, [_P]),
    "br_startup_get": (_INT, [_P, _INT, c_double_p]),
    "br_startup_why": (_INT, [_P, c_char_pp]),
    "br_startup_rail": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_startup_dropout": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_startup_supply": (_INT, [_P, _INT, c_double_p]),
    "br_steady_cases": (_INT, [_P, c_int_p]),
    "br_steady_case_name": (_INT, [_P, _INT, c_char_pp]),
    "br_steady_get": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_steady_why": (_INT, [_P, _INT, c_char_pp]),
    "br_steady_rail": (_INT, [_P, _INT, _INT, _INT, c_double_p]),
    "br_steady_link": (_INT, [_P, _INT, _INT, _INT, c_double_p]),
    "br_holdup_get": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_corner_search_create": (_P, []),
    "br_corner_search_free": (None, [_P]),
    "br_corner_search_set_progress": (_INT, [_P, PROGRESS, STOP, _P]),
    "br_corner_search_set_startup": (_INT, [_P, _INT]),
    "br_corner_search_run": (_INT, [_P, _P, ctypes.POINTER(BrError)]),
    "br_corner_result": (_INT, [_P, c_int_p]),
    "br_corner_rows": (_INT, [_P, c_int_p]),
    "br_corner_key": (_INT, [_P, _INT, c_char_pp]),
    "br_corner_result_of": (_INT, [_P, _INT, c_int_p]),
    "br_corner_stage": (_INT, [_P, _INT, c_int_p]),
    "br_corner_value": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_corner_params": (_INT, [_P, c_int_p]),
    "br_corner_param_name": (_INT, [_P, _INT, c_char_pp]),
    "br_corner_level": (_INT, [_P, _INT, _INT, c_int_p]),
    "br_corner_count_of": (_INT, [_P, _INT, ctypes.POINTER(ctypes.c_long)]),
    "br_criteria": (_INT, []),
    "br_criterion_key": (ctypes.c_char_p, [_INT]),
    "br_window_study_create": (_P, []),
    "br_window_study_free": (None, [_P]),
    "br_window_study_set_progress": (_INT, [_P, PROGRESS, STOP, _P]),
    "br_window_study_set_startup": (_INT, [_P, _INT]),
    "br_window_study_run": (_INT, [_P, _P, ctypes.POINTER(BrError)]),
    "br_window_axis": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_window_span": (_INT, [_P, _INT, _INT, _INT, c_double_p]),
    "br_window_startup": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_map_study_create": (_P, []),
    "br_map_study_free": (None, [_P]),
    "br_map_study_set_progress": (_INT, [_P, PROGRESS, STOP, _P]),
    "br_map_study_set_grid": (
        _INT, [_P, ctypes.c_double, ctypes.c_double, _INT, ctypes.c_double, ctypes.c_double, _INT]),
    "br_map_study_run": (_INT, [_P, _P, ctypes.POINTER(BrError)]),
    "br_map_size": (_INT, [_P, c_int_p, c_int_p]),
    "br_map_point": (_INT, [_P, _INT, _INT, _INT, c_double_p]),
    "br_yield_study_create": (_P, []),
    "br_yield_study_free": (None, [_P]),
    "br_yield_study_set_progress": (_INT, [_P, PROGRESS, STOP, _P]),
    "br_yield_study_set_samples": (_INT, [_P, ctypes.c_long, ctypes.c_ulong]),
    "br_yield_study_set_startup": (_INT, [_P, _INT]),
    "br_yield_study_run": (_INT, [_P, _P, ctypes.POINTER(BrError)]),
    "br_yield_get": (_INT, [_P, _INT, c_double_p]),
    "br_yield_result": (_INT, [_P, c_int_p]),
    "br_yield_criterion": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_yield_rho": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_yield_params": (_INT, [_P, c_int_p]),
    "br_yield_param_name": (_INT, [_P, _INT, c_char_pp]),
    "br_yield_sample_value": (_INT, [_P, ctypes.c_long, _INT, c_double_p]),
    "br_yield_sample_result": (_INT, [_P, ctypes.c_long, c_int_p]),
    "br_series_get": (
        _INT,
        [_P, _INT, _INT, _INT, c_double_p, ctypes.c_size_t, ctypes.POINTER(ctypes.c_size_t)],
    ),
    "br_verdict_result": (_INT, [_P, c_int_p]),
    "br_verdict_rows": (_INT, [_P, c_int_p]),
    "br_verdict_result_of": (_INT, [_P, _INT, c_int_p]),
    "br_verdict_key": (_INT, [_P, _INT, c_char_pp]),
    "br_verdict_title": (_INT, [_P, _INT, c_char_pp]),
    "br_verdict_unit": (_INT, [_P, _INT, c_char_pp]),
    "br_verdict_note": (_INT, [_P, _INT, c_char_pp]),
    "br_verdict_stage": (_INT, [_P, _INT, c_int_p]),
    "br_verdict_value": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_chain_stages": (_INT, [_P]),
    "br_text_create": (_P, []),
    "br_text_free": (None, [_P]),
    "br_text_data": (ctypes.c_char_p, [_P]),
    "br_catalog_load": (_INT, [ctypes.c_char_p, ctypes.POINTER(_P), ctypes.POINTER(BrError)]),
    "br_catalog_free": (None, [_P]),
    "br_catalog_name": (_INT, [_P, c_char_pp]),
    "br_catalog_parts": (_INT, [_P, _INT, c_int_p]),
    "br_catalog_part_id": (_INT, [_P, _INT, _INT, c_char_pp]),
    "br_catalog_part_value": (_INT, [_P, _INT, _INT, _INT, c_double_p]),
    "br_pick_study_create": (_P, []),
    "br_pick_study_free": (None, [_P]),
    "br_pick_study_set_progress": (_INT, [_P, PROGRESS, STOP, _P]),
    "br_pick_study_set_threads": (_INT, [_P, _INT]),
    "br_pick_study_set_top": (_INT, [_P, _INT]),
    "br_pick_study_set_min_margin": (_INT, [_P, ctypes.c_double]),
    "br_pick_study_set_startup": (_INT, [_P, _INT]),
    "br_pick_study_set_per_rail": (_INT, [_P, _INT]),
    "br_pick_study_run": (_INT, [_P, _P, _P, ctypes.POINTER(BrError)]),
    "br_pick_result": (_INT, [_P, c_int_p]),
    "br_pick_choices": (_INT, [_P, c_int_p]),
    "br_pick_ranked": (_INT, [_P, c_int_p]),
    "br_pick_ranked_choice": (_INT, [_P, _INT, c_int_p]),
    "br_pick_choice_value": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_pick_choice_part": (_INT, [_P, _INT, _INT, _INT, c_int_p]),
    "br_pick_rejects": (_INT, [_P, c_int_p]),
    "br_pick_reject": (_INT, [_P, _INT, c_int_p, c_int_p, c_char_pp]),
    "br_pick_study_render": (_INT, [_P, _INT, _P, ctypes.POINTER(BrError)]),
    "br_supply_study_create": (_P, []),
    "br_supply_study_free": (None, [_P]),
    "br_supply_study_set_progress": (_INT, [_P, PROGRESS, STOP, _P]),
    "br_supply_study_set_threads": (_INT, [_P, _INT]),
    "br_supply_study_run": (_INT, [_P, _P, ctypes.POINTER(BrError)]),
    "br_supply_result": (_INT, [_P, c_int_p]),
    "br_supply_answer": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_supply_answer_why": (_INT, [_P, _INT, c_char_pp]),
    "br_supply_study_render": (_INT, [_P, _INT, _P, ctypes.POINTER(BrError)]),
    "br_explore_study_create": (_P, []),
    "br_explore_study_free": (None, [_P]),
    "br_explore_study_set_progress": (_INT, [_P, PROGRESS, STOP, _P]),
    "br_explore_study_set_threads": (_INT, [_P, _INT]),
    "br_explore_study_set_bus": (_INT, [_P, ctypes.c_double, ctypes.c_double]),
    "br_explore_study_set_levels": (_INT, [_P, _INT, _INT]),
    "br_explore_study_set_frequencies": (_INT, [_P, c_double_p, _INT]),
    "br_explore_study_set": (_INT, [_P, _INT, ctypes.c_double]),
    "br_explore_study_set_corners": (_INT, [_P, _INT]),
    "br_explore_study_set_scale_caps": (_INT, [_P, _INT]),
    "br_explore_study_run": (_INT, [_P, _P, _P, ctypes.POINTER(BrError)]),
    "br_explore_result": (_INT, [_P, c_int_p]),
    "br_explore_combinations": (_INT, [_P, c_int_p]),
    "br_explore_value": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_explore_note": (_INT, [_P, _INT, c_char_pp]),
    "br_explore_design_file": (_INT, [_P, _INT, _P, ctypes.POINTER(BrError)]),
    "br_explore_study_render": (_INT, [_P, _INT, _P, ctypes.POINTER(BrError)]),
    "br_size_study_create": (_P, []),
    "br_size_study_free": (None, [_P]),
    "br_size_study_set_progress": (_INT, [_P, PROGRESS, STOP, _P]),
    "br_size_study_set_threads": (_INT, [_P, _INT]),
    "br_size_study_set_target": (_INT, [_P, ctypes.c_double]),
    "br_size_study_set_links": (_INT, [_P, _INT]),
    "br_size_study_set_supply": (_INT, [_P, _INT]),
    "br_size_study_run": (_INT, [_P, _P, _P, ctypes.POINTER(BrError)]),
    "br_size_result": (_INT, [_P, c_int_p]),
    "br_size_answer_get": (_INT, [_P, _INT, _INT, c_double_p]),
    "br_size_get": (_INT, [_P, _INT, c_double_p]),
    "br_size_design_file": (_INT, [_P, _P, ctypes.POINTER(BrError)]),
    "br_size_study_render": (_INT, [_P, _INT, _P, ctypes.POINTER(BrError)]),
}

# The constants of bootrung.h and bootrung/analysis.h the package uses.
OK, EINPUT, ENOMEM, EIO, ENUMERIC, EUSAGE, ECANCEL = range(7)
PART_STARTUP, PART_STEADY, PART_ALL, PART_HOLDUP = 1, 2, 3, 4
SU_KEYS = ("complete", "time", "simulated", "pwm_start", "first_stalled", "failed",
           "periods_integrated", "periods_stepped")
SUR_KEYS = ("start", "first_start", "dropouts", "final_voltage", "running", "link_ipeak",
            "link_i2t")
SUP_KEYS = ("span", "ipeak", "iavg", "charge", "energy", "t_limit", "trips", "first_trip",
            "latched")
SS_KEYS = ("status", "residual", "drift", "iterations", "periods", "shooting", "supply_iavg",
           "supply_p")
RAIL_KEYS = ("vmin", "vmax", "vavg", "ripple", "drv_min", "drv_max", "m_uvlo", "m_restart",
             "m_drive", "m_gate", "cap_peak", "cap_rms")
HU_KEYS = ("decided", "dropped", "time", "stage", "v_at", "simulated")
LINK_KEYS = ("vrev", "vrrm", "iavg", "irms", "ipeak", "qrr", "p_diode", "tj")
SERIES_KEYS = ("time", "rail", "link_current", "driver", "reverse")
SERIES_STARTUP, SERIES_STEADY = 0, 1
VERDICT_KEYS = ("figure", "limit", "margin")
CORNER_KEYS = ("worst_figure", "worst_limit", "worst_margin", "nominal_figure",
               "nominal_margin", "undetermined")
CORNER_COUNTS = ("steady_points", "startup_points", "unjudged", "undetermined")
WINDOW_AXES = ("duty", "frequency", "peak_current", "line_frequency")
WA_KEYS = ("applies", "lo", "hi", "design", "fixed", "resolution", "spans", "home")
WS_KEYS = ("low", "low_found", "low_outside", "high", "high_found", "high_outside")
WU_KEYS = ("applies", "design_starts", "low", "low_failing", "low_stalled", "high",
           "high_failing", "high_stalled")
MAP_KEYS = ("duty", "fsw", "margin", "holds", "stage", "criterion")
YIELD_KEYS = ("samples", "passed", "failed", "undetermined", "yield_", "lo", "hi")
YC_KEYS = ("judged", "fails", "undetermined", "q_min", "q_0_1", "q_1", "q_10", "median")
RESULTS = ("pass", "fail", "warn", "undetermined", "not applicable")
# bootrung/parts.h
CATALOG_DIODE, CATALOG_CAPACITOR, CATALOG_SWITCH, CATALOG_DRIVER = 0, 1, 2, 3
OFFER_KEYS = ("cost", "area", "rating")
CHOICE_KEYS = ("cost", "area", "margin", "result", "uniform", "startup", "criterion", "stage",
               "unsettled")
SIZE_KINDS = ("found", "end", "none", "undetermined", "kept")
SZ_KEYS = ("kind", "from_", "value", "part", "margin", "trials")
SUPPLY_ANSWERS = ("limit", "vmin", "vmax")  # BR_SUPPLY_LIMIT, _VMIN, _VMAX
SUPPLY_KINDS = ("found", "end", "none", "undetermined")
SA_KEYS = ("applies", "kind", "from_", "lo", "hi", "value", "failing", "criterion", "stage",
           "points")
# bootrung/parts.h: br_explore_limit, br_combination_state, br_explore_key
EXPLORE_LIMITS = ("load_current", "derating", "target", "max_startup", "max_cost")
COMBO_STATES = ("feasible", "rating", "fails", "split", "margin", "startup", "cost", "corners",
                "undetermined", "refused")
XV_KEYS = ("levels", "fsw", "switch", "diode", "need", "state", "cost", "loss", "margin",
           "startup", "criterion", "stage", "split_at", "front", "rank", "inject_rail")
FORMAT_CSV = 3
SIZE_FIGURES = ("target", "margin", "headroom", "reg_vout", "reg_dropout", "points")
FORMAT_TEXT = 0
STEADY_STATUS = ("holds", "does not hold", "undetermined")
DROPOUT_TIMES = 16

_lib = None


def _find():
    path = os.environ.get("BOOTRUNG_LIBRARY")
    if path:
        return path
    return ctypes.util.find_library("bootrung") or "libbootrung.so"


def _quiet_gsl(lib_path):
    """GSL's default error handler aborts the process; the library checks
    every GSL status itself and leaves this process-wide setting to its
    host (bootrung.h), so the package, as host, turns it off."""
    name = ctypes.util.find_library("gsl")
    for candidate in ([name] if name else []) + [None]:
        try:
            gsl = ctypes.CDLL(candidate)
            gsl.gsl_set_error_handler_off.restype = ctypes.c_void_p
            gsl.gsl_set_error_handler_off()
            return
        except (OSError, AttributeError):
            continue


def lib():
    """The loaded library, declared (loaded on first use)."""
    global _lib
    if _lib is None:
        path = _find()
        handle = ctypes.CDLL(path, mode=ctypes.RTLD_GLOBAL)
        for name, (res, args) in _SIGNATURES.items():
            fn = getattr(handle, name)
            fn.restype = res
            fn.argtypes = args
        _quiet_gsl(path)
        _lib = handle
    return _lib
