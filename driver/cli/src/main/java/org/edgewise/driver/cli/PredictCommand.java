package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.Checks;
import org.edgewise.driver.CsvFields;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.TooLargeForExact;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.average.DagPrior;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderPosterior;
import org.edgewise.driver.average.VariableOrder;
import org.edgewise.driver.query.BatchPrediction;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.query.ExactCasePrediction;
import org.edgewise.driver.query.CaseProbability;
import org.edgewise.driver.query.CasePredictor;
import org.edgewise.driver.average.BestDagOrder;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.StructureSum;
import org.edgewise.driver.query.OrderMixture;
import org.edgewise.driver.query.StructureCasePrediction;
import org.edgewise.driver.query.Prediction;
import org.edgewise.driver.query.UnknownOrderPrediction;
import org.edgewise.driver.result.ResultJson;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreReader;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;
import picocli.CommandLine.Model.CommandSpec;

/**
 * {@code predict}: probability of a new case (or of a table of cases) given the data and an
 * order, averaged over every DAG consistent with the order, and under the single best network.
 */
@Command(name = "predict", mixinStandardHelpOptions = true,
        description = {"P(case | D, order) averaged over every network consistent with a given order (--order), or also over unknown orders (--method exact|mcmc), and under the single best network.",
                "Variables left out of a case are hidden and summed out; --given makes it a conditional P(case | given, D, order).",
                "--method exact with the default --dag-prior structure-modular is exact over every DAG, as Z(D + case) / Z(D): "
                        + "one exact structure-modular sum (3^n terms) per case and per joint state of its hidden variables "
                        + "(fast for n <= ~16). --method mcmc needs --dag-prior order-modular."})
public final class PredictCommand implements Callable<Integer> {
    static final String NOTE = "Probability of a new case under the stated assumptions (the order, or the orders averaged over; d, score, prior); "
            + "a model-based estimate, not a measured frequency. Interpret it with domain experts.";

    /** Rows from which a batch shows a progress bar (on a terminal). */
    static final int BAR_ROWS = 10_000;

    @Spec
    CommandSpec spec;

    @Mixin
    AveragingOptions averaging = new AveragingOptions();

    @Option(names = "--case", paramLabel = "a=x,b=y", description = "one case; variables left out are hidden") String caseText;

    @Option(names = "--given", paramLabel = "c=z", description = "evidence: report P(case | given) (with --cases: for every row)") String givenText;

    @Option(names = "--cases", paramLabel = "FILE", description = "CSV of cases: header = variable names, blank cells hidden") Path casesFile;

    @Option(names = "--out", paramLabel = "FILE", description = "write the result here: the scored CSV with --cases, the JSON with --case (default: standard output)") Path out;

    @Option(names = "--overwrite", description = "replace an existing --out file") boolean overwrite;

    @Option(names = "--format", paramLabel = "table|json", description = "one case: readable lines (default) or JSON") String format;

    @Option(names = "--tail-mass", paramLabel = "E", defaultValue = "1e-12",
            description = "per variable, skip the least probable parent sets whose combined posterior is at most E and renormalise (default ${DEFAULT-VALUE}; 0 = exact)")
    double tailMass;

    @Option(names = "--max-hidden-states", paramLabel = "N", defaultValue = "1000000",
            description = "refuse a case whose hidden variables need more joint states than this to sum out (default ${DEFAULT-VALUE})")
    long maxHiddenStates;

    @Option(names = "--exact-cases", description = "with --method exact: each complete case exactly, as Z(D + case) / Z(D) "
            + "(one exact sum over all orders per case, --dag-prior order-modular) instead of mixing sampled orders when n >= 8")
    boolean exactCases;

    /** Over unknown orders: the mixture, or null given an order. */
    private UnknownOrderPrediction.Mixture mixture;
    /** With --exact-cases: the exact ratio of sums. */
    private ExactCasePrediction exact;

