/* cmd_steady.c - `bootrung steady FILE`: the periodic steady state of a
 * running design, for each current direction it asks for. */
#include "cli.h"

#include "bootrung/analysis.h"

int cmd_steady(int argc, char **argv)
{
    return br_cli_analysis(
        argc, argv,
        "Find the periodic steady state of the chain of design FILE running PWM, for\n"
        "each current direction the design asks for (shooting, with plain simulation\n"
        "as the fallback, then cross-checked). Per rail: minimum, maximum, average,\n"
        "ripple, its floor (the highest lower limit at the rail) and the margin above\n"
        "it, the driver supply and its margins to UVLO falling and rising, to the\n"
        "minimum drive and to the gate maximum; per diode: reverse stress against its\n"
        "derated rating, forward current, the displacement current of its junction\n"
        "capacitance, recovery and losses; per capacitor: capacitance at bias, peak\n"
        "voltage against its rating, RMS current; the supply's load.\n"
        "On an AC line cycle the steady state is periodic in the line period: the\n"
        "figures are over the whole line cycle, with the line phase where each rail\n"
        "is lowest and highest and each diode most stressed; --csv and --plot give\n"
        "every rail's envelope per switching period.\n"
        "Exit status 0 when the steady state holds and every margin is met, 1 when\n"
        "not, 2 for bad input, 3 when the solver did not converge or the simulation\n"
        "failed or reached its work limit (undetermined).\n",
        BR_PART_STEADY);
}
