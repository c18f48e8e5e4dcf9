/* Plain C loop of the same arithmetic as cycj's compiled stepper for a C(T) specimen with the
 * full reference-stress ΔJ on the Masing branch, Newman (1984) closure, J_max at peak load,
 * end checks (collapse, tearing size, toughness, size limit; the criteria the bench turns off
 * are compile-time constants here, run-time flags in cycj), the Paris law, and the stepper's
 * per-cycle bookkeeping (end size, clipped count, the history row's accumulators, the
 * cycle limit).  Powers with an integer exponent are products (numba's x**4), the others
 * libm pow.  Built as a shared library (gcc -O2) and called
 * through ctypes by bench/bench_stepper.py, in the same process as the stepper. */
#include <math.h>

static double srawley(double al) {
    double al2 = al * al;
    double p = 0.886 + 4.64 * al - 13.32 * al2 + 14.72 * (al * al2) - 5.6 * (al2 * al2);
    return (2.0 + al) * p / pow(1.0 - al, 1.5);
}

/* Runs ``blocks`` repetitions of the block (smax, smin) from crack size *a (updated); returns
 * the cycles done, negated when an end criterion stopped the run. */
long ref_run(long n, long blocks, const double *smax, const double *smin, double *a_io) {
    const double W = 50, B = 12.5, BN = 12.5, E = 205000, EP = 205000 / 0.91, SY = 340,
                 KC = 880, NC = 0.16, KP = 780, NP = 0.19, FLOW = 425.0 / 340.0, LRMAX = 1.25,
                 JC = 1e30, C = 2e-7, M = 1.5, TH = 0.0, ALPHA = 3.0, A_LIMIT = 0.95 * W,
                 A_TEAR = INFINITY, REC_DA = 1e9, MAX_CYCLES = 1e18;
    double a = *a_io;
    double cyc = 0;
    /* the stepper's accumulators for the next history row */
    double a_rec = a, cyc_rec = 0, sum_djm = 0, n_acc = 0, max_dj = 0, max_jmax = 0,
           max_lr = 0, n_clipped = 0;
    long rec_n = 0;
    for (long b = 0; b < blocks; b++) {
        int grew = 0;
        for (long i = 0; i < n; i++) {
            double al = a / W;
            double kos = sqrt(W) * srawley(al) * sqrt(B / BN);
            double bb = W - a, r = 2 * a / bb;
            double eta = sqrt(r * r + 2 * r + 2) - (r + 1);
            double sl = 1.455 * eta * bb * BN * SY / (B * W);
            double mx = smax[i], mn = smin[i], ds = mx - mn;
            double dj = 0, jmax = 0, lr = 0, djm = 0, da = 0;
            if (mx > 0 && ds > 0) {
                double R = mn / mx, sf = (mx / sl) / FLOW;
                int clipped = 0;
                if (R < -1) { R = -1; clipped = 1; }
                if (sf > 0.8) { sf = 0.8; clipped = 1; }
                n_clipped += clipped;
                double a0 = (0.825 - 0.34 * ALPHA + 0.05 * ALPHA * ALPHA) *
                            pow(cos(0.5 * M_PI * sf), 1.0 / ALPHA);
                double a1 = (0.415 - 0.071 * ALPHA) * sf, a3 = 2 * a0 + a1 - 1,
                       a2 = 1 - a0 - a1 - a3;
                double so = R >= 0 ? a0 + a1 * R + a2 * R * R + a3 * R * R * R : a0 + a1 * R;
                if (so < R) so = R;
                double u = (1 - so) / (1 - R);
                double x = 1 - u;
                if (x < 0) x = 0;
                if (x > 1) x = 1;
                u = 1 - x;
                double dk = ds * kos, djel = dk * dk / EP;
                double dsr = (ds / sl) * SY;
                double dep = 2 * pow(0.5 * dsr / KC, 1.0 / NC);
                double der = dsr / E + dep, syc = KC * pow(0.002, NC), lrc = dsr / (2 * syc);
                double el = djel * (1 + 0.5 * lrc * lrc * dsr / (E * der));
                double pl = djel * E * dep / dsr;
                double fpl = x <= 0 ? 1 : (x >= 1 ? 0 : 1 - (1 + NC) * x + NC * pow(x, 1 + 1 / NC));
                dj = u * u * el + fpl * pl;
                double km = mx * kos, jel = km * km / EP;
                lr = mx / sl;
                double sr = lr * SY, er = sr / E + pow(sr / KP, 1 / NP);
                jmax = jel * (E * er / sr + 0.5 * lr * lr * sr / (E * er));
                if (lr >= LRMAX || a >= A_TEAR || jmax >= JC || a >= A_LIMIT) {
                    *a_io = a;
                    return -(long)cyc;
                }
            }
            djm = dj > 0 ? pow(dj, M) : 0;
            if (dj > TH && dj > 0) da = C * djm;
            if (da > 0) grew = 1;
            if (a + da >= A_LIMIT) { *a_io = A_LIMIT; return -(long)(cyc + 1); }
            a += da;
            cyc += 1;
            sum_djm += djm;
            n_acc += 1;
            max_dj = dj > max_dj ? dj : max_dj;
            max_jmax = jmax > max_jmax ? jmax : max_jmax;
            max_lr = lr > max_lr ? lr : max_lr;
            if (a - a_rec >= REC_DA) {
                rec_n++;
                a_rec = a, cyc_rec = cyc;
                sum_djm = n_acc = max_dj = max_jmax = max_lr = 0;
            }
            if (cyc >= MAX_CYCLES) { *a_io = a; return (long)cyc; }
        }
        if (!grew) break;
    }
    if (n_clipped < 0 || rec_n < 0 || cyc_rec + sum_djm + max_dj + max_jmax + max_lr < 0)
        return -1; /* keep the bookkeeping live */
    *a_io = a;
    return (long)cyc;
}
