/* catalog.h - candidate parts for `pick` (link diodes and rail capacitors)
 * and for the exploration (switches by voltage class, and their drivers;
 * isolated supply modules for a split chain),
 * with what each costs and the board area it takes.
 *
 * The io layer fills a catalog from our own XML (docs/catalog.md, schema
 * src/io/catalog.rng); a part there takes the attributes of a part in a
 * design file, so the parts here are the design's own types. */
#ifndef BR_MODEL_CATALOG_H
#define BR_MODEL_CATALOG_H

#include "model/design.h"

typedef struct br_offer {
    double cost; /* per part, in the catalog's currency unit */
    double area; /* board area, mm2 */
    int line;    /* line of the part in the catalog file */
} br_offer;

typedef struct br_catalog {
    char path[512]; /* file it came from, for messages */
    char name[128]; /* the catalog's name attribute */
    int ndiodes, ncaps;
    br_diode_part diodes[BR_MAX_PARTS];
    br_offer diode_offer[BR_MAX_PARTS];
    br_cap_part caps[BR_MAX_PARTS];
    br_offer cap_offer[BR_MAX_PARTS];
    int nswitches, ndrivers;
    br_switch_part switches[BR_MAX_PARTS];
    br_offer switch_offer[BR_MAX_PARTS];
    double switch_rating[BR_MAX_PARTS]; /* the switch's voltage class (drain-source), V */
    int switch_driver[BR_MAX_PARTS];    /* index into drivers (-1: the design's own) */
    br_driver_part drivers[BR_MAX_PARTS];
    br_offer driver_offer[BR_MAX_PARTS];
    /* isolated supply modules, for a split chain's second injection: each
     * one's output as an injection's (voltage with its tolerance, output
     * resistance, current limit; rail, diode and start unused) */
    int nmodules;
    char module_id[BR_MAX_PARTS][BR_ID_MAX];
    br_inject_spec modules[BR_MAX_PARTS];
    double module_rating[BR_MAX_PARTS]; /* rated output current, A */
    br_offer module_offer[BR_MAX_PARTS];
} br_catalog;

/* Parse and validate the catalog file at path (io layer).  Public
 * (include/bootrung/parts.h), hence BR_API here too: the definitions see
 * this declaration, and a hidden one would not be exported.  On failure
 * *out is NULL and err says FILE:LINE: field: what is wrong. */
BR_API int br_catalog_load(const char *path, br_catalog **out, br_error *err);

/* The same from memory; name is used in messages. */
BR_API int br_catalog_load_memory(const char *buf, size_t len, const char *name, br_catalog **out,
                                  br_error *err);

BR_API void br_catalog_free(br_catalog *c);

/* The RELAX NG schema the loader enforces (NUL-terminated). */
BR_API const char *br_catalog_schema(void);

#endif
