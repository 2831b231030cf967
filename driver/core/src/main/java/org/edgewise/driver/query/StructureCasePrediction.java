package org.edgewise.driver.query;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.exact.StructureSum;

/**
 * Exact predictive probability of a case over all DAGs under the <b>structure-modular</b> DAG
 * prior P(G) ∝ Π_i ρ_i(U_i), as a ratio of exact structure-modular sums (Tian &amp; He 2009):
 * <pre>
 *   P(x | D) = Σ_G P(G | D) P(x | G, D) = Σ_G Π_i β_i(U_i; D ∪ x) / Σ_G Π_i β_i(U_i; D) = Z(D ∪ x) / Z(D)
 * </pre>
 * since P(G | D) P(x | G, D) = P(G) P(D | G) P(x | G, D) / P(D) = P(G) P(D ∪ x | G) / P(D) (the chain
 * rule of the marginal likelihood; Heckerman, Geiger &amp; Chickering 1995), and P(D ∪ x | G)
 * factorises over families. The family scores of D ∪ x come from the stored counts plus one
 * record ({@link ExactCasePrediction#weightsWith}). Hidden variables are summed out exactly by
 * enumerating their joint states h: P(x_o | D) = Σ_h Z(D ∪ (x_o, h)) / Z(D) (log-sum-exp), refused
 * above the limit on joint states; a conditional is the ratio of two such sums.
 *
 * <p>Cost: one forward pass of the structure-modular recursion (3^n terms, {@link StructureSum#logDagSum})
 * per joint state of the hidden variables, for each case — fast for n ≤ ~16; memory as
 * {@link StructureSum#bytes}.
 */
public final class StructureCasePrediction implements CaseProbability {
    private final LocalScores ls;
    private final OrderConstraints oc;
    private final double logZ;
    private final long maxHiddenStates;

    /** Runs the forward pass for Z(D) once; each case runs one per joint hidden state. */
    public StructureCasePrediction(LocalScores ls, OrderConstraints oc, long maxHiddenStates) {
        this.ls = ls;
        this.oc = oc;
        this.maxHiddenStates = maxHiddenStates;
        this.logZ = StructureSum.logDagSum(ls, oc);
        if (logZ == Double.NEGATIVE_INFINITY) {
            throw new UserError("no DAG has positive posterior under the given constraints "
                    + "(required edges, tiers and the in-degree bound cannot all be met)");
        }
    }

    /** log Z(D) over the admitted DAGs. */
    public double logZ() {
        return logZ;
    }

    /** log P(x | D) for a complete case: log Z(D ∪ x) − log Z(D). */
    double logComplete(int[] x) {
        return StructureSum.logDagSum(ls.withWeights(ExactCasePrediction.weightsWith(ls, x)), oc) - logZ;
    }

    /**
     * The most terms one prediction (both sums of a conditional together) may plan: joint hidden
     * states × 3^n. A pass of 3^n terms runs at some 10^7–10^8 terms a second, so this bound keeps an
     * answer within tens of seconds; above it the work is refused before any pass runs.
     */
    public static final double TERM_BUDGET = 1e9;

    /** Refuses, before any pass, a plan of {@code passes} forward passes above {@link #TERM_BUDGET}. */
    private void plan(double passes) {
        int n = ls.variableCount();
        if (passes * Math.pow(3, n) > TERM_BUDGET) {
            throw new TooSlowForExact(passes, n, TERM_BUDGET);
        }
    }

    /** One pass per joint hidden state, at least one for a case with nothing hidden. */
    private double passes(int[] states) {
        int[] hidden = hiddenToSumOut(states);
        return hidden.length == states.length ? 0 : Math.max(1, hiddenJointStates(states));
    }

    @Override
    public double logProbability(int[] states) {
        int[] hidden = hiddenToSumOut(states);
        if (hidden.length == states.length) {
            return 0;
        }
        double joint = hiddenJointStates(states);
        if (joint <= maxHiddenStates) {
            plan(passes(states));
        }
        if (joint > maxHiddenStates) {
            throw new UserError("summing out hidden variables " + names(hidden) + " would enumerate "
                    + String.format(Locale.ROOT, "%.0f", joint) + " joint states (limit "
                    + maxHiddenStates + "); observe some of them or raise " + ls.options().names().maxHiddenStates());
        }
        Memo m = last;
        if (m != null && Arrays.equals(m.states(), states)) {
            return m.value(); // the evidence is checked, then asked again for the conditional: one sum, not two
        }
        double value = sumOut(states, hidden);
        last = new Memo(states.clone(), value);
        return value;
    }

    /** The last sum (immutable, so safe to share between threads). */
    private record Memo(int[] states, double value) {
    }

    private volatile Memo last;

    private double sumOut(int[] states, int[] hidden) {
        int[] x = states.clone();
        for (int h : hidden) {
            x[h] = 0;
        }
        double acc = Double.NEGATIVE_INFINITY;
        while (true) {
            acc = LogSum.add(acc, logComplete(x));
            int k = 0;
            while (k < hidden.length && ++x[hidden[k]] == ls.store().arity(hidden[k])) {
                x[hidden[k]] = 0;
                k++;
            }
            if (k == hidden.length) {
                return acc;
            }
        }
    }

    /**
     * Plans P(target | given) (or P(target) when {@code given} is null) before any sum runs: the passes
     * of both sums together against {@link #TERM_BUDGET}; a {@link TooSlowForExact} above it.
     */
    public void plan(int[] target, int[] given) {
        int[] joint = given == null ? target : CaseConditional.joint(target, given);
        if (joint == null || hiddenJointStates(joint) > maxHiddenStates
                || (given != null && hiddenJointStates(given) > maxHiddenStates)) {
            return; // a contradiction, or the limit on joint states refuses it with its own words
        }
        plan(passes(joint) + (given == null ? 0 : passes(given)));
    }

    @Override
    public double logConditional(int[] target, int[] given) {
        plan(target, given);
        return CaseConditional.of(this, target, given, ls.options().names().given() + " has probability zero under the store; a conditional on it is undefined");
    }

    /** Every hidden variable: any of them may be a parent in some DAG, so none drops out of the sum. */
    @Override
    public int[] hiddenToSumOut(int[] states) {
        int count = 0;
        for (int s : states) {
            count += s == CaseParser.HIDDEN ? 1 : 0;
        }
        int[] out = new int[count];
        for (int v = 0, i = 0; v < states.length; v++) {
            if (states[v] == CaseParser.HIDDEN) {
                out[i++] = v;
            }
        }
        return out;
    }

    @Override
    public double hiddenJointStates(int[] states) {
        int[] hidden = hiddenToSumOut(states);
        if (hidden.length == 0 || hidden.length == states.length) {
            return 0;
        }
        double joint = 1;
        for (int h : hidden) {
            joint *= ls.store().arity(h);
        }
        return joint;
    }

    /** Nothing is skipped: every allowed parent set enters the sums. */
    @Override
    public double skippedMass() {
        return 0;
    }

    private String names(int[] vars) {
        List<String> out = new ArrayList<>();
        for (int v : vars) {
            out.add(ls.store().variables().get(v).name());
        }
        return String.join(", ", out);
    }
}
