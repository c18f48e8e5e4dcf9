/* Plain C loop of the same arithmetic as cycj's compiled stepper for a C(T) specimen with the
 * full reference-stress ΔJ on the Masing branch, Newman (1984) closure, J_max at peak load,
 * toughness and collapse checks and the Paris law.  Used only by bench/bench_stepper.py. */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>

static double srawley(double al) {
    double p = 0.886 + 4.64 * al - 13.32 * al * al + 14.72 * al * al * al - 5.6 * pow(al, 4);
    return (2.0 + al) * p / pow(1.0 - al, 1.5);
}

int main(int argc, char **argv) {
    long n = atol(argv[1]);
    long blocks = atol(argv[2]);
    double *smax = malloc(n * sizeof(double)), *smin = malloc(n * sizeof(double));
    FILE *f = fopen(argv[3], "rb");
    if (fread(smax, sizeof(double), n, f) != (size_t)n) return 1;
    if (fread(smin, sizeof(double), n, f) != (size_t)n) return 1;
    fclose(f);
    const double W = 50, B = 12.5, BN = 12.5, E = 205000, EP = 205000 / 0.91, SY = 340,
                 KC = 880, NC = 0.16, KP = 780, NP = 0.19, FLOW = 425.0 / 340.0, LRMAX = 1.25,
                 JC = 1e30, C = 2e-7, M = 1.5, TH = 0.0, ALPHA = 3.0;
    double a = atof(argv[4]);
    double cyc = 0;
    for (long b = 0; b < blocks; b++) {
        for (long i = 0; i < n; i++) {
            double al = a / W;
            double kos = sqrt(W) * srawley(al) * sqrt(B / BN);
            double bb = W - a, r = 2 * a / bb;
            double eta = sqrt(r * r + 2 * r + 2) - (r + 1);
            double sl = 1.455 * eta * bb * BN * SY / (B * W);
            double mx = smax[i], mn = smin[i], ds = mx - mn;
            double dj = 0, jmax = 0, lr = 0;
            if (mx > 0 && ds > 0) {
                double R = mn / mx, sf = mx / (sl * FLOW);
                if (R < -1) R = -1;
                if (sf > 0.8) sf = 0.8;
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
                double dsr = ds * SY / sl;
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
                if (jmax >= JC || lr >= LRMAX) { printf("end %f %f\n", cyc, a); return 0; }
            }
            if (dj > TH && dj > 0) a += C * pow(dj, M);
            cyc += 1;
        }
    }
    printf("%.0f %.12f\n", cyc, a);
    return 0;
}
