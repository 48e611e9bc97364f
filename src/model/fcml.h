/* fcml.h - flying-capacitor multilevel leg: switch names and PWM timing. */
#ifndef BR_MODEL_FCML_H
#define BR_MODEL_FCML_H

#include "model/design.h"

typedef struct br_fcml_sw {
    char name[BR_ID_MAX]; /* "B1" ... "A1" */
    int pair;             /* 1 .. P */
    int is_top;           /* 1 for Aj */
    double on[2];         /* commanded on-interval [start, end) in s, wrapped */
    double dead[2][2];    /* the pair's two dead times [start, end) in s */
} br_fcml_sw;

/* Pair number (1..P) of string position s (0 = bottom); *is_top set. */
int br_fcml_pair_of(int P, int s, int *is_top);

/* Timing of string position s in a leg of P pairs at period T, top duty D
 * and dead time td. */
void br_fcml_switch(int P, int s, double T, double D, double td, br_fcml_sw *out);

/* t wrapped into [0, T). */
double br_wrap(double t, double T);

#endif
