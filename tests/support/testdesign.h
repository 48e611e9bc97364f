/* testdesign.h - designs built by hand for tests that must not depend on
 * the design-file reader. */
#ifndef BR_TESTDESIGN_H
#define BR_TESTDESIGN_H

#include "model/design.h"

/* An FCML leg of `levels` levels with one part of each kind, every stage
 * on the defaults; values are plain and documented in testdesign.c. */
br_design *br_test_fcml(int levels, double vin, double fsw, double duty, double deadtime);

/* ---- reference cases: the json files in tests/data/reference ---- */

/* Value of the first "key": number after position from in json; NAN when
 * missing or null.  *next (may be NULL) gets the position after it. */
double br_json_number(const char *json, const char *from, const char *key, const char **next);

/* The design of a reference case file (an FCML leg with one part of each
 * kind; idealised commutation unless the case gives a load current
 * direction, then that direction, its dead-time drop, load current,
 * on-resistance and the time the load starts), or NULL. */
br_design *br_test_reference_design(const char *json);
#endif
