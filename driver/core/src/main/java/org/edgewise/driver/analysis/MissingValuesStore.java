package org.edgewise.driver.analysis;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.edgewise.driver.Version;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.augment.Augmentation;
import org.edgewise.driver.average.convergence.ChainDiagnostics;
import org.edgewise.driver.average.dag.ParentListDraws;
import org.edgewise.driver.posterior.DagSample;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.MissingValues;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreWriter;

/**
 * Writes the store of a table whose missing values were averaged over ({@link MissingValues}): the
 * last completed table's counts and scores as the Parquet parts, and the DAGs kept by data
 * augmentation as the sample directory inside it, with the split-R̂ and effective sample size of
 * every edge indicator over the chains in draw order (Vehtari et al. 2021) — the verdict every query
 * over the store then carries.
 */
public final class MissingValuesStore {
    private MissingValuesStore() {
    }

    /** The largest split-R̂ and smallest bulk ESS over the edge indicators, and the verdict. */
    public record Convergence(double maxRhat, double minEss, boolean converged) {
    }

    /**
     * Writes the store atomically at {@code target}.
     *
     * @param manifest the completed tables' manifest, {@code missingValues} recorded
     */
    public static Convergence write(Path target, Manifest manifest, Augmentation.Outcome o, double seconds,
                                    boolean overwrite, String overwriteOption) {
        int n = manifest.variableCount();
        int chains = o.kept().size();
        int per = o.kept().get(0).size();
        int[][][][] dags = new int[chains][per][][];
        for (int c = 0; c < chains; c++) {
            for (int k = 0; k < per; k++) {
                dags[c][k] = ParentListDraws.parentLists(o.kept().get(c).get(k));
            }
        }
        DagSample d = new DagSample(n, dags, null);
        Convergence conv = convergence(o.kept(), n);
        Augmentation.Settings s = o.settings();
        Map<String, Object> settings = new LinkedHashMap<>();
        settings.put("rounds", s.rounds());
        settings.put("burnIn", s.burnIn());
        settings.put("chains", s.chains());
        settings.put("drawsPerRound", s.drawsPerRound());
        SampleFile.Diagnostics diag = new SampleFile.Diagnostics(conv.maxRhat(), conv.minEss(), conv.converged(),
                s.rounds(), s.burnIn(), 1, seconds, !s.untilConverged() ? "rounds" : conv.converged() ? "converged" : "max-rounds", ChainDiagnostics.RHAT_TARGET, ChainDiagnostics.ESS_TARGET, null);
        MissingValues mv = manifest.missingValues();
        ScoreStore last = o.last();
        SampleFile.Info info = SampleFile.info(manifest, target, "mcmc", mv.describe(), mv.dagPrior(), null,
                manifest.tiers(), ScoringOptions.asStored(), settings, s.seed(), diag, d, Version.PROGRAM,
                manifest.createdAt());
        StoreWriter.write(target, manifest, last.families(), last.logScores(), overwrite, overwriteOption,
                dir -> SampleFile.writeInto(dir.resolve(mv.sample()), info, d));
        return conv;
    }

    /**
     * The sample directory of a store averaged over missing values, or null for any other store (or
     * a path that is no store: the request that reads it says why).
     */
    public static Path sampleOf(Path store) {
        if (!java.nio.file.Files.isRegularFile(store.resolve(org.edgewise.driver.store.StoreFormat.MANIFEST))) {
            return null;
        }
        MissingValues mv;
        try {
            mv = org.edgewise.driver.store.StoreReader.readManifest(store).missingValues();
        } catch (org.edgewise.driver.UserError e) {
            return null;
        }
        return mv == null ? null : store.resolve(mv.sample());
    }

    /** Split-R̂ and bulk ESS of every edge indicator over the chains' kept DAGs (parent bitmasks). */
    static Convergence convergence(List<List<int[]>> kept, int n) {
        Augmentation.Check c = Augmentation.check(kept, n, 0, 0);
        return new Convergence(c.maxRhat(), c.minEss(), c.converged());
    }
}
