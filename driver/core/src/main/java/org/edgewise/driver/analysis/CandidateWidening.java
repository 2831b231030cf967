package org.edgewise.driver.analysis;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.TreeSet;
import org.edgewise.driver.ProgressListener;
import org.edgewise.driver.average.CandidateBoundary;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.UnknownOrderSettings;
import org.edgewise.driver.posterior.SampleFile;
import org.edgewise.driver.posterior.StructurePosterior;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.store.EdgeRule;
import org.edgewise.driver.store.Manifest;
import org.edgewise.driver.store.ScoreStore;

/**
 * The iterative search-space expansion of Kuipers, Suter &amp; Moffa (2022, "Efficient sampling and
 * structure learning of Bayesian networks", JCGS) over what a score store holds. A store tallied
 * with pruned candidates and a reserve (the manifest's {@code reserve}: per child the next candidates
 * by the same single-parent gain, whose families are stored too) is averaged first over the starting
 * candidates alone; every child the posterior then finds at its candidate boundary
 * ({@link CandidateBoundary}: filled, near an excluded variable, or with parent-set neighbours beyond
 * it) is widened into its whole reserve, rescored from the store, and the posterior is computed again
 * — until no bound child has reserve left. Each child widens at most once, so this ends after at most
 * one round per child (in practice two or three). A child still at the boundary then needs a new
 * tally with more candidates: the result names it.
 *
 * <p>Without a reserve (or when answering from a saved sample) there is one round over every stored
 * family; the result still names the bound children and those no rule could check.
 */
final class CandidateWidening {
    /** The outcome: the posterior answered, what bounds it, what was widened, what could not be checked. */
    record Outcome(StructurePosterior posterior, List<String> boundary, EdgeResult.CandidateSearch search) {
    }

    private CandidateWidening() {
    }

    static Outcome run(ScoreStore store, ScoringOptions so, SampleFile.Loaded saved, int[] order, UnknownOrderSettings settings,
                       ProgressListener progress) {
        Manifest m = store.manifest();
        if (m.reserve() == null || m.candidates() == null || saved != null) {
            LocalScores ls = LocalScores.build(store, so);
            StructurePosterior p = StructurePosterior.of(ls, saved, order, settings, progress);
            // a saved sample from a store with a reserve was drawn over every stored family: judged there
            LocalScores drawnOver = m.reserve() != null ? ls : null;
            List<CandidateBoundary.Finding> found = CandidateBoundary.find(ls, p.setPosterior(), drawnOver);
            if (found == null) {
                return new Outcome(p, null, null);
            }
            return new Outcome(p, names(m, found), new EdgeResult.CandidateSearch(m.reserve() != null, List.of(),
                    names(m, CandidateBoundary.unchecked(ls, drawnOver))));
        }
        LocalScores wider = LocalScores.build(store, so);
        int[][] allowed = start(m, so, wider.variableCount());
        List<EdgeResult.Widening> widened = new ArrayList<>();
        for (int round = 1; ; round++) {
            LocalScores ls = LocalScores.build(store, so, allowed);
            StructurePosterior p = StructurePosterior.of(ls, null, order, settings, progress);
            List<CandidateBoundary.Finding> found = CandidateBoundary.find(ls, p.setPosterior(), wider);
            List<String> now = new ArrayList<>();
            for (CandidateBoundary.Finding f : found) {
                int[] more = Arrays.stream(wider.candidates(f.child()))
                        .filter(x -> Arrays.binarySearch(allowed[f.child()], x) < 0).toArray();
                if (more.length == 0) {
                    continue;
                }
                List<String> added = new ArrayList<>();
                for (int x : more) {
                    added.add(m.variables().get(x).name());
                }
                widened.add(new EdgeResult.Widening(round, m.variables().get(f.child()).name(), added, f.rule().word()));
                now.add(m.variables().get(f.child()).name());
                allowed[f.child()] = wider.candidates(f.child()).clone();
            }
            if (now.isEmpty()) {
                return new Outcome(p, names(m, found),
                        new EdgeResult.CandidateSearch(true, widened, names(m, CandidateBoundary.unchecked(ls, wider))));
            }
            progress.note("candidates: " + String.join(", ", now) + " at the boundary of their candidate sets after round "
                    + round + "; widened into the stored reserve and averaged again");
        }
    }

    /**
     * Each child's starting candidates: the manifest's, plus any parent the query requires (so a
     * required parent from the reserve is allowed from the start).
     */
    static int[][] start(Manifest m, ScoringOptions so, int n) {
        int[][] out = new int[n][];
        for (int child = 0; child < n; child++) {
            TreeSet<Integer> cs = new TreeSet<>();
            List<String> names = m.candidates().get(m.variables().get(child).name());
            if (names != null) {
                for (String c : names) {
                    cs.add(m.variableIndex(c));
                }
            }
            for (EdgeRule e : so.require()) {
                if (e.to().equals(m.variables().get(child).name()) && m.variableIndex(e.from()) >= 0) {
                    cs.add(m.variableIndex(e.from()));
                }
            }
            out[child] = cs.stream().mapToInt(Integer::intValue).toArray();
        }
        return out;
    }

    private static List<String> names(Manifest m, List<?> children) {
        List<String> out = new ArrayList<>();
        for (Object c : children) {
            int i = c instanceof CandidateBoundary.Finding f ? f.child() : (Integer) c;
            out.add(m.variables().get(i).name());
        }
        return out;
    }
}
