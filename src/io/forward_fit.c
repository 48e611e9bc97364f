/* forward_fit.c - least-squares Shockley fit in log space (see the header). */
#include "io/forward_fit.h"

#include <math.h>
#include <stdio.h>

#include "model/chain.h" /* br_thermal_voltage */

static double dot(const double *x, const double *y, int m)
{
    double s = 0.0;
    for (int k = 0; k < m; k++)
        s += x[k] * y[k];
    return s;
}

/* Least squares min |A x - y| for the k columns col[j] (m rows) by modified
 * Gram-Schmidt QR (Golub & Van Loan, "Matrix Computations", chapter 5).
 * Overwrites col.  Returns -1 if the columns are (nearly) dependent. */
static int lsq(double col[][BR_FIT_MAX], int k, int m, const double *y, double *x)
{
    double r[3][3] = {{0}}, b[3], res[BR_FIT_MAX];
    for (int t = 0; t < m; t++)
        res[t] = y[t];
    for (int j = 0; j < k; j++) {
        double nrm0 = sqrt(dot(col[j], col[j], m));
        for (int p = 0; p < j; p++) {
            r[p][j] = dot(col[p], col[j], m);
            for (int t = 0; t < m; t++)
                col[j][t] -= r[p][j] * col[p][t];
        }
        r[j][j] = sqrt(dot(col[j], col[j], m));
        if (!(r[j][j] > 1e-10 * nrm0))
            return -1;
        for (int t = 0; t < m; t++)
            col[j][t] /= r[j][j];
        b[j] = dot(col[j], res, m);
        for (int t = 0; t < m; t++)
            res[t] -= b[j] * col[j][t];
    }
    for (int j = k - 1; j >= 0; j--) {
        double s = b[j];
        for (int p = j + 1; p < k; p++)
            s -= r[j][p] * x[p];
        x[j] = s / r[j][j];
    }
    return 0;
}

/* Fit with k = 3 (ln i, 1, i) or k = 2 (ln i, 1) columns to y. */
static int fit_columns(const double *i, const double *y, int m, int k, double x[3])
{
    double col[3][BR_FIT_MAX], imax = i[m - 1];
    for (int t = 0; t < m; t++) {
        col[0][t] = log(i[t]);
        col[1][t] = 1.0;
        col[2][t] = i[t] / imax; /* scaled so the columns are comparable */
    }
    x[2] = 0.0;
    if (lsq(col, k, m, y, x) != 0)
        return -1;
    x[2] /= imax;
    return 0;
}

/* One linear fit of v - a*ln(1 + Is/i) (the "+1" of the law, from the
 * previous estimate a, Is; zero on the first pass).  Falls back to Rs = 0
 * when the free fit wants a negative Rs. */
static int fit_once(const double *i, const double *v, int m, double a, double sat, double x[3])
{
    double y[BR_FIT_MAX];
    for (int t = 0; t < m; t++)
        y[t] = v[t] - a * log1p(sat / i[t]);
    if (fit_columns(i, y, m, 3, x) != 0)
        return -1;
    if (x[2] < 0.0 && fit_columns(i, y, m, 2, x) != 0)
        return -1;
    return 0;
}

int br_forward_fit(const double *i, const double *v, int npts, double vt, double *is, double *n,
                   double *rs, char *why, size_t cap)
{
    double x[3] = {0.0, 0.0, 0.0}, a = 0.0, sat = 0.0;
    if (npts < 3 || npts > BR_FIT_MAX || !(vt > 0.0)) {
        snprintf(why, cap, "need 3 to %d points", BR_FIT_MAX);
        return -1;
    }
    /* the "+1" correction is tiny for forward points, so a few fixed-point
     * passes settle it to rounding */
    for (int pass = 0; pass < 8; pass++) {
        if (fit_once(i, v, npts, a, sat, x) != 0) {
            snprintf(why, cap, "the points do not determine is, n and rs (currents too close)");
            return -1;
        }
        a = x[0];
        sat = exp(-x[1] / a);
        if (!(a > 0.0) || !isfinite(sat) || !(sat > 0.0)) {
            snprintf(why, cap, "the voltage does not rise like a diode's with the current");
            return -1;
        }
    }
    *n = a / vt;
    *is = sat;
    *rs = x[2];
    return 0;
}
