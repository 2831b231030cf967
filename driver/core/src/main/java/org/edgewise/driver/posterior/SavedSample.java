package org.edgewise.driver.posterior;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.dag.DagDraws;
import org.edgewise.driver.average.dag.DrawnDags;
import org.edgewise.driver.average.dag.ParentListDraws;
import org.edgewise.driver.query.DagMixture;
import org.edgewise.driver.score.DagPrior;
import org.edgewise.driver.store.Manifest;

/**
 * A posterior sample saved on disk ({@link SampleFile}): the DAGs an earlier request drew, asked
 * again without sampling. No Rao-Blackwellisation is possible (the orders or partitions behind the
 * DAGs are not kept), so every figure is a (weighted) frequency over the saved DAGs:
 * P(a → b) the share of DAGs holding the edge, a child's parent-set posterior the share holding
 * the set; Monte Carlo errors, split-R̂ and effective sample size are those of the per-DAG
 * indicator over the chains in draw order ({@link DagDraws#estimate}: independent draws
 * p(1−p)/K; chains or weights the ratio estimator's, Vehtari et al. 2021). Features and the essential
 * graph over the DAGs, for any number of variables (parent bitmasks up to 31, parent lists beyond); effects over the DAGs with their weights and chains.
 * Memory: the saved DAGs ({@link DagSample}), and their bitmasks when features are asked.
 */
public final class SavedSample implements StructurePosterior {
    private final LocalScores ls;
    private final SampleFile.Loaded saved;
    private final UnknownOrderSettings s;
    private final DagSample d;
    private DrawnDags masks;
    private ParentListDraws lists;
    private double[][] setPosterior;

    /**
     * @param s which features to estimate (null: none); its sampling fields are not used
     * @throws UserError when a saved DAG holds a parent set the scoring does not allow
     */
    SavedSample(LocalScores ls, SampleFile.Loaded saved, UnknownOrderSettings s) {
        this.ls = ls;
        this.saved = saved;
        this.s = s;
        this.d = saved.dags();
        if (d.variables() != ls.variableCount()) {
            throw new UserError("sample " + saved.path() + " holds DAGs over " + d.variables() + " variables, the store has "
                    + ls.variableCount());
        }
    }

    /** The sample as read. */
    public SampleFile.Loaded saved() {
        return saved;
    }

    @Override
    public LocalScores scores() {
        return ls;
    }

    @Override
    public Labels labels() {
        String p = saved.info().dagPrior();
        return new Labels("sample", p == null ? null : DagPrior.parse(p, SampleFile.MANIFEST), saved.info().sampler());
    }

    @Override
    public List<List<String>> tiers() {
        List<List<String>> t = saved.info().tiers();
        return t == null || t.isEmpty() ? null : t;
    }

    @Override
    public int[] order() {
        List<String> o = saved.info().order();
        if (o == null) {
            return null;
        }
        Manifest m = ls.store().manifest();
        int[] out = new int[o.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = m.variableIndex(o.get(i));
        }
        return out;
    }

    /** Whether the saved method was exact sampling of independent DAGs (one chain, no R̂). */
    private boolean independent() {
        return d.chains() == 1;
    }

    /** The saved DAGs as parent lists, mapped to their distinct DAGs once ({@link ParentListDraws}). */
    private ParentListDraws draws() {
        if (lists == null) {
            lists = new ParentListDraws(d.variables(), d.dags(), d.weights());
        }
        return lists;
    }

    @Override
    public EdgeEstimates edges() {
        int n = d.variables();
        ParentListDraws all = draws();
        double[][] mean = new double[n][n];
        Estimate[][] est = new Estimate[n][n];
        for (int b = 0; b < n; b++) {
            for (int a : ls.candidates(b)) {
                Estimate e = all.estimate(all.edge(a, b));
                est[a][b] = e;
                mean[a][b] = e.mean();
            }
        }
        return new EdgeEstimates(mean, est, d.total(), null, null);
    }

    /**
     * Per child, the weighted share of the saved DAGs holding each of its allowed parent sets: summed
     * per distinct DAG, each distinct parent list looked up once among the child's sets.
     */
    @Override
    public double[][] setPosterior() {
        if (setPosterior == null) {
            setPosterior = frequencies(ls, d, draws(), "sample " + saved.path());
        }
        return setPosterior;
    }

    /**
     * Per child, the weighted share of the DAGs of {@code d} holding each of its allowed parent sets in {@code ls}:
     * what {@link #setPosterior()} gives for a saved sample (and what {@code sample} judges the candidate boundary by).
     */
    public static double[][] frequencies(LocalScores ls, DagSample d) {
        return frequencies(ls, d, new ParentListDraws(d.variables(), d.dags(), d.weights()), "the sample");
    }

    /** Summed per distinct DAG, each distinct parent list looked up once among the child's sets. */
    private static double[][] frequencies(LocalScores ls, DagSample d, ParentListDraws all, String where) {
        int n = d.variables();
        double[] w = all.distinctWeights();
        double total = 0;
        for (double x : w) {
            total += x;
        }
        double[][] post = new double[n][];
        for (int v = 0; v < n; v++) {
            post[v] = new double[ls.setCount(v)];
            int[] setOf = new int[all.distinctCount()];
            Arrays.fill(setOf, -1);
            for (int set = 0; set < ls.setCount(v); set++) {
                int[] pa = ls.parents(v, set);
                for (int i = 1; i < pa.length; i++) {
                    if (pa[i] < pa[i - 1]) {
                        pa = pa.clone();
                        Arrays.sort(pa);
                        break;
                    }
                }
                for (int u = 0; u < setOf.length; u++) {
                    if (setOf[u] < 0 && Arrays.equals(pa, all.distinct(u)[v])) {
                        setOf[u] = set;
                    }
                }
            }
            for (int u = 0; u < setOf.length; u++) {
                if (setOf[u] < 0) {
                    int[] at = firstDraw(d, all, u);
                    throw new UserError(where + ": chain " + (at[0] + 1) + ", DAG " + (at[1] + 1) + " gives "
                            + ls.store().variables().get(v).name() + " a parent set the store's scoring does not allow");
                }
                post[v][setOf[u]] += w[u] / total;
            }
        }
        return post;
    }

