package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.edgewise.driver.CsvFields;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.posterior.DagSample;
import org.edgewise.driver.posterior.SavedSample;
import org.edgewise.driver.posterior.StructurePosterior;
import org.edgewise.driver.query.CaseParser;
import org.edgewise.driver.query.CaseProbability;
import org.edgewise.driver.query.CaseTable;
import org.edgewise.driver.query.HeldOutScores;
import org.edgewise.driver.query.PredictionDraws;
import org.edgewise.driver.query.TargetCases;
import org.edgewise.driver.query.TargetPrediction;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.TargetPredictions;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.Variable;

/**
 * {@code predict} scoring a table of cases for one target: per row P(y = k | the row's other cells,
 * the shared evidence, D) averaged over the request's structure posterior ({@link TargetPrediction}),
 * the interval over (network, parameters) draws when asked ({@link PredictionDraws}), and the
 * held-out scores of the rows with a truth ({@link HeldOutScores}); as a {@link TargetPredictions}
 * record, a per-row CSV and a readable table.
 */
final class TargetAnalysis {
    /** Rows the readable table shows at most (the CSV and JSON hold them all). */
    static final int TABLE_ROWS = 50;

    /** The largest elimination table an interval's inference builds (entries; 8 bytes each). */
    static final long MAX_TABLE = 1L << 25;

    static final String NOTE = "P(target | each row's other cells) under the stated assumptions (the structures averaged over, "
            + "d, score, prior), with posterior-mean parameters; a model-based estimate, not a measured frequency. Scores are "
            + "held out only if the scored rows were not in the data the store was tallied from.";

    private TargetAnalysis() {
    }

    /** What one scoring request is computed from. */
    record Scope(Manifest m, LocalScores ls, StructurePosterior p, StructurePosterior.Cases cases, TargetCases rows, int[] given,
                 Path file, PredictionAnalysis.Target target, long seed, long maxHiddenStates,
                 EdgeResult.Diagnostics diagnostics) {
    }

    static PredictionAnalysis.Answer run(Scope s, CaseTable table, ProgressListener progress) {
        TargetCases tc = s.rows();
        Variable y = s.m().variables().get(tc.target());
        int r = y.arity();
        int n = tc.evidence().length;
        String[] where = new String[n];
        for (int i = 0; i < n; i++) {
            where[i] = s.file() + ": line " + tc.lineNumbers()[i];
        }
        CaseProbability avg = s.cases().averaged();
        TargetPrediction.Result pr = TargetPrediction.run(avg, tc, r, where,
                n >= PredictionAnalysis.BAR_ROWS ? progress : ProgressListener.NONE);
        PredictionDraws.Interval iv = null;
        if (s.target().intervalLevel() != null) {
            int draws = s.target().intervalDraws();
            DagSample d = s.p().sampleDags(draws, s.seed()).dags();
            int[][][] dags = d.flatDags();
            double[] w = d.flatWeights();
            iv = PredictionDraws.run(s.ls().store(), s.ls().familyScore(), dags, w, d.chains(), draws, s.seed(),
                    s.target().intervalLevel(),
                    tc, r, Math.min(s.maxHiddenStates(), MAX_TABLE), where, "the structure posterior's DAGs",
                    s.ls().options().names().maxHiddenStates());
        }
        int scored = tc.scored();
        HeldOutScores.Scores sc = null;
        if (scored > 0) {
            double[][] p = new double[scored][];
            int[] truth = new int[scored];
            for (int i = 0, j = 0; i < n; i++) {
                if (tc.truth()[i] >= 0) {
                    p[j] = pr.probability()[i];
                    truth[j++] = tc.truth()[i];
                }
            }
            sc = HeldOutScores.of(p, truth, r, HeldOutScores.DEFAULT_BINS);
        }
        TargetPredictions result = record(s, pr, iv, sc, y);
        return new PredictionAnalysis.Answer(null, lines(s, result, y), csv(table, result, y), s.diagnostics(), result);
    }