    @Override
    public Integer call() {
        Output.check(out, overwrite);
        if ((caseText == null) == (casesFile == null)) {
            throw new UserError("give exactly one of --case a=x,b=y or --cases FILE");
        }
        if (averaging.scoring.ess.size() > 1) {
            throw new UserError("predict takes one --ess value, got " + averaging.scoring.ess.size());
        }
        String fmt = format == null ? "table" : format.toLowerCase(Locale.ROOT);
        if (!fmt.equals("json") && !fmt.equals("table")) {
            throw new UserError("--format must be table or json, got '" + format + "'");
        }
        if (!(tailMass >= 0 && tailMass < 1)) {
            throw new UserError("--tail-mass must be in [0, 1), got " + tailMass);
        }
        if (maxHiddenStates < 1) {
            throw new UserError("--max-hidden-states must be at least 1, got " + maxHiddenStates);
        }
        var options = averaging.scoring.options();
        String meth = averaging.method("prediction");
        Checks.notApplicable(exactCases && !meth.equals("exact"), "--exact-cases", "with --method " + meth,
                "it computes the exact sum over all orders (--method exact)");
        Checks.notApplicable(exactCases && givenText != null, "--exact-cases", "with --given",
                "a conditional needs P(given | D), a sum over the hidden variables");
        UnknownOrderSettings settings = meth.equals("order") ? null
                : averaging.unknown.settings(UnknownOrderSettings.Method.valueOf(meth.toUpperCase(Locale.ROOT)), 0);
        prior = settings == null ? null : settings.dagPrior();
        structure = prior == DagPrior.STRUCTURE_MODULAR && !meth.equals("mcmc");
        Checks.notApplicable(exactCases && prior == DagPrior.STRUCTURE_MODULAR, "--exact-cases", "with --dag-prior structure-modular",
                "every case is already exact there, Z(D + case) / Z(D) over all DAGs");
        ScoreStore store = StoreReader.read(averaging.scoring.store);
        Manifest m = store.manifest();
        int[] ord = averaging.method.order == null ? null : VariableOrder.parse(m, averaging.method.order, "--order");
        int[] given = givenText == null ? null : CaseParser.parse(m, givenText, "--given");
        int[] single = caseText == null ? null : CaseParser.parse(m, caseText, "--case");
        CaseCsv table = casesFile == null ? null : CaseCsv.read(casesFile, m);
        LocalScores ls = LocalScores.build(store, options);
        CaseProbability avg;
        CasePredictor best;
        if (ord != null) {
            OrderPosterior op = OrderPosterior.of(ls, ord);
            avg = CasePredictor.averaged(op, tailMass).withMaxHiddenStates(maxHiddenStates);
            best = CasePredictor.bestNetwork(op).withMaxHiddenStates(maxHiddenStates);
        } else if (structure) {
            OrderConstraints oc = settings.constraints(ls);
            try {
                avg = new StructureCasePrediction(ls, oc, maxHiddenStates);
            } catch (StructureSum.TooLarge e) {
                throw new UserError("predict --method exact under the structure-modular prior runs the exact sum once per "
                        + "case and hidden joint state: " + e.getMessage(), e);
            }
            best = CasePredictor.bestNetwork(OrderPosterior.of(ls, BestDagOrder.of(ls, oc))).withMaxHiddenStates(maxHiddenStates);
            averagedOver = "exact: all DAGs, as Z(D + case) / Z(D)";
        } else {
            UnknownOrderPrediction.Mixture um;
            try {
                um = UnknownOrderPrediction.mixture(ls, settings, tailMass, maxHiddenStates, ProgressBars.onTerminal());
            } catch (TooLargeForExact e) {
                throw UnknownOrderEdges.tooLarge(e);
            }
            if (!um.converged()) {
                spec.commandLine().getErr().println(String.format(Locale.ROOT,
                        "predict: WARNING: the chains have not converged (largest split-R-hat %.3f, target < %.2f; and every edge "
                                + "posterior needs MCSE <= its target): the prediction is not reliable; run longer (--max-time)",
                        um.maxRhat(), UnknownOrderEdges.RHAT_WARN));
            }
            OrderMixture mix = um.mixture();
            mixture = um;
            if (exactCases) {
                exact = new ExactCasePrediction(ls, settings.constraints(ls));
            }
            avg = mix;
            best = CasePredictor.bestNetwork(OrderPosterior.of(ls, mix.bestOrder())).withMaxHiddenStates(maxHiddenStates);
            averagedOver = exact != null ? "exact: all allowed orders, as Z(D + case) / Z(D)"
                    : mix.sampled() ? meth + ": " + mix.draws() + (prior == DagPrior.STRUCTURE_MODULAR ? " sampled partitions, "
                    : " sampled orders, ") + mix.size() + " distinct"
                    : meth + ": all " + mix.size() + " allowed orders";
        }
        if (given != null) {
            checkEvidence(avg, given);
            checkEvidence(best, given);
        }
        if (single != null) {
            return one(m, ord, ls, avg, best, single, given, fmt);
        }
        return batch(table, avg, best, given);
    }