    /** The first draw (chain, index) that is distinct DAG {@code u}. */
    private static int[] firstDraw(DagSample d, ParentListDraws all, int u) {
        for (int c = 0; c < d.chains(); c++) {
            for (int k = 0; k < d.perChain(); k++) {
                if (all.distinctOf(c, k) == u) {
                    return new int[] {c, k};
                }
            }
        }
        throw new IllegalStateException("distinct DAG " + u + " has no draw");
    }

    /**
     * The saved DAGs for features: as parent bitmasks ({@link DagDraws}) up to 31 variables, as the
     * parent lists they are saved as ({@link ParentListDraws}) beyond — the same estimates either way.
     */
    private DrawnDags masks() {
        if (masks == null) {
            if (d.variables() > DagLists.MAX_DRAW_VARIABLES) {
                masks = draws();
                return masks;
            }
            List<List<int[]>> chains = new ArrayList<>();
            for (int c = 0; c < d.chains(); c++) {
                List<int[]> chain = new ArrayList<>(d.perChain());
                for (int k = 0; k < d.perChain(); k++) {
                    chain.add(DagSample.masks(d.dags()[c][k]));
                }
                chains.add(chain);
            }
            masks = new DagDraws(d.variables(), chains, 1, d.weights());
        }
        return masks;
    }

    @Override
    public Features features() {
        return s != null && s.features() ? DagLists.features(s, masks()) : null;
    }

    @Override
    public DrawnDags essentialDraws() {
        if (s == null || !s.essentialGraph()) {
            return null;
        }
        DrawnDags m = masks();
        // beyond 31 variables the parent-list draws apply Meek's rules without the constraints (docs/unknown-order.md)
        return m instanceof DagDraws bits ? DagLists.knowing(bits, ls, constraints()) : m;
    }

    /** The order constraints the sample was drawn under: its recorded tiers (else the store's) and the required edges. */
    private OrderConstraints constraints() {
        List<List<String>> t = tiers();
        if (t == null) {
            t = ls.store().manifest().tiers() == null ? List.of() : ls.store().manifest().tiers();
        }
        return OrderConstraints.of(ls, t);
    }

    @Override
    public Cases cases(double tailMass, long maxHiddenStates) {
        int[][][] dags = d.flatDags();
        double[] w = d.flatWeights();
        int k = dags.length;
        long limit = Math.min(maxHiddenStates, MAX_TABLE);
        String where = "sample " + saved.path();
        DagMixture mix = new DagMixture(ls.store(), ls.familyScore(), dags, w, independent() ? 0 : d.chains(), limit,
                ls.options().names(), where);
        int[][] mode = mix.mode();
        DagMixture best = new DagMixture(ls.store(), ls.familyScore(), new int[][][] {mode}, null, 0, limit,
                ls.options().names(), where);
        String prior = labels().dagPriorLabel("order-given");
        String over = String.format(Locale.ROOT, "%d DAGs of the saved sample %s (%s), %d distinct; sampled%s", k, saved.path(),
                saved.info().sampler(), mix.size(), boundaryNote());
        return new Cases(mix, topological(mode), over, "sampled DAGs", k,
                "averaged over the sample's DAGs (" + over + "; " + prior + " DAG prior), each by exact inference with "
                        + "posterior-mean parameters:",
                "under the most frequent DAG of the sample:", false, best);
    }

    /**
     * The caution a prediction or effect from this sample carries when the store's pruned candidate sets bound the
     * sampled posterior (the sample's {@code candidateBoundary}): "" when none does or the sample does not say.
     */
    String boundaryNote() {
        List<String> b = saved.info().candidateBoundary();
        if (b == null || b.isEmpty()) {
            return "";
        }
        return "; CAUTION: the candidate sets pruned at tally time bound the posterior of " + String.join(", ", b)
                + " (a parent beyond them may be missing from every DAG)";
    }

    /** The largest elimination table a saved-sample prediction builds (entries; 8 bytes each). */
    static final long MAX_TABLE = 1L << 25;

    /** An order of the variables in which every parent comes before its children. */
    private static int[] topological(int[][] parents) {
        int n = parents.length;
        int[] out = new int[n];
        boolean[] placed = new boolean[n];
        int m = 0;
        while (m < n) {
            for (int v = 0; v < n; v++) {
                if (!placed[v]) {
                    boolean ready = true;
                    for (int p : parents[v]) {
                        ready &= placed[p];
                    }
                    if (ready) {
                        placed[v] = true;
                        out[m++] = v;
                    }
                }
            }
        }
        return out;
    }

    @Override
    public EffectSource effectSource() {
        SampleFile.Info i = saved.info();
        String over = String.format(Locale.ROOT, "%d DAGs of the saved sample %s (%s; sampled; see mcse%s)", d.total(),
                saved.path(), i.sampler(), boundaryNote());
        return new OverDags(d.forEffects(), over, i.diagnostics() == null ? null : i.diagnostics().converged(),
                i.diagnostics() == null ? null : i.diagnostics().maxRhat());
    }

    @Override
    public Sampled sampleDags(int count, long seed) {
        return new Sampled(d, saved.info().sampler());
    }
}
