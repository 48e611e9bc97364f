/* catalog.c - the part catalog through the public API
 * (include/bootrung/parts.h): its parts by role, their ids, offers and
 * voltage ratings.  Loading and freeing are the io layer's own functions,
 * exported as they are. */
#include "bootrung/parts.h"

#include "model/catalog.h"

#include <math.h>

int br_catalog_name(const br_catalog *c, const char **out)
{
    if (!c || !out)
        return BR_EUSAGE;
    *out = c->name;
    return BR_OK;
}

int br_catalog_path(const br_catalog *c, const char **out)
{
    if (!c || !out)
        return BR_EUSAGE;
    *out = c->path;
    return BR_OK;
}

static int count_of(const br_catalog *c, int role)
{
    switch (role) {
    case BR_CATALOG_DIODE:
        return c->ndiodes;
    case BR_CATALOG_CAPACITOR:
        return c->ncaps;
    case BR_CATALOG_SWITCH:
        return c->nswitches;
    case BR_CATALOG_DRIVER:
        return c->ndrivers;
    default:
        return -1;
    }
}

int br_catalog_parts(const br_catalog *c, int role, int *out)
{
    if (!c || !out || count_of(c, role) < 0)
        return BR_EUSAGE;
    *out = count_of(c, role);
    return BR_OK;
}

static int valid(const br_catalog *c, int role, int i)
{
    return c && i >= 0 && i < count_of(c, role);
}

int br_catalog_part_id(const br_catalog *c, int role, int i, const char **out)
{
    if (!valid(c, role, i) || !out)
        return BR_EUSAGE;
    *out = role == BR_CATALOG_DIODE       ? c->diodes[i].id
           : role == BR_CATALOG_CAPACITOR ? c->caps[i].id
           : role == BR_CATALOG_SWITCH    ? c->switches[i].id
                                          : c->drivers[i].id;
    return BR_OK;
}

static const br_offer *offer_of(const br_catalog *c, int role, int i)
{
    return role == BR_CATALOG_DIODE       ? &c->diode_offer[i]
           : role == BR_CATALOG_CAPACITOR ? &c->cap_offer[i]
           : role == BR_CATALOG_SWITCH    ? &c->switch_offer[i]
                                          : &c->driver_offer[i];
}

/* A rating of 0 is one the catalog does not give. */
static double rating_of(const br_catalog *c, int role, int i)
{
    double v = role == BR_CATALOG_DIODE       ? c->diodes[i].vrrm.nom
               : role == BR_CATALOG_CAPACITOR ? c->caps[i].vrated.nom
               : role == BR_CATALOG_SWITCH    ? c->switch_rating[i]
                                              : 0;
    return v > 0 ? v : NAN;
}

int br_catalog_part_value(const br_catalog *c, int role, int i, int key, double *out)
{
    if (!valid(c, role, i) || !out || key < 0 || key >= BR_OFFER_KEY_COUNT)
        return BR_EUSAGE;
    const br_offer *o = offer_of(c, role, i);
    *out = key == BR_OFFER_COST   ? o->cost
           : key == BR_OFFER_AREA ? o->area * 1e-6 /* mm2 in the catalog */
                                  : rating_of(c, role, i);
    return BR_OK;
}
