/* rating.c - voltage shares and classes of a series string (rating.h). */
#include "model/rating.h"

#include <math.h>

double br_rating_share(double vbus, int nser)
{
    if (nser < 1 || !(vbus > 0) || !isfinite(vbus))
        return NAN;
    return vbus / nser;
}

double br_rating_needed(double vbus, int nser, double derating)
{
    if (!(derating > 0 && derating <= 1))
        return NAN;
    return br_rating_share(vbus, nser) / derating;
}

int br_rating_class(const double *classes, int n, double need)
{
    int best = -1;
    if (isnan(need))
        return -1;
    for (int i = 0; i < n; i++)
        if (classes[i] >= need && (best < 0 || classes[i] < classes[best]))
            best = i;
    return best;
}
