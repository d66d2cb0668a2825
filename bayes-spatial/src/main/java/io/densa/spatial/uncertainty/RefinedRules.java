package io.densa.spatial.uncertainty;

/**
 * The refined node rules of a {@link DrawEngine} (package-private): a draw whose error estimate
 * fails the tolerance on the engine's rule is evaluated on the same rule with every panel cut into
 * {@value #REFINE}, then {@value #REFINE}² (the q-point error falls as the (2q+1)-th power of the
 * panel width: 4⁹ ≈ 2.6·10⁵ for q = 4), each draw taken by the first rule whose estimate passes,
 * and only the draws that fail them all by the space's exact methods, about a hundred times
 * slower. The refined engines are built on first need, once, by whichever thread needs them.
 */
final class RefinedRules {
    /** Panels per panel at each refinement. */
    static final int REFINE = 4;
    /** Refined rules tried before the exact methods. */
    static final int LEVELS = 2;

    private final DrawEngine coarse;
    private final DrawEngine[] engines = new DrawEngine[LEVELS];

    RefinedRules(DrawEngine coarse) {
        this.coarse = coarse;
    }

    /**
     * Evaluates draws s.failed[0..nf) of the location (kriged coordinates c[off..off+K)) into
     * s.values (those left to the exact methods count in s.exact).
     */
    void evaluate(double[] c, int off, int nf, DrawEngine.Scratch s) {
        int[] pending = s.failed;
        int np = nf;
        for (int level = 0; np > 0 && level < LEVELS; level++) {
            DrawEngine f = engine(level);
            if (s.fine[level] == null) {
                s.fine[level] = f.scratch();
            }
            DrawEngine.Scratch fs = s.fine[level];
            if (!s.fineBase[level]) {
                f.rule.nodeValues(c, off, fs.base);
                s.fineBase[level] = true;
            }
            for (int l = 0; l < coarse.r; l++) {
                double[] from = s.z[l], to = fs.z[l];
                for (int j = 0; j < np; j++) {
                    to[j] = from[pending[j]];
                }
            }
            f.nodeValues(0, np, fs);
            f.massesAndErrors(np, Double.NaN, fs);
            f.quantities(0, np, fs);
            double[] err = fs.err, tot = fs.total;
            int left = 0;
            for (int j = 0; j < np; j++) {
                int d = pending[j];
                if (err[j] <= DrawEngine.RULE_TOLERANCE * tot[j]) {
                    for (int qi = 0; qi < coarse.quantities; qi++) {
                        s.values[qi][d] = fs.values[qi][j];
                    }
                } else {
                    pending[left++] = d; // in place: left ≤ j
                }
            }
            np = left;
        }
        for (int j = 0; j < np; j++) {
            coarse.exactDraw(c, off, pending[j], s);
        }
    }

    private DrawEngine engine(int level) {
        synchronized (engines) {
            if (engines[level] == null) {
                int refine = level == 0 ? REFINE : REFINE * REFINE;
                engines[level] = new DrawEngine(coarse.space, coarse.factor, coarse.r, coarse.options, false, refine);
            }
            return engines[level];
        }
    }
}
