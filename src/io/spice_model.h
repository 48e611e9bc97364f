/* spice_model.h - a Berkeley SPICE diode model statement, read from text.
 *
 *   .model NAME D(IS=2.5n N=1.8 RS=0.12 CJO=15p VJ=0.75 M=0.4 TT=30n
 *   + BV=650 IBV=10u)
 *
 * Internal to the io layer: the design and catalog readers take such a
 * line from a diode's <spice-model> element (parts_read.c maps it onto
 * the diode part, docs/design-file.md says how).  Values are kept as the
 * statement gives them, in SPICE's units (TNOM in degrees Celsius). */
#ifndef BR_IO_SPICE_MODEL_H
#define BR_IO_SPICE_MODEL_H

#include "bootrung/bootrung.h"

/* The diode parameters a statement may give (aliases in the .c file). */
typedef enum br_sp_param {
    BR_SP_IS = 0, /* saturation current, A */
    BR_SP_N,      /* emission coefficient */
    BR_SP_RS,     /* ohmic resistance, ohm */
    BR_SP_CJO,    /* zero-bias junction capacitance, F */
    BR_SP_VJ,     /* junction potential, V */
    BR_SP_M,      /* grading coefficient */
    BR_SP_TT,     /* transit time, s */
    BR_SP_EG,     /* activation energy (bandgap), eV */
    BR_SP_XTI,    /* saturation-current temperature exponent */
    BR_SP_BV,     /* reverse breakdown voltage, V */
    BR_SP_IBV,    /* current at the breakdown voltage, A */
    BR_SP_FC,     /* forward-bias depletion capacitance coefficient */
    BR_SP_KF,     /* flicker noise coefficient */
    BR_SP_AF,     /* flicker noise exponent */
    BR_SP_TNOM,   /* temperature the parameters hold at, degrees C */
    BR_SP_COUNT
} br_sp_param;

#define BR_SP_NAME_MAX 48

typedef struct br_spice_model {
    char name[BR_SP_NAME_MAX]; /* the model's name */
    int given[BR_SP_COUNT];    /* 1 where the statement gives the parameter */
    double v[BR_SP_COUNT];     /* its value, SPICE units */
    int line[BR_SP_COUNT];     /* its line in the file */
} br_spice_model;

/* Canonical name of a parameter ("IS", "CJO", ...). */
const char *br_sp_param_name(int p);

/* Read the one .model statement of a diode in text (comment lines start
 * with '*', continuation lines with '+').  line0 is the file line of
 * text's first character; file and field (e.g. "diode d1: spice-model")
 * go into errors, the field extended by the parameter at fault
 * ("...: spice-model: RS").  BR_EINPUT with the line of the fault. */
int br_spice_model_parse(const char *text, const char *file, int line0, const char *field,
                         br_spice_model *m, br_error *err);

/* A SPICE number: decimal digits, an optional exponent, an optional scale
 * factor (f p n u m k meg g t mil, any case) and letters after it that
 * SPICE ignores ("10pF", "1.5V").  Returns 0 and sets *v when all of s is
 * such a number, -1 when not. */
int br_spice_number(const char *s, double *v);

#endif
