package org.edgewise.driver.query;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.StructureSum;

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

    @Override
    public double logProbability(int[] states) {
        int[] hidden = hiddenToSumOut(states);
        if (hidden.length == states.length) {
            return 0;
        }
        double joint = hiddenJointStates(states);
        if (joint > maxHiddenStates) {
            throw new UserError("summing out hidden variables " + names(hidden) + " would enumerate "
                    + String.format(Locale.ROOT, "%.0f", joint) + " joint states (limit "
                    + maxHiddenStates + "); observe some of them or raise " + ls.options().names().maxHiddenStates());
        }
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

    @Override
    public double logConditional(int[] target, int[] given) {
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