    /** Over unknown orders under the structure-modular prior, exact ({@link StructureCasePrediction}). */
    private boolean structure;

    /** The DAG prior over unknown orders; null given an order. */
    private DagPrior prior;

    /** For unknown orders: what the prediction was averaged over; null given an order. */
    private String averagedOver;

    private void checkEvidence(CaseProbability p, int[] given) {
        if (p.logProbability(given) == Double.NEGATIVE_INFINITY) {
            throw new UserError("--given " + givenText + " has probability zero under this order and store; a conditional on it is undefined");
        }
    }

    private static double lp(CaseProbability p, int[] target, int[] given) {
        return BatchPrediction.logProbability(p, target, given);
    }

    private int one(Manifest m, int[] ord, LocalScores ls, CaseProbability avg, CaseProbability best,
                    int[] target, int[] given, String fmt) {
        double a = exact != null ? exact.logProbability(target) : lp(avg, target, given);
        double b = lp(best, target, given);
        Double mcse = exact == null && avg instanceof OrderMixture mix && mix.sampled() ? mix.mcse(target, given) : null;
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
        Prediction p = new Prediction(named(m, target), given == null ? null : named(m, given), Math.exp(a), a,
                Math.exp(b), b, hidden, states, ord == null ? null : VariableOrder.names(m, ord), ls.familyScore().kind().label(),
                ls.familyScore().reportedEss(), ls.options().prior().label(), m.maxParents(),
                exact != null ? 0.0 : avg.skippedMass(), NOTE, ord != null ? "order" : averaging.method.method.trim().toLowerCase(Locale.ROOT),
                ord != null ? null : exact != null || structure ? "all" : mixture.orders(),
                exact != null || structure || ord != null ? null : mixture.orderSamples(), mcse,
                ord != null ? null : prior.label(),
                exact != null || structure ? Boolean.TRUE : null);
        PrintWriter w = spec.commandLine().getOut();
        if (out != null) {
            ResultJson.write(out, p);
            if (format == null) {
                return 0;
            }
        }
        if (fmt.equals("json")) {
            w.println(ResultJson.toJson(p));
        } else {
            String what = "P(" + CaseParser.format(m, target) + (given == null ? "" : " | " + CaseParser.format(m, given)) + ")";
            if (ord != null) {
                w.printf(Locale.ROOT, "%s averaged over networks consistent with the order: %.6g (log %.6f)%n", what, p.probability(), a);
                w.printf(Locale.ROOT, "%s under the single best network:                 %.6g (log %.6f)%n", what, p.bestNetworkProbability(), b);
            } else if (structure) {
                w.printf(Locale.ROOT, "%s averaged over every DAG (%s; structure-modular DAG prior): %.6g (log %.6f)%n",
                        what, averagedOver, p.probability(), a);
                w.printf(Locale.ROOT, "%s under the single highest-scoring network: %.6g (log %.6f)%n", what, p.bestNetworkProbability(), b);
            } else {
                String over = prior == DagPrior.STRUCTURE_MODULAR ? "partitions" : "orders";
                w.printf(Locale.ROOT, "%s averaged over %s (%s; %s DAG prior) and their networks: %.6g (log %.6f)%s%n",
                        what, over, averagedOver, prior.label(), p.probability(), a,
                        mcse == null ? "" : String.format(Locale.ROOT, ", Monte Carlo standard error %.3g", mcse));
                w.printf(Locale.ROOT, "%s under the best network of the highest-%s %s among them: %.6g (log %.6f)%n", what,
                        prior == DagPrior.STRUCTURE_MODULAR ? "weight" : "evidence", over.substring(0, over.length() - 1),
                        p.bestNetworkProbability(), b);
            }
            if (!hidden.isEmpty()) {
                w.printf(Locale.ROOT, "hidden variables summed out: %s (%.0f joint states)%n", String.join(", ", hidden), states);
            }
            w.println(NOTE);
        }
        w.flush();
        return 0;
    }

