/* internal.h - what the command-line sources not yet moved onto the
 * public API (BR_CLI_INTERNAL in CMakeLists.txt, which includes this
 * first in each of them) still need: a run's progress hook in the
 * library's internal form, for analyses they call through internal
 * headers.  It goes with the last of them. */
#ifndef BR_CLI_INTERNAL_H
#define BR_CLI_INTERNAL_H

#include "cli.h"
#include "core/progress.h"

/* The hook and stop poll of run r as the internal analyses take them;
 * the object lives to the end of the enclosing block. */
#define BR_CLI_HOOK(r) (&(const br_progress){br_cli_run_progress, (r), br_cli_run_stop})

#endif
