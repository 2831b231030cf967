package org.edgewise.driver.analysis;

import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.temporal.ChronoUnit;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.UserError;
import org.edgewise.driver.Version;
import org.edgewise.driver.average.CandidateBoundary;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.VariableOrder;
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.average.mcmc.McmcResult;
import org.edgewise.driver.posterior.DagSample;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.posterior.SavedSample;
import org.edgewise.driver.posterior.StructurePosterior;
import org.edgewise.driver.store.ScoreStore;

/**
 * The {@code sample} service (issue 19): draws DAGs once from the request's {@link StructurePosterior}
 * and saves them with their provenance as a posterior-sample directory ({@link SampleFile}), which
 * {@code edges}, {@code effect} and {@code predict} then read instead of sampling again.
 */
public final class SampleAnalysis {
    /** DAGs drawn by the exact sources and given an order by default. */
    public static final int DEFAULT_DAGS = 10_000;

    private SampleAnalysis() {
    }

    /**
     * @param dags          DAGs to draw for exact sources and given an order (chains keep one per stored draw)
     * @param outName       how the caller names the target in messages
     * @param overwriteName how the caller names the permission to replace it
     */
    public record Request(Scoring scoring, Averaging averaging, Path out, boolean overwrite, int dags, String outName,
                          String overwriteName) {
    }

    /**
     * What was written.
     *
     * @param candidateBoundary from a pruned store: the children whose candidate sets bound the sampled posterior
     *                          (empty when none does); null when the store was not pruned
     */
    public record Summary(Path out, String method, String sampler, int chains, int dagsPerChain, boolean weighted,
                          long bytes, Boolean converged, Double maxRhat, Double minEss, double seconds,
                          List<String> candidateBoundary) {
    }

    public static Summary run(Request r, ProgressListener progress) {
        SampleFile.checkTarget(r.out(), r.overwrite(), r.outName(), r.overwriteName());
        long t0 = System.nanoTime();
        Averaging a;
        Inputs in = Inputs.of(r.scoring(), r.averaging());
        a = in.averaging();
        ScoreStore store = in.store();
        int[] order = in.order();
        LocalScores ls = in.scores();
        StructurePosterior p = StructurePosterior.of(ls, in.saved(), in.order(), a.settings(0), progress);
        if (p.cost() != null) {
            progress.note(p.cost());
        }
        StructurePosterior.Sampled drawn = p.sampleDags(r.dags(), a.seed() + 2);
        DagSample d = drawn.dags();
        McmcResult chains = p.chains();
        SampleFile.Diagnostics diag = chains == null ? null : new SampleFile.Diagnostics(chains.maxRhat(), chains.minEss(),
                chains.converged(), chains.stepsPerChain(), chains.burnIn(), chains.thin(), chains.samplingSeconds(),
                chains.outcome().stop().label(), a.settings(0).rhatTarget(), (double) ChainDiagnostics.ESS_TARGET,
                a.settings(0).targets().mcse());
        // the children whose candidate sets bound what was sampled, judged on the saved DAGs' frequencies exactly as
        // edges judges a saved sample (drawn over every stored family, reserve included); predict and effect repeat it
        List<CandidateBoundary.Finding> found = CandidateBoundary.find(ls, SavedSample.frequencies(ls, d),
                store.manifest().reserve() != null ? ls : null);
        List<String> boundary = found == null ? null
                : found.stream().map(f -> store.manifest().variables().get(f.child()).name()).toList();
        StructurePosterior.Labels l = p.labels();
        Map<String, Object> settings = new LinkedHashMap<>();
        if (chains != null) {
            settings.put("chains", a.chains());
            settings.put("steps", a.steps());
            settings.put("burnIn", a.burnIn());
            settings.put("draws", a.draws());
            settings.put("rhatTarget", a.rhatTarget());
            settings.put("mcseTarget", a.mcseTarget());
            settings.put("maxSteps", a.maxSteps());
            settings.put("maxSeconds", a.maxSeconds());
        } else {
            settings.put("dags", r.dags());
        }
        settings.values().removeIf(v -> v == null);
        SampleFile.Info info = SampleFile.info(store.manifest(), r.scoring().store(), l.method(),
                (chains == null ? "" : "sampled by chains: ") + drawn.sampler(), l.dagPrior() == null ? null : l.dagPrior().label(),
                order == null ? null : VariableOrder.names(store.manifest(), order), p.tiers(), ls.options(), settings, a.seed(),
                diag, d, Version.PROGRAM, Instant.now().truncatedTo(ChronoUnit.SECONDS).toString(), boundary);
        SampleFile.write(r.out(), r.overwrite(), r.overwriteName(), info, d);
        long bytes;
        try {
            bytes = Files.size(r.out().resolve(SampleFile.DAGS));
        } catch (java.io.IOException e) {
            throw new UserError("cannot read back " + r.out() + ": " + AtomicWrite.reason(e));
        }
        return new Summary(r.out(), l.method(), info.sampler(), d.chains(), d.perChain(), d.weighted(), bytes,
                diag == null ? null : diag.converged(), diag == null ? null : diag.maxRhat(),
                diag == null ? null : diag.minEss(), (System.nanoTime() - t0) / 1e9, boundary);
    }
}
