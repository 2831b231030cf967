package org.edgewise.driver.score;

import org.edgewise.driver.Checks;

/**
 * Log marginal likelihood of one family (child, parent set) from its contingency counts, under a
 * Dirichlet prior with equal pseudo-counts per cell.
 *
 * <p>For child X_i with r states and parents with q configurations, α_ijk = α (same for all
 * cells, see {@link ScoreKind#cellAlpha}) and α_ij = r·α:
 * <pre>
 *   s(i,U) = Σ_j [ lnΓ(α_ij) − lnΓ(α_ij + N_ij) + Σ_k ( lnΓ(α_ijk + N_ijk) − lnΓ(α_ijk) ) ]
 * </pre>
 * (Heckerman, Geiger &amp; Chickering 1995, eq. 28; Cooper &amp; Herskovits 1992, eq. for K2 with
 * α_ijk = 1). Configurations with N_ij = 0 contribute exactly 0 and are not stored, so the sum runs
 * over observed configurations only. Each lnΓ(α + N) − lnΓ(α) is computed as a log rising factorial
 * ({@link LogRising}) — no ratio of Γ (nothing overflows for N up to 10^12) and no subtraction of
 * two large lnΓ values (accurate at every ESS {@link org.edgewise.driver.Checks#ess} accepts).
 *
 * <p>This is the one place the family score is computed; the Spark job and the driver both call it.
 */
public final class FamilyScore {
    private final ScoreKind kind;
    private final double ess;

    private FamilyScore(ScoreKind kind, double ess) {
        Checks.ess(ess, "ESS");
        this.kind = kind;
        this.ess = ess;
    }

    /** BDeu with ESS = 1 (common practice as a default; see Silander, Kontkanen &amp; Myllymäki 2007 on sensitivity). */
    public static FamilyScore withDefaults() {
        return new FamilyScore(ScoreKind.BDEU, 1.0);
    }

    public static FamilyScore of(ScoreKind kind, double ess) {
        return new FamilyScore(kind, ess);
    }

    public FamilyScore withEss(double newEss) {
        return new FamilyScore(kind, newEss);
    }

    public ScoreKind kind() {
        return kind;
    }

    public double ess() {
        return ess;
    }

    /** The ESS to report with these scores: null for K2, which has none ({@link ScoreKind#reportedEss}). */
    public Double reportedEss() {
        return kind.reportedEss(ess);
    }

    /** α_ijk for a child with {@code r} states and {@code q} parent configurations. */
    public double cellAlpha(int r, double q) {
        return kind.cellAlpha(ess, r, q);
    }

    /**
     * Log score of a family.
     *
     * @param counts   N_ijk of the observed configurations, row-major: {@code counts[j*r + k]},
     *                 {@code counts.length} a multiple of {@code r}; rows with N_ij = 0 may be present
     *                 and add 0
     * @param r        number of child states
     * @param q        number of parent configurations Π r_u (1 for the empty parent set); a double
     *                 because it can exceed the range of int for wide parent sets
     */
    public double logScore(long[] counts, int r, double q) {
        return logScore(counts, 0, counts.length / r, r, q);
    }

    /**
     * As {@link #logScore(long[], int, double)} over rows {@code [fromRow, fromRow+rows)} of {@code counts}.
     * Each lnΓ difference is a {@link LogRising log rising factorial}, so nothing cancels at any ESS:
     * s = Σ_j [ Σ_k ln (α_ijk)_{N_ijk} − ln (α_ij)_{N_ij} ].
     */
    public double logScore(long[] counts, int fromRow, int rows, int r, double q) {
        double a = cellAlpha(r, q);
        double aj = a * r;
        double lga = LogRising.logGammaOf(a);
        double lgaj = LogRising.logGammaOf(aj);
        double sum = 0;
        int base = fromRow * r;
        for (int j = 0; j < rows; j++) {
            long nij = 0;
            double row = 0;
            for (int k = 0; k < r; k++) {
                long n = counts[base + j * r + k];
                if (n != 0) {
                    row += LogRising.of(a, n, lga);
                    nij += n;
                }
            }
            if (nij != 0) {
                sum += row - LogRising.of(aj, nij, lgaj);
            }
        }
        if (!Double.isFinite(sum)) {
            throw new IllegalStateException("family score " + sum + " (r " + r + ", q " + q + ", alpha " + a + ")");
        }
        return sum;
    }

    /**
     * The posterior-mean probability (N_ijk + α_ijk)/(N_ij + α_ij) of child state k given a parent
     * configuration with counts {@code nijk}, {@code nij} — the Dirichlet-multinomial predictive.
     */
    public double predictive(long nijk, long nij, int r, double q) {
        double a = cellAlpha(r, q);
        return (nijk + a) / (nij + a * r);
    }
}
