/* envelope.h - envelope following: a simulator advanced period by period
 * where something discrete happens, and along the envelope of its rails,
 * many periods at a step, where the periods repeat.
 *
 * A cascade's rails move over tens to thousands of periods while each
 * period repeats nearly the same waveform.  Envelope following integrates
 * one period exactly and, from what that period did, steps over many
 * (Petzold, "An efficient numerical method for highly oscillatory
 * ordinary differential equations", SIAM J. Numer. Anal. 18, 1981;
 * Kundert, White and Sangiovanni-Vincentelli, "An envelope-following
 * method for the efficient transient simulation of switching power and
 * filter circuits", ICCAD 1988).  The method here:
 *  - the period map P (rails at a period boundary to the rails one period
 *    later) is modelled around the last integrated period a -> P(a) as
 *    P(x) = P(a) + B (x - a), B the Jacobian of P from the variational
 *    equation over one period, kept up to date by Broyden's secant update
 *    with every integrated period after it;
 *  - a step of K periods follows that model exactly, period after period
 *    (x <- x + g, g <- B g): the exponential of the envelope's linear
 *    dynamics rather than a polynomial in K, so the fast modes of the
 *    cascade (the bottom rails, tied to the supply, settle within a few
 *    periods) die out in the step as they do in the circuit, while the
 *    slow ones (the top rails) follow their own rate; no step length is
 *    limited by stability, only by accuracy;
 *  - every step ends with one integrated period.  Its change against the
 *    model's prediction, carried back over the step through the model,
 *    estimates the step's error; a step whose estimate exceeds the
 *    tolerance, or whose landing period saw anything discrete, is thrown
 *    away (it ran on a copy) and tried shorter, and the next step's
 *    length follows the estimate as a Runge-Kutta step's does;
 *  - a step never covers a period in which something discrete may
 *    happen: the simulator answers whether a driver's supply comes near a
 *    UVLO threshold along the predicted path (with a guard of the rails'
 *    change per period), or a scheduled change (a pre-charge step's end,
 *    the supply ramp, the load current's start) lies ahead
 *    (br_sim_discrete_ahead).  Such periods, and every period after one
 *    with a UVLO transition, are integrated; a chain whose drivers never
 *    stop toggling is thus simulated period by period throughout.
 * The variational equation costs a few plain periods (more on long
 * chains), so it is integrated only when a quiet period promises enough
 * periods to step over. */
#ifndef BR_ENGINE_ENVELOPE_H
#define BR_ENGINE_ENVELOPE_H

#include "engine/sim.h"

/* Largest error a step along the envelope may leave on any rail, V. */
#define BR_ENV_TOL 5e-4

typedef struct br_envelope br_envelope;

/* Why a period was integrated rather than stepped over: something
 * discrete happened in it (BR_WIN_UVLO, BR_WIN_SUPPLY, BR_WIN_SCHEDULE of
 * engine/sim.h, the same numbers); the model of the period map was being
 * built after such a period (the first quiet period after it, the one
 * with the variational equation); a UVLO threshold, a scheduled change or
 * the goal lay within reach of any step (or of one long enough to pay for
 * the variational equation); the error control threw the steps tried
 * away, or allows none of two periods yet; or it was the landing period
 * of a step kept. */
enum {
    BR_ENV_WHY_MODEL = BR_WIN_SCHEDULE + 1,
    BR_ENV_WHY_AHEAD,
    BR_ENV_WHY_REJECTED,
    BR_ENV_WHY_LANDING,
    BR_ENV_WHY_COUNT
};

/* What the driver did so far. */
typedef struct br_env_count {
    long integrated;            /* periods integrated (each partial period counts once) */
    long stepped;               /* periods stepped over along the envelope */
    long steps;                 /* steps along the envelope kept */
    long rejected;              /* steps thrown away by the error control */
    long why[BR_ENV_WHY_COUNT]; /* the integrated periods by why (why[0]: none) */
} br_env_count;

/* A driver for simulator s (kept by pointer, must outlive it), which
 * stands at a period boundary of the loop that calls br_envelope_advance.
 * With replay set (an observer of s records samples), a step's landing
 * period is tried on a copy and, once kept, integrated again on s, so
 * that the observer sees only what is kept; otherwise the copy is kept. */
int br_envelope_create(br_sim *s, int replay, br_envelope **out, br_error *err);
void br_envelope_free(br_envelope *e);

/* Advance s from its period boundary t toward t_goal (> t): one period
 * integrated (or what is left to t_goal, when less), or a step of many
 * periods along the envelope and the period after it integrated, never
 * past t_goal.  Errors are those of br_sim_run_until. */
int br_envelope_advance(br_envelope *e, double t_goal, br_error *err);

const br_env_count *br_envelope_count(const br_envelope *e);

#endif