    private static TargetPredictions record(Scope s, TargetPrediction.Result pr, PredictionDraws.Interval iv,
                                            HeldOutScores.Scores sc, Variable y) {
        TargetCases tc = s.rows();
        int n = tc.evidence().length;
        List<TargetPredictions.Row> rows = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            rows.add(new TargetPredictions.Row(tc.lineNumbers()[i], tc.truth()[i] < 0 ? null : y.states().get(tc.truth()[i]),
                    list(pr.probability()[i]), pr.mcse() == null ? null : list(pr.mcse()[i]),
                    iv == null ? null : list(iv.lower()[i]), iv == null ? null : list(iv.upper()[i])));
        }
        TargetPredictions.Scores scores = null;
        if (sc != null) {
            List<TargetPredictions.Calibration> cal = new ArrayList<>();
            for (HeldOutScores.Calibration c : sc.calibration()) {
                List<TargetPredictions.Bin> bins = new ArrayList<>();
                for (HeldOutScores.Bin b : c.bins()) {
                    bins.add(new TargetPredictions.Bin(b.low(), b.high(), b.count(), finite(b.meanPredicted()),
                            finite(b.observedFrequency())));
                }
                cal.add(new TargetPredictions.Calibration(y.states().get(c.state()), bins));
            }
            List<Double> per = new ArrayList<>();
            for (double a : sc.aucPerState()) {
                per.add(finite(a));
            }
            scores = new TargetPredictions.Scores(sc.logLoss(), sc.brier(), finite(sc.auc()),
                    y.arity() == 2 ? "binary" : "one-vs-rest macro average", per, cal);
        }
        StructurePosterior.Labels l = s.p().labels();
        CaseProbability avg = s.cases().averaged();
        TargetPredictions.Interval interval = iv == null ? null : new TargetPredictions.Interval(iv.level(), iv.draws(),
                intervalOf(iv), iv.endpointMcse());
        return new TargetPredictions(y.name(), y.states(), s.file().toString(), tc.truthFrom(),
                s.given() == null ? null : CaseParser.named(s.m(), s.given()), n, tc.scored(), n - tc.scored(), l.method(),
                s.cases().averagedOver(), s.cases().samples(), avg.sampled() ? "sampled" : "exact", l.dagPriorLabel(null),
                s.ls().familyScore().kind().label(), ResultBuilder.settings(s.ls()).ess(), s.ls().options().prior().label(),
                s.m().maxParents(), avg.skippedMass(), s.p() instanceof SavedSample ss ? EdgeAnalysis.sampleRef(ss) : null,
                interval, scores, NOTE, rows);
    }

    private static String intervalOf(PredictionDraws.Interval iv) {
        return String.format(Locale.ROOT, "P(target = state | row) under one network and its parameters: a central %s%% interval "
                + "over %d draws of a DAG from the structure posterior and its parameters from their Dirichlet posteriors (sampled)",
                pct(iv.level()), iv.draws());
    }

    private static String pct(double level) {
        String t = String.format(Locale.ROOT, "%.4f", 100 * level).replaceAll("0+$", "");
        return t.endsWith(".") ? t.substring(0, t.length() - 1) : t;
    }

    private static Double finite(double x) {
        return Double.isFinite(x) ? x : null;
    }

    private static List<Double> list(double[] x) {
        List<Double> out = new ArrayList<>(x.length);
        for (double v : x) {
            out.add(v);
        }
        return out;
    }

    /** The input's lines with one probability column per state (and its mcse, interval ends when present). */
    private static String csv(CaseTable table, TargetPredictions t, Variable y) {
        StringBuilder sb = new StringBuilder(t.rows() * 64);
        List<String> head = new ArrayList<>();
        for (String h : table.header()) {
            head.add(CsvFields.quote(h));
        }
        for (String st : y.states()) {
            head.add(CsvFields.quote("P(" + y.name() + "=" + st + ")"));
        }
        boolean mcse = "sampled".equals(t.estimate());
        for (String what : mcse ? List.of("mcse") : List.<String>of()) {
            for (String st : y.states()) {
                head.add(CsvFields.quote(what + " P(" + y.name() + "=" + st + ")"));
            }
        }
        if (t.interval() != null) {
            for (String what : List.of("lower", "upper")) {
                for (String st : y.states()) {
                    head.add(CsvFields.quote(what + " P(" + y.name() + "=" + st + ")"));
                }
            }
        }
        sb.append(String.join(",", head)).append('\n');
        for (int i = 0; i < t.rows(); i++) {
            TargetPredictions.Row row = t.predictions().get(i);
            sb.append(table.lines().get(i));
            append(sb, row.probability());
            if (mcse) {
                append(sb, row.mcse());
            }
            if (t.interval() != null) {
                append(sb, row.lower());
                append(sb, row.upper());
            }
            sb.append('\n');
        }
        return sb.toString();
    }

    private static void append(StringBuilder sb, List<Double> xs) {
        for (Double x : xs) {
            sb.append(',').append(x);
        }
    }

    /** The readable table: what it is, the first rows, the scores and the calibration tables. */
    static List<String> lines(Scope s, TargetPredictions t, Variable y) {
        List<String> out = new ArrayList<>();
        String prior = t.dagPrior() == null ? "" : "; " + t.dagPrior() + " DAG prior";
        out.add("P(" + y.name() + " | each row's other cells" + (t.given() == null ? "" : ", " + CaseParser.format(s.m(), s.given()))
                + ") for " + t.rows() + " rows of " + t.cases() + ", averaged over " + s.cases().over() + prior + " ("
                + t.estimate() + (t.estimate().equals("sampled") ? ", \u00b1 Monte Carlo standard error" : "") + ")");
        if (t.sample() != null) {
            out.add("from the saved sample " + t.sample().path() + " (fingerprint " + t.sample().fingerprint() + ")");
        }
        if (t.interval() != null) {
            out.add("[lower, upper]: " + t.interval().of() + String.format(Locale.ROOT, "; largest Monte Carlo error of an end %.2g",
                    t.interval().endpointMcse()));
        }
        StringBuilder h = new StringBuilder(String.format(Locale.ROOT, "%6s  %-10s", "line", "truth"));
        for (String st : y.states()) {
            h.append(String.format(Locale.ROOT, "  %-" + width(t) + "s", "P(" + st + ")"));
        }
        out.add(h.toString());
        for (int i = 0; i < Math.min(TABLE_ROWS, t.rows()); i++) {
            TargetPredictions.Row row = t.predictions().get(i);
            StringBuilder b = new StringBuilder(String.format(Locale.ROOT, "%6d  %-10s", row.line(), row.truth() == null ? "-" : row.truth()));
            for (int k = 0; k < y.arity(); k++) {
                String cell = String.format(Locale.ROOT, "%.4f", row.probability().get(k));
                if (row.mcse() != null) {
                    cell += String.format(Locale.ROOT, " \u00b1%.4f", row.mcse().get(k));
                }
                if (row.lower() != null) {
                    cell += String.format(Locale.ROOT, " [%.4f, %.4f]", row.lower().get(k), row.upper().get(k));
                }
                b.append(String.format(Locale.ROOT, "  %-" + width(t) + "s", cell));
            }
            out.add(b.toString());
        }
        if (t.rows() > TABLE_ROWS) {
            out.add("\u2026 " + (t.rows() - TABLE_ROWS) + " more rows (all of them in the CSV or JSON output)");
        }
        if (t.scores() == null) {
            out.add(t.truthColumn() == null ? "no truth column: nothing scored (the target's own column, or a truth column, "
                    + "gives held-out scores)" : "no row has a truth in " + t.truthColumn() + ": nothing scored");
        } else {
            TargetPredictions.Scores sc = t.scores();
            out.add(String.format(Locale.ROOT, "held-out scores over %d rows with a truth (from column %s)%s:", t.scoredRows(),
                    t.truthColumn(), t.unscoredRows() == 0 ? "" : "; " + t.unscoredRows() + (t.unscoredRows() == 1 ? " row without one was"
                            : " rows without one were") + " predicted, not scored"));
            out.add(String.format(Locale.ROOT, "  log loss %.4f (mean -ln P(truth))   Brier score %.4f (sum over states, 0 to 2)   "
                    + "AUC %s (%s)", sc.logLoss(), sc.brier(), sc.auc() == null ? "undefined" : String.format(Locale.ROOT, "%.4f", sc.auc()),
                    sc.aucOf()));
            for (TargetPredictions.Calibration c : sc.calibration()) {
                out.add("  calibration of P(" + y.name() + "=" + c.state() + "): bin, rows, mean predicted, observed share");
                for (TargetPredictions.Bin b : c.bins()) {
                    if (b.count() > 0) {
                        out.add(String.format(Locale.ROOT, "    [%.1f, %.1f%s  %6d  %.4f  %.4f", b.low(), b.high(),
                                b.high() >= 1 ? "]" : ")", b.count(), b.meanPredicted(), b.observedFrequency()));
                    }
                }
            }
        }
        out.add(NOTE);
        return out;
    }

    private static int width(TargetPredictions t) {
        return 6 + ("sampled".equals(t.estimate()) ? 8 : 0) + (t.interval() != null ? 18 : 0);
    }
}
