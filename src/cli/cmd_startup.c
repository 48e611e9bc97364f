/* cmd_startup.c - `bootrung startup FILE`: the cold start of a design. */
#include "cli.h"

#include "report/results.h"

int cmd_startup(int argc, char **argv)
{
    return br_cli_analysis(
        argc, argv,
        "Simulate the chain of design FILE from cold: capacitors empty, drivers off,\n"
        "the design's pre-charge steps, then PWM. Per stage: when its driver first\n"
        "crosses UVLO rising, when it starts for good, its dropouts, the inrush peak\n"
        "of its link against the diode's surge rating and where its rail ends; then\n"
        "the start-up time, or which rail never starts, where it settles and why.\n"
        "Exit status 0 when every driver starts (and no inrush exceeds a surge\n"
        "rating), 1 when not, 2 for bad input, 3 when the simulation failed\n"
        "numerically or reached its work limit (undetermined).\n",
        BR_RUN_STARTUP);
}
