/* fcml.c - the flying-capacitor multilevel (FCML) leg generator.
 *
 * N levels, P = N-1 complementary pairs, 2P switches.  Counting from ground
 * the string is B1 ... BP, AP ... A1.  Phase-shifted PWM: pair j's carrier
 * is delayed by (j-1) T/P; Aj is on for [phase, phase + D T); Bj is its
 * complement with the dead time cut from both ends (common practice). */
#include "model/fcml.h"

#include <math.h>
#include <stdio.h>

/* Wrap t into [0, T). */
double br_wrap(double t, double T)
{
    double r = fmod(t, T);
    if (r < 0)
        r += T;
    if (r >= T)
        r -= T;
    return r;
}

static void set_interval(double iv[2], double start, double len, double T)
{
    iv[0] = br_wrap(start, T);
    iv[1] = br_wrap(start + len, T);
}

int br_fcml_pair_of(int P, int s, int *is_top)
{
    *is_top = s >= P;
    return s < P ? s + 1 : 2 * P - s;
}

void br_fcml_switch(int P, int s, double T, double D, double td, br_fcml_sw *out)
{
    int top;
    int j = br_fcml_pair_of(P, s, &top);
    double phase = (j - 1) * T / P;
    snprintf(out->name, sizeof out->name, "%c%d", top ? 'A' : 'B', j);
    out->pair = j;
    out->is_top = top;
    if (top)
        set_interval(out->on, phase, D * T, T);
    else
        set_interval(out->on, phase + D * T + td, (1.0 - D) * T - 2.0 * td, T);
    /* The two dead times of pair j: the switch that carries the load current
     * in reverse there is the bottom one when current leaves the switch
     * node (step-down) and the top one when it enters (step-up). */
    set_interval(out->dead[0], phase + D * T, td, T);
    set_interval(out->dead[1], phase - td, td, T);
}
