/* supply_window.h - what the chain asks of its supply: the smallest
 * current limit, and the lowest and highest supply voltage, at which it
 * still starts and holds at its worst corners.
 *
 * The worst corners come from the one-at-a-time points of the design's
 * tolerances (analyses/spread.h): for each criterion of the verdict (and
 * the rails' headroom) every toleranced parameter at the limit that
 * lowers that criterion's margin, nominal where neither does; distinct
 * corners are kept, the nominal point besides.  A value of the swept
 * quantity passes when every one of those corners passes the whole
 * verdict (cold start included) with the quantity at that value.
 *
 * Each answer is a coarse scan from the design's value outward for the
 * first stretch of values that pass (it may begin beyond the design's
 * value, when that fails), then bisection at each of its ends between the
 * last value that passes and the first that fails,
 * to BR_SW_RES_LIMIT (relative) or BR_SW_RES_V.  The limit is searched
 * downward (a larger limit starts the chain faster) in the design's own
 * limit mode, or as a constant-current limit when the design gives none;
 * the voltage downward and upward.  An undetermined corner decides
 * nothing: the search stops there and says so. */
#ifndef BR_ANALYSES_SUPPLY_WINDOW_H
#define BR_ANALYSES_SUPPLY_WINDOW_H

#include "analyses/spread.h"

#define BR_SW_MAXCORNERS (BR_CRIT_COUNT + 2) /* a worst corner per objective, and nominal */
#define BR_SW_SCAN 10                        /* coarse points per answer */
#define BR_SW_MAXPTS 32                      /* values judged per answer */
#define BR_SW_RES_LIMIT 0.01                 /* current limit: 1 % */
#define BR_SW_RES_V 0.01                     /* supply voltage: 10 mV */

typedef enum br_sw_answer {
    BR_SW_LIMIT = 0, /* the smallest current limit */
    BR_SW_VMIN,      /* the lowest supply voltage */
    BR_SW_VMAX,      /* the highest supply voltage */
    BR_SW_COUNT
} br_sw_answer;

typedef enum br_sw_kind {
    BR_SW_FOUND = 0,   /* passes at `value`, fails at `failing` beyond it */
    BR_SW_RANGE_END,   /* still passes at the end of the range searched */
    BR_SW_NONE,        /* fails already at the value it starts from */
    BR_SW_UNDETERMINED /* a value on the way could not be decided */
} br_sw_kind;

/* One value judged at every corner. */
typedef struct br_sw_point {
    double value; /* A or V */
    int outcome;  /* br_outcome over the corners */
    int crit;     /* a criterion that fails (or is undetermined) there, -1 */
    int corner;   /* at which corner, -1 */
    int stage;    /* where it binds, -1 */
} br_sw_point;

typedef struct br_sw_result {
    int applies; /* 0: not searched (why says why) */
    char why[200];
    int kind;               /* br_sw_kind */
    double from;            /* the value the search starts from: the design's, A or V */
    double lo, hi;          /* the range it may search */
    double value;           /* the furthest value that passes (NaN: none) */
    br_sw_point fail;       /* the nearest value found failing beyond it (or undetermined);
                               BR_SW_NONE: the design's value */
    double enter;           /* when the design's value fails: where the stretch that passes
                               begins (NaN: the design's value passes, or nothing does) */
    br_sw_point enter_fail; /* the nearest value found failing before it */
    int npts;               /* every value judged, in the order judged */
    br_sw_point pt[BR_SW_MAXPTS];
} br_sw_result;

typedef struct br_supply_window {
    br_tol_list tl; /* the design's toleranced parameters */
    int ncorner;
    signed char level[BR_SW_MAXCORNERS][BR_TOL_MAX]; /* -1, 0, +1 per parameter */
    int origin[BR_SW_MAXCORNERS]; /* the objective (a br_crit, BR_CRIT_COUNT for the
                                     headroom, -1 for nominal) whose worst corner it is */
    int mode;                     /* br_supply_limit the limit is searched in */
    br_sw_result r[BR_SW_COUNT];
    long points; /* corners judged in all */
} br_supply_window;

typedef struct br_supply_window_opts {
    int threads;                 /* worker threads; 0: one per processor */
    const br_progress *progress; /* corners judged of an estimate; NULL: none */
    int voltage_only;            /* the supply voltage window only (no current limit) */
} br_supply_window_opts;

/* Search design d (not changed).  BR_ECANCEL when the progress hook asks
 * to stop; BR_ENOMEM; anything else a point meets is in the result. */
int br_supply_window_run(const br_design *d, const br_supply_window_opts *o, br_supply_window **out,
                         br_error *err);
void br_supply_window_free(br_supply_window *w);

#endif
