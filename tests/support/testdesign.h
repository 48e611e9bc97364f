/* testdesign.h - designs built by hand for tests that must not depend on
 * the design-file reader. */
#ifndef BR_TESTDESIGN_H
#define BR_TESTDESIGN_H

#include "model/design.h"

/* An FCML leg of `levels` levels with one part of each kind, every stage
 * on the defaults; values are plain and documented in testdesign.c. */
br_design *br_test_fcml(int levels, double vin, double fsw, double duty, double deadtime);

#endif
