/* quantity.c - quantities with units through the public API
 * (include/bootrung/parts.h): the design file's own parser. */
#include "bootrung/parts.h"

#include "core/error.h"
#include "core/units.h"

_Static_assert((int)BR_QUANTITY_VOLTAGE == (int)BR_KIND_VOLTAGE &&
                   (int)BR_QUANTITY_CURRENT == (int)BR_KIND_CURRENT &&
                   (int)BR_QUANTITY_CAPACITANCE == (int)BR_KIND_CAPACITANCE &&
                   (int)BR_QUANTITY_FREQUENCY == (int)BR_KIND_FREQUENCY &&
                   (int)BR_QUANTITY_TIME == (int)BR_KIND_TIME &&
                   (int)BR_QUANTITY_RESISTANCE == (int)BR_KIND_RESISTANCE &&
                   (int)BR_QUANTITY_CHARGE == (int)BR_KIND_CHARGE &&
                   (int)BR_QUANTITY_TEMPERATURE == (int)BR_KIND_TEMPERATURE &&
                   (int)BR_QUANTITY_TEMP_DELTA == (int)BR_KIND_TEMP_DELTA &&
                   (int)BR_QUANTITY_FRACTION == (int)BR_KIND_FRACTION &&
                   (int)BR_QUANTITY_NUMBER == (int)BR_KIND_NUMBER,
               "the public kinds are the parser's");

int br_quantity_parse(const char *text, int kind, double *out, br_error *err)
{
    if (!text || !out || kind < 0 || kind >= BR_QUANTITY_KIND_COUNT)
        return br_error_set(err, BR_EUSAGE, NULL, 0, NULL,
                            "br_quantity_parse: expected a text, a br_quantity_kind and an out");
    return br_unit_parse(text, (br_kind)kind, out, err);
}
