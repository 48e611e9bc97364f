/* pack_report.h - the index page and the lists of a sign-off pack.
 *
 * A pack (`bootrung analyze --pack DIR`) is one folder that holds every
 * verb's pages and result files for one design, the design itself and
 * what a reviewer needs to reproduce every number: the tool's version,
 * the exact command lines, the checksums, the model's assumptions and
 * where each part's values come from.  The command-line layer runs the
 * verbs; this renders what it found. */
#ifndef BR_REPORT_PACK_REPORT_H
#define BR_REPORT_PACK_REPORT_H

#include "model/chain.h"

#define BR_PACK_STEPS 10
#define BR_PACK_FILES 6

/* One verb run in the pack's folder. */
typedef struct br_pack_step {
    char verb[16];
    char command[640];            /* as run, in the folder */
    int status;                   /* its exit status; -1: not run */
    char why[200];                /* why it was not run */
    char verdict[400];            /* its report's verdict line */
    char file[BR_PACK_FILES][32]; /* the files it wrote, its page first */
    char sha[BR_PACK_FILES][65];  /* their SHA-256 */
    int nfile;
} br_pack_step;

typedef struct br_pack {
    const char *version;      /* the tool's */
    const char *design_path;  /* as given */
    char design_sha[65];      /* of design.xml, the copy in the folder */
    const char *catalog_path; /* as given, NULL: none */
    char catalog_sha[65];     /* of catalog.xml */
    const char *notes;        /* the design file's comments (br_design_notes), NULL: none */
    br_pack_step step[BR_PACK_STEPS];
    int nstep;
} br_pack;

/* The index page (index.html): what the pack is, the verbs with their
 * status, verdict, page and files, the design and its checksum, the
 * version and command lines, the model's assumptions, the parts and the
 * source of their values, the caution. */
int br_pack_index(const br_chain *c, const br_pack *p, br_text *out);

/* SHA256SUMS: "HEX  NAME" per file, as sha256sum -c reads it. */
int br_pack_sums(const br_pack *p, br_text *out);

/* commands.sh: the command lines, to run again in the folder. */
int br_pack_script(const br_pack *p, br_text *out);

/* The combined status of the steps: 1 when one fails, else 3 when one is
 * undetermined, else 0 (a step not run counts for nothing). */
int br_pack_status(const br_pack *p);

#endif
