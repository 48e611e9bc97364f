/* cmd_analyze.c - `bootrung analyze FILE`: the main job, start-up and
 * steady state with the verdict table. */
#include "cli.h"

#include "bootrung/analysis.h"

int cmd_analyze(int argc, char **argv)
{
    return br_cli_analysis(
        argc, argv,
        "Analyze design FILE: its start-up from cold, its periodic steady state for\n"
        "each current direction it asks for, and the verdict: one row per criterion\n"
        "(start-up time, link inrush within IFRM, IFSM and I2t, start-up dropouts,\n"
        "periodic steady state, driver supplies above UVLO rising, UVLO falling and\n"
        "the minimum drive and below the gate maximum, diode reverse stress within\n"
        "the derated rating, capacitor voltage within its rating, and the supply,\n"
        "regulator, diode, capacitor and junction ratings) with the figure, the\n"
        "limit, the margin and where it binds (on an AC line cycle: the line phase\n"
        "too, the steady state being over the whole line period). Exit status 0 when\n"
        "every criterion judged passes (a warning does not count), 1 when one\n"
        "fails, 2 for bad input, 3 when none fails but one is undetermined (a solver\n"
        "did not converge, a simulation failed or reached its work limit).\n"
        "--pack DIR writes the sign-off pack instead: every verb run on the design\n"
        "into the new folder DIR (each one's HTML page, text, XML and CSV), the\n"
        "design copied in, index.html linking them with the model's assumptions and\n"
        "each part's source, SHA256SUMS and commands.sh to run them again there.\n",
        BR_PART_ALL);
}
