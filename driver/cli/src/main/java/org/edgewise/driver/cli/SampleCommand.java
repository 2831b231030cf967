package org.edgewise.driver.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.edgewise.driver.Checks;
import org.edgewise.driver.ErrorReport;
import org.edgewise.driver.report.ConvergenceAdvice;
import org.edgewise.driver.analysis.Averaging;
import org.edgewise.driver.analysis.SampleAnalysis;
import org.edgewise.driver.analysis.Scoring;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/** {@code sample}: a posterior sample of DAGs, drawn once and saved for {@code edges}, {@code effect} … {@code --sample}. */
@Command(name = "sample", mixinStandardHelpOptions = true,
        description = {"Draws DAGs once from the structure posterior and saves them (a sample.json manifest and the DAGs in "
                + "a compact binary file) for edges, effect and predict --sample, which then answer without sampling again."})
public final class SampleCommand implements Callable<Integer> {
    @Spec
    CommandSpec spec;

    @Mixin
    AveragingOptions averaging = new AveragingOptions();

    @Option(names = "--out", required = true, paramLabel = "DIR", description = "the sample directory to write "
            + "(written to a temporary sibling, then renamed: never half-written)")
    Path out;

    @Option(names = "--overwrite", description = "replace an existing sample directory --out (never anything else)")
    boolean overwrite;

    @Option(names = "--dags", paramLabel = "N", description = "exact methods and --order: DAGs drawn (default "
            + SampleAnalysis.DEFAULT_DAGS + "); mcmc keeps one DAG per stored draw (set with --draws)")
    Integer dags;

    @Override
    public Integer call() {
        Checks.notApplicable(averaging.saved.sample != null, "--sample", "in sample", "a sample is drawn from the store, not from another sample");
        Scoring scoring = averaging.scoring();
        Averaging what = averaging.averaging("sampling", false, true);
        Checks.notApplicable(dags != null && what.method() == Averaging.Method.MCMC, "--dags", "with --method mcmc",
                "the chains keep one DAG per stored draw: set --draws");
        int n = dags == null ? SampleAnalysis.DEFAULT_DAGS : dags;
        Checks.atLeast(n, 1, "--dags");
        SampleAnalysis.Summary s = SampleAnalysis.run(new SampleAnalysis.Request(scoring, what, out, overwrite, n, "--out",
                "--overwrite"), ProgressBars.onTerminal());
        PrintWriter w = spec.commandLine().getOut();
        w.println(String.format(Locale.ROOT, "sample: wrote %s: %d chain%s of %d DAGs%s (%s: %s), %d bytes of DAGs%s",
                s.out(), s.chains(), s.chains() == 1 ? "" : "s", s.dagsPerChain(), s.weighted() ? ", weighted" : "",
                s.method(), s.sampler(), s.bytes(), s.converged() == null ? ""
                        : String.format(Locale.ROOT, "; %s (largest R-hat %.3f, smallest effective sample size %.0f)",
                        s.converged() ? "converged" : "NOT converged", s.maxRhat(), s.minEss())));
        w.flush();
        if (s.candidateBoundary() != null && !s.candidateBoundary().isEmpty()) {
            PrintWriter err = spec.commandLine().getErr();
            err.println("sample: CAUTION: the candidate sets pruned at tally time bound the sampled posterior of "
                    + String.join(", ", s.candidateBoundary()) + " (a parent beyond them may be missing from every DAG); "
                    + "predict and effect from this sample say so. Tally with more --candidates, or with --reserve M, to check "
                    + "and widen them.");
            err.flush();
        }
        boolean allow = averaging.unknown.allowUnconverged;
        if (Boolean.FALSE.equals(s.converged())) {
            PrintWriter err = spec.commandLine().getErr();
            err.println(String.format(Locale.ROOT, "sample: WARNING: not converged (largest R-hat %.3f, smallest effective sample "
                    + "size %.0f): the saved DAGs do not yet represent the posterior; %s. %s", s.maxRhat(), s.minEss(),
                    ConvergenceAdvice.runLonger(what.steps() != null && what.rhatTarget() == null ? "steps" : null, CliNames.RUN),
                    UnknownOrderEdges.exitSentence(allow)));
            err.flush();
        }
        return ErrorReport.finished(s.converged(), allow);
    }
}
