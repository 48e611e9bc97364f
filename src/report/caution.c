/* caution.c - the closing caution every report carries.
 *
 * These circuits sit on DC buses of hundreds of volts to kilovolts; a
 * report that reads as a guarantee would be dangerous, so every report
 * ends by saying what it is and what it is not. */
#include "report/caution.h"

int br_report_caution(br_text *out)
{
    return br_text_put(out,
                       "\n"
                       "Caution: these results are design aids computed from a model and the\n"
                       "values in the design file. They do not replace measurement on the real\n"
                       "board, the parts' own data, applicable safety standards, local codes or\n"
                       "licensed engineering practice. These circuits carry lethal voltages.\n");
}
