/* cmd_startup.c - `bootrung startup FILE`: the cold start of a design. */
#include "cli.h"

#include "bootrung/analysis.h"

int cmd_startup(int argc, char **argv)
{
    return br_cli_analysis(
        argc, argv,
        "Simulate the chain of design FILE from cold: capacitors empty, drivers off,\n"
        "the design's pre-charge steps, then PWM. Per stage: when its driver first\n"
        "crosses UVLO rising, when it starts for good, its dropouts, the inrush peak\n"
        "of its link against the diode's binding rating (IFRM for every pulse, IFSM\n"
        "for the largest, I2t for the whole start-up) and where its rail ends; then\n"
        "the start-up time, or which rail never starts, where it settles and why;\n"
        "last the verdict of the start-up criteria (start-up time, inrush, dropouts\n"
        "per stage against the design's max-dropouts, or a warning above 3 without\n"
        "one). Exit status 0 when every driver starts, the inrush is within every\n"
        "rating and the dropouts are within the limit (a warning does not count),\n"
        "1 when not, 2 for bad input, 3 when the simulation failed numerically\n"
        "or reached its work limit (undetermined). The periods in which something\n"
        "discrete happens (a driver starting or dropping out, a pre-charge step\n"
        "ending, the supply ramp, the load current starting) are integrated; the\n"
        "others, where the rails move slowly from one period to the next, are\n"
        "stepped over along the rails' envelope, and the report says how many of\n"
        "each (--startup-method periods integrates every one).\n",
        BR_PART_STARTUP);
}
