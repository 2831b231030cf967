package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.stream.IntStream;
import org.edgewise.driver.CsvFields;
import org.edgewise.driver.InputNames;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.givenorder.OrderPosterior;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.VariableOrder;
import org.edgewise.driver.posterior.ExactOrders;
import org.edgewise.driver.posterior.SavedSample;
import org.edgewise.driver.posterior.StructurePosterior;
import org.edgewise.driver.query.BatchPrediction;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.query.CasePredictor;
import org.edgewise.driver.query.CaseProbability;
import org.edgewise.driver.query.CaseTable;
import org.edgewise.driver.query.StructureCasePrediction;
import org.edgewise.driver.query.TargetCases;
import org.edgewise.driver.result.TargetPredictions;
import org.edgewise.driver.query.ExactCasePrediction;
import org.edgewise.driver.result.Prediction;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.store.Manifest;

/**
 * The {@code predict} service: P(case | D) and P(case | given, D) averaged over the request's
 * {@link StructurePosterior} (which says what is averaged over and how), beside the same under the
 * single best network; one case as a {@link Prediction}, or a table of cases as CSV. Hidden
 * variables are summed out; a conditional is a ratio of averaged joints.
 */
public final class PredictionAnalysis {
    /** Printed with every prediction. */
    public static final String NOTE = "Probability of a new case under the stated assumptions (the order, or the orders averaged over; d, score, prior); "
            + "a model-based estimate, not a measured frequency. Interpret it with domain experts.";

    /** How {@code --exact-cases} describes what it averaged over. */
    static final String EXACT_CASES_OVER = "exact: all allowed orders, as Z(D + case) / Z(D)";

    /**
     * @param caseText        one case ("a=x,b=y"), or null with {@code casesFile}
     * @param casesFile       a CSV of cases ({@link CaseTable}), or null with {@code caseText}
     * @param givenText       evidence for a conditional, or null
     * @param exactCases      complete cases exactly as Z(D + case) / Z(D) (exact sum over orders only)
     */
    public record Request(Scoring scoring, Averaging averaging, String caseText, Path casesFile, String givenText,
                          double tailMass, long maxHiddenStates, boolean exactCases, Target target) {
        public Request(Scoring scoring, Averaging averaging, String caseText, Path casesFile, String givenText,
                       double tailMass, long maxHiddenStates, boolean exactCases) {
            this(scoring, averaging, caseText, casesFile, givenText, tailMass, maxHiddenStates, exactCases, null);
        }
    }

    /**
     * Scoring a table of cases for one target ({@link TargetAnalysis}).
     *
     * @param variable      the target variable's name
     * @param truthColumn   the column holding the true states, or null: the target's own column when present
     * @param intervalLevel the probability of a central interval over (network, parameters) draws, or null for none
     * @param intervalDraws the number of those draws
     */
    public record Target(String variable, String truthColumn, Double intervalLevel, int intervalDraws) {
    }

    /**
     * An answer: one case's {@link Prediction} and lines for people, or a table's CSV.
     *
     * @param prediction  one case: the JSON result; null for a table
     * @param lines       one case: the lines for people; a table: a note on what the mcse column means, or empty
     * @param csv         a table: the input's lines with the probabilities appended; null for one case
     * @param diagnostics the chains' diagnostics when sampled by chains, else null
     * @param scored      a table scored for a target: its JSON result (then {@code csv} is its per-row CSV and
     *                    {@code lines} its readable table); else null
     */
    public record Answer(Prediction prediction, List<String> lines, String csv, EdgeResult.Diagnostics diagnostics,
                         TargetPredictions scored) {
    }

    private PredictionAnalysis() {
    }

