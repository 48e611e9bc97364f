/* tolerance.h - the toleranced values of a design, as a list of parameters.
 *
 * Any numeric attribute of a design file may carry a tolerance ("10 uF
 * +-20%", "0.6/0.7/0.8 V").  Corner, Monte Carlo and part searches move
 * those values and nothing else; this module names them and reads and
 * writes them in a copy of the design.
 *
 * A parameter is one br_qty of the design: one attribute as written in
 * the file.  A part used on several stages is one parameter, so every
 * stage that uses it takes the same value (one reel of parts).  Only
 * values the chain actually uses are listed: parts no stage refers to and
 * the analysis settings (limits, not circuit values) are left out.  The
 * temperature range is the tolerance of the ambient temperature, the
 * supply tolerance the tolerance of the supply voltage.
 *
 * Writing a value sets the quantity's nominal, the one value the chain
 * builder reads; its limits stay as the file gave them. */
#ifndef BR_MODEL_TOLERANCE_H
#define BR_MODEL_TOLERANCE_H

#include "core/units.h"
#include "model/design.h"

#define BR_TOL_MAX 128  /* toleranced values a design may have */
#define BR_TOL_NAME 112 /* room for a parameter's name */

typedef struct br_tol_param {
    char name[BR_TOL_NAME]; /* "capacitor x5r-10u-25v: c", "operating-point: ambient" */
    int kind;               /* br_kind of the value, for display (temperatures in K) */
    size_t offset;          /* byte offset of the br_qty inside br_design */
    int line;               /* line of the value in the design file, 0 if unknown */
    double nom, min, max;   /* as the file gives them, SI */
    int dist;               /* br_dist */
    double nsig;            /* BR_DIST_NORMAL: the limits sit at +-nsig sigma */
} br_tol_param;

typedef struct br_tol_list {
    int n; /* parameters */
    br_tol_param p[BR_TOL_MAX];
} br_tol_list;

/* The toleranced values (min < max) of d that its chain uses, in file
 * order: operating point, supply, parts by kind, stage resistors, string
 * switches.  BR_EINPUT when there are more than BR_TOL_MAX. */
int br_tol_list_build(const br_design *d, br_tol_list *out, br_error *err);

/* Current value (the nominal field) of parameter p in design d. */
double br_tol_get(const br_design *d, const br_tol_param *p);

/* Set parameter p of d (a copy of the design the list was built from, or
 * one with the same layout) to v. */
void br_tol_set(br_design *d, const br_tol_param *p, double v);

/* Set every parameter of l in d: v[j] for parameter j. */
void br_tol_apply(br_design *d, const br_tol_list *l, const double *v);

/* The value of parameter p at level: -1 its minimum, 0 nominal, +1 maximum. */
double br_tol_level(const br_tol_param *p, int level);

/* Every toleranced value of d that its chain uses set to its nominal
 * (its limits at the nominal), so that d is judged at one point.
 * BR_ENOMEM; BR_EINPUT as br_tol_list_build. */
int br_tol_fix(br_design *d, br_error *err);

/* Index of the parameter at byte offset `offset` in l, or -1. */
int br_tol_find(const br_tol_list *l, size_t offset);

/* A copy of d (plain struct: the caller frees it with br_design_free).
 * NULL when out of memory. */
br_design *br_design_copy(const br_design *d);

#endif