    private static Map<String, String> named(Manifest m, int[] states) {
        Map<String, String> out = new LinkedHashMap<>();
        for (int v = 0; v < states.length; v++) {
            if (states[v] != CaseParser.HIDDEN) {
                out.put(m.variables().get(v).name(), m.variables().get(v).states().get(states[v]));
            }
        }
        return out;
    }

    private int batch(CaseCsv table, CaseProbability avg, CaseProbability best, int[] given) {
        if (mixture != null && mixture.mixture().sampled() && exact == null) {
            spec.commandLine().getErr().println("predict: " + averagedOver + " (" + prior.label() + " DAG prior); the mcse column is the "
                    + "Monte Carlo standard error of each probability" + (averaging.method.method.trim().equalsIgnoreCase("exact")
                    ? "; --exact-cases computes complete cases exactly" : ""));
        }
        int rows = table.cases().length;
        BatchPrediction.Result r;
        try {
            r = BatchPrediction.run(avg, best, table.cases(), given,
                    rows >= BAR_ROWS ? ProgressBars.onTerminal() : ProgressListener.NONE);
        } catch (UserError e) {
            throw new UserError(casesFile + ": " + e.getMessage(), e);
        }
        double[] a = r.averaged();
        double[] b = r.best();
        boolean sampled = exact == null && avg instanceof OrderMixture mix && mix.sampled();
        double[] mcse = new double[rows];
        if (exact != null) {
            for (int i = 0; i < rows; i++) {
                try {
                    a[i] = exact.logProbability(table.cases()[i]);
                } catch (UserError e) {
                    throw new UserError(casesFile + ": case " + (i + 1) + ": " + e.getMessage(), e);
                }
            }
        } else if (sampled) {
            OrderMixture mix = (OrderMixture) avg;
            java.util.stream.IntStream.range(0, rows).parallel().forEach(i -> mcse[i] = mix.mcse(table.cases()[i], given));
        }
        StringBuilder sb = new StringBuilder(rows * 64);
        List<String> head = new ArrayList<>();
        for (String h : table.header()) {
            head.add(CsvFields.quote(h));
        }
        sb.append(String.join(",", head)).append(",probability,logProbability,bestNetworkProbability,bestNetworkLogProbability")
                .append(sampled ? ",mcse\n" : "\n");
        for (int i = 0; i < rows; i++) {
            sb.append(table.lines().get(i)).append(',').append(Math.exp(a[i])).append(',').append(a[i])
                    .append(',').append(Math.exp(b[i])).append(',').append(b[i]);
            if (sampled) {
                sb.append(',').append(mcse[i]);
            }
            sb.append('\n');
        }
        if (out != null) {
            ResultJson.writeText(out, sb.toString());
        } else {
            PrintWriter w = spec.commandLine().getOut();
            w.print(sb);
            w.flush();
        }
        return 0;
    }
}