    public static Answer run(Request r, ProgressListener progress) {
        InputNames in = r.scoring().names();
        Inputs inputs = Inputs.of(r.scoring(), r.averaging());
        Manifest m = inputs.store().manifest();
        UnknownOrderSettings settings = inputs.settings(0);
        int[] ord = inputs.order();
        int[] given = r.givenText() == null ? null : CaseParser.parse(m, r.givenText(), in.given());
        int[] single = r.caseText() == null ? null : CaseParser.parse(m, r.caseText(), in.oneCase());
        PredictionAnalysis.Target target = r.target();
        if (target != null && r.casesFile() == null) {
            throw new IllegalArgumentException("a target needs a table of cases");
        }
        if (target != null && r.exactCases()) {
            throw new UserError(in.exactCases() + " computes the joint probability of complete cases; a prediction of "
                    + in.target() + " conditions on the rest of each row");
        }
        int y = target == null ? -1 : CaseParser.variable(m, target.variable(), in.target());
        CaseTable table = r.casesFile() == null ? null : CaseTable.read(r.casesFile(), m, in.cases(),
                target == null ? null : target.truthColumn(), target != null);
        TargetCases scoredCases = target == null ? null
                : TargetCases.of(table, m, y, given, r.casesFile(), target.truthColumn(), in);
        if (single != null && given != null) {
            for (int v = 0; v < single.length; v++) {
                if (single[v] != CaseParser.HIDDEN && given[v] != CaseParser.HIDDEN && single[v] != given[v]) {
                    throw new UserError(in.oneCase() + " sets " + m.variables().get(v).name() + "=" + m.variables().get(v).states().get(single[v])
                            + " but " + in.given() + " observed " + m.variables().get(v).name() + "=" + m.variables().get(v).states().get(given[v])
                            + ": a case that contradicts its evidence has conditional probability 0 by definition; nothing to average");
                }
            }
        }
        LocalScores ls = inputs.scores();
        StructurePosterior p = StructurePosterior.of(ls, inputs.saved(), ord, settings, progress);
        StructurePosterior.Cases cases = p.cases(r.tailMass(), r.maxHiddenStates());
        ExactCasePrediction exact = null;
        if (r.exactCases()) {
            if (!(p instanceof ExactOrders eo)) {
                throw new UserError(in.exactCases() + " applies to the exact sum over orders under the order-modular DAG prior only");
            }
            exact = eo.exactCases();
            cases = new StructurePosterior.Cases(cases.averaged(), cases.bestOrder(), EXACT_CASES_OVER, "all orders", null,
                    "averaged over orders (" + EXACT_CASES_OVER + "; order-modular DAG prior) and their networks:", cases.bestLabel(), true);
        }
        CaseProbability avg = cases.averaged();
        EdgeResult.Diagnostics diagnostics0 = p.chains() != null ? ChainReport.diagnostics(p.chains(), settings)
                : p instanceof SavedSample ss ? ChainReport.fromSample(ss, ss.edges()) : null;
        if (scoredCases != null) {
            return TargetAnalysis.run(new TargetAnalysis.Scope(m, ls, p, cases, scoredCases, given, r.casesFile(), target,
                    r.averaging().seed(), r.maxHiddenStates(), diagnostics0), table, progress);
        }
        CaseProbability best = cases.best() != null ? cases.best()
                : CasePredictor.bestNetwork(OrderPosterior.of(ls, cases.bestOrder())).withMaxHiddenStates(r.maxHiddenStates());
        EdgeResult.Diagnostics diagnostics = diagnostics0;
        if (avg instanceof StructureCasePrediction sp && single != null) {
            sp.plan(single, given); // the exact sums over all DAGs are planned before the evidence is checked
        }
        if (given != null) {
            checkEvidence(avg, given, r.givenText(), in);
            checkEvidence(best, given, r.givenText(), in);
        }
        CaseProbability sampled = exact == null && avg.sampled() ? avg : null;
        Scope scope = new Scope(m, ls, p, cases, best, exact, sampled, diagnostics);
        return single != null ? scope.one(single, given) : scope.batch(table, given, r.casesFile(), progress);
    }

    private static void checkEvidence(CaseProbability p, int[] given, String givenText, InputNames in) {
        if (p.logProbability(given) == Double.NEGATIVE_INFINITY) {
            throw new UserError(in.given() + " " + givenText + " has probability zero under this order and store; a conditional on it is undefined");
        }
    }

    /** Everything one request's answers are computed from. */
    private record Scope(Manifest m, LocalScores ls, StructurePosterior p, StructurePosterior.Cases cases, CaseProbability best,
                         ExactCasePrediction exact, CaseProbability sampled, EdgeResult.Diagnostics diagnostics) {

        Answer one(int[] target, int[] given) {
            CaseProbability avg = cases.averaged();
            double a = exact != null ? exact.logProbability(target) : BatchPrediction.logProbability(avg, target, given);
            double b = BatchPrediction.logProbability(best, target, given);
            Double mcse = sampled == null ? null : sampled.mcse(target, given);
            int[] joint = target.clone();
            if (given != null) {
                for (int v = 0; v < joint.length; v++) {
                    if (joint[v] == CaseParser.HIDDEN) {
                        joint[v] = given[v];
                    }
                }
            }
            List<String> hidden = new ArrayList<>();
            for (int v : avg.hiddenToSumOut(joint)) {
                hidden.add(m.variables().get(v).name());
            }
            double states = avg.hiddenJointStates(joint);
            StructurePosterior.Labels l = p.labels();
            Prediction pr = new Prediction(CaseParser.named(m, target), given == null ? null : CaseParser.named(m, given), Math.exp(a), a,
                    Math.exp(b), b, hidden, states, p.order() == null ? null : VariableOrder.names(m, p.order()),
                    ls.familyScore().kind().label(), ResultBuilder.settings(ls).ess(), ls.options().prior().label(),
                    m.maxParents(), exact != null ? 0.0 : avg.skippedMass(), NOTE, l.method(), cases.averagedOver(),
                    cases.samples(), mcse, l.dagPriorLabel(null), cases.exactRatio() ? Boolean.TRUE : null,
                    p instanceof SavedSample ss ? EdgeAnalysis.sampleRef(ss) : null);
            String what = "P(" + CaseParser.format(m, target) + (given == null ? "" : " | " + CaseParser.format(m, given)) + ")";
            List<String> lines = new ArrayList<>();
            lines.add(String.format(Locale.ROOT, "%s %s %.6g (log %.6f)%s", what, cases.averagedLabel(), pr.probability(), a,
                    mcse == null ? "" : String.format(Locale.ROOT, ", Monte Carlo standard error %.3g", mcse)));
            lines.add(String.format(Locale.ROOT, "%s %s %.6g (log %.6f)", what, cases.bestLabel(), pr.bestNetworkProbability(), b));
            if (!hidden.isEmpty()) {
                lines.add(String.format(Locale.ROOT, "hidden variables summed out: %s (%.0f joint states)", String.join(", ", hidden), states));
            }
            lines.add(NOTE);
            return new Answer(pr, lines, null, diagnostics, null);
        }

        Answer batch(CaseTable table, int[] given, Path file, ProgressListener progress) {
            int rows = table.cases().length;
            BatchPrediction.Result r;
            try {
                r = BatchPrediction.run(cases.averaged(), best, table.cases(), given, rows >= BAR_ROWS ? progress : ProgressListener.NONE);
            } catch (UserError e) {
                throw new UserError(file + ": " + e.getMessage(), e);
            }
            double[] a = r.averaged();
            double[] b = r.best();
            double[] mcse = new double[rows];
            if (exact != null) {
                for (int i = 0; i < rows; i++) {
                    try {
                        a[i] = exact.logProbability(table.cases()[i]);
                    } catch (UserError e) {
                        throw new UserError(file + ": case " + (i + 1) + ": " + e.getMessage(), e);
                    }
                }
            } else if (sampled != null) {
                IntStream.range(0, rows).parallel().forEach(i -> mcse[i] = sampled.mcse(table.cases()[i], given));
            }
            StringBuilder sb = new StringBuilder(rows * 64);
            List<String> head = new ArrayList<>();
            for (String h : table.header()) {
                head.add(CsvFields.quote(h));
            }
            sb.append(String.join(",", head)).append(",probability,logProbability,bestNetworkProbability,bestNetworkLogProbability")
                    .append(sampled != null ? ",mcse\n" : "\n");
            for (int i = 0; i < rows; i++) {
                sb.append(table.lines().get(i)).append(',').append(Math.exp(a[i])).append(',').append(a[i])
                        .append(',').append(Math.exp(b[i])).append(',').append(b[i]);
                if (sampled != null) {
                    sb.append(',').append(mcse[i]);
                }
                sb.append('\n');
            }
            List<String> lines = sampled == null ? List.of() : List.of(cases.over() + " (" + p.labels().dagPriorLabel(null)
                    + " DAG prior); the mcse column is the Monte Carlo standard error of each probability");
            return new Answer(null, lines, sb.toString(), diagnostics, null);
        }
    }

    /** Rows from which a table of cases reports progress. */
    static final int BAR_ROWS = 10_000;

}
