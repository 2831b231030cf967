package org.edgewise.driver.average.augment;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.LogSum;
import org.edgewise.driver.average.ScoringOptions;
import org.edgewise.driver.average.convergence.Estimate;
import org.edgewise.driver.average.dag.DagDraws;
import org.edgewise.driver.score.FamilyScore;
import org.edgewise.driver.score.ScoreKind;
import org.edgewise.driver.store.InMemoryTally;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.Variable;
import org.junit.jupiter.api.Test;

/**
 * Data augmentation against brute force. Under missing at random the observed-data likelihood of a
 * DAG is the sum over every completion of the missing cells of the complete-data marginal likelihood,
 * P(D_obs | G) = Σ_completions P(D | G) (Rubin 1976; Tanner &amp; Wong 1987) — computed here by
 * enumerating every completion (InMemoryTally, the reference tally) and every DAG (DagEnumeration),
 * under the order-modular DAG prior P(G) ∝ ext(G) that the augmentation draws under. The augmented
 * edge posteriors must lie within 0.03 + 4 MCSE of the exact ones.
 */
class AugmentationTest {
    private static final FamilyScore BDEU = FamilyScore.of(ScoreKind.BDEU, 1);

    /** 4 binary variables, a chain a → b → c with d depending on a and c; {@code seed} fixes the rows. */
    static int[][] rows(int count, long seed) {
        SplittableRandom rng = new SplittableRandom(seed);
        int[][] rows = new int[count][4];
        for (int[] x : rows) {
            x[0] = rng.nextDouble() < 0.5 ? 1 : 0;
            x[1] = rng.nextDouble() < (x[0] == 1 ? 0.85 : 0.2) ? 1 : 0;
            x[2] = rng.nextDouble() < (x[1] == 1 ? 0.8 : 0.3) ? 1 : 0;
            x[3] = rng.nextDouble() < (x[0] + x[2] == 2 ? 0.9 : x[0] + x[2] == 1 ? 0.5 : 0.15) ? 1 : 0;
        }
        return rows;
    }

    static List<Variable> binary(int n) {
        List<Variable> vs = new ArrayList<>();
        for (int v = 0; v < n; v++) {
            vs.add(new Variable("x" + v, List.of("0", "1")));
        }
        return vs;
    }

    /** Exact order-modular edge posteriors P(a → b) given every completion of the cells marked −1. */
    static double[][] exactEdges(List<Variable> vars, int[][] rows, int d) {
        int n = vars.size();
        List<int[]> cells = missingCells(rows);
        List<int[]> dags = DagEnumeration.allDags(n, d);
        double[] logDag = new double[dags.size()];
        java.util.Arrays.fill(logDag, Double.NEGATIVE_INFINITY);
        int[][] filled = copy(rows);
        for (int c = 0; c < 1 << cells.size(); c++) {
            for (int i = 0; i < cells.size(); i++) {
                filled[cells.get(i)[0]][cells.get(i)[1]] = c >> i & 1;
            }
            ScoreStore s = InMemoryTally.tally(vars, filled, d, BDEU);
            double[][] w = DagEnumeration.logWeights(LocalScores.build(s, ScoringOptions.asStored()));
            for (int g = 0; g < dags.size(); g++) {
                double lp = 0;
                for (int v = 0; v < n; v++) {
                    lp += w[v][dags.get(g)[v]];
                }
                logDag[g] = LogSum.add(logDag[g], lp); // Σ over completions of P(D | G)
            }
        }
        for (int g = 0; g < dags.size(); g++) {
            logDag[g] += Math.log(DagEnumeration.linearExtensions(dags.get(g), n)); // order-modular prior
        }
        double z = LogSum.of(logDag);
        double[][] edge = new double[n][n];
        for (int g = 0; g < dags.size(); g++) {
            double p = Math.exp(logDag[g] - z);
            for (int b = 0; b < n; b++) {
                for (int a = 0; a < n; a++) {
                    if ((dags.get(g)[b] >> a & 1) != 0) {
                        edge[a][b] += p;
                    }
                }
            }
        }
        return edge;
    }

    static List<int[]> missingCells(int[][] rows) {
        List<int[]> cells = new ArrayList<>();
        for (int t = 0; t < rows.length; t++) {
            for (int v = 0; v < rows[t].length; v++) {
                if (rows[t][v] < 0) {
                    cells.add(new int[] {t, v});
                }
            }
        }
        return cells;
    }

    static int[][] copy(int[][] rows) {
        int[][] out = new int[rows.length][];
        for (int t = 0; t < rows.length; t++) {
            out[t] = rows[t].clone();
        }
        return out;
    }

    /** Data augmentation in memory: every round redraws the cells marked −1 and tallies the table again. */
    static Augmentation.Outcome augment(List<Variable> vars, int[][] rows, int d, Augmentation.Settings s) {
        return augmentWith(vars, rows, d, s, new ArrayList<>());
    }

    /** As {@link #augment}, collecting each round's check. */
    static Augmentation.Outcome augmentWith(List<Variable> vars, int[][] rows, int d, Augmentation.Settings s,
                                            List<Augmentation.Check> checks) {
        int n = vars.size();
        int[] arity = new int[n];
        long[][] observed = new long[n][];
        for (int v = 0; v < n; v++) {
            arity[v] = vars.get(v).arity();
            observed[v] = new long[arity[v]];
        }
        for (int[] x : rows) {
            for (int v = 0; v < n; v++) {
                if (x[v] >= 0) {
                    observed[v][x[v]]++;
                }
            }
        }
        int[][] start = copy(rows);
        for (int[] x : start) {
            for (int v = 0; v < n; v++) {
                x[v] = Math.max(0, x[v]);
            }
        }
        ScoreStore shape = InMemoryTally.tally(vars, start, d, BDEU);
        Augmentation.Recount recount = Augmentation.chainByChain((chain, round, net, seed) -> {
            SplittableRandom rng = new SplittableRandom(seed);
            int[][] filled = copy(rows);
            for (int[] x : filled) {
                int[] miss = java.util.stream.IntStream.range(0, n).filter(v -> x[v] < 0).toArray();
                if (miss.length > 0) {
                    net.complete(x, miss, rng);
                }
            }
            ScoreStore t = InMemoryTally.tally(vars, filled, d, BDEU);
            return new Augmentation.Completed(t.families(), t.logScores());
        });
        return Augmentation.run(shape.manifest(), BDEU, DrawnNetwork.marginals(arity, observed, 1), s, recount,
                (round, secs, check) -> checks.add(check));
    }

    /** P(a → b) over the kept DAGs with its Monte Carlo error (chains in draw order). */
    static Estimate edge(Augmentation.Outcome o, int a, int b) {
        List<List<int[]>> kept = o.kept();
        return DagDraws.estimate((c, k) -> (kept.get(c).get(k)[b] >> a & 1) != 0, kept.size(), kept.get(0).size(), 1, null);
    }

    @Test
    void augmentedEdgesMatchTheSumOverEveryCompletion() {
        List<Variable> vars = binary(4);
        int[][] rows = rows(100, 7);
        // 8 missing cells: two rows missing two cells, four rows missing one
        int[][] holes = {{3, 1}, {3, 2}, {10, 0}, {10, 3}, {25, 2}, {40, 1}, {61, 3}, {88, 0}};
        for (int[] h : holes) {
            rows[h[0]][h[1]] = -1;
        }
        double[][] exact = exactEdges(vars, rows, 3);
        Augmentation.Outcome o = augment(vars, rows, 3, new Augmentation.Settings(600, 100, 2, 20, 11));
        double worst = 0;
        for (int a = 0; a < 4; a++) {
            for (int b = 0; b < 4; b++) {
                if (a == b) {
                    continue;
                }
                Estimate e = edge(o, a, b);
                double gap = Math.abs(e.mean() - exact[a][b]);
                worst = Math.max(worst, gap);
                assertTrue(gap <= 0.03 + 4 * e.mcse(), String.format(Locale.ROOT,
                        "P(x%d -> x%d): augmented %.4f ± %.4f, exact %.4f", a, b, e.mean(), e.mcse(), exact[a][b]));
            }
        }
        System.out.printf(Locale.ROOT, "augmentation vs the sum over 256 completions: largest edge gap %.4f%n", worst);
    }

    /**
     * Until converged: rounds from the first check (10) on until the second half of the rounds has split-R̂
     * &lt; 1.01 and bulk ESS ≥ 400 for every edge (Vehtari et al. 2021, recomputed here from the kept DAGs), the
     * kept DAGs those of the second half; and the edges still match the sum over every completion.
     */
    @Test
    void untilConvergedStopsAtTheFirstConvergedCheckAndKeepsTheSecondHalf() {
        List<Variable> vars = binary(4);
        int[][] rows = rows(100, 7);
        int[][] holes = {{3, 1}, {3, 2}, {10, 0}, {10, 3}, {25, 2}, {40, 1}, {61, 3}, {88, 0}};
        for (int[] h : holes) {
            rows[h[0]][h[1]] = -1;
        }
        Augmentation.Settings s = Augmentation.Settings.untilConverged(11);
        List<Augmentation.Check> checks = new ArrayList<>();
        Augmentation.Outcome o = augmentWith(vars, rows, 3, s, checks);
        int done = o.settings().rounds();
        assertTrue(done >= Augmentation.Settings.MIN_ROUNDS && done <= Augmentation.Settings.MAX_ROUNDS, "rounds " + done);
        assertEquals(done / 2, o.settings().burnIn());
        assertEquals(done, checks.size());
        assertEquals((done - done / 2) * s.drawsPerRound(), o.kept().get(0).size());
        Augmentation.Check last = Augmentation.check(o.kept(), 4, done / 2 + 1, done);
        assertEquals(done < Augmentation.Settings.MAX_ROUNDS, last.converged(), "stopped at round " + done);
        // no earlier check from the first one on said converged
        for (int t = Augmentation.Settings.MIN_ROUNDS; t < done; t++) {
            assertTrue(!checks.get(t - 1).converged(), "round " + t + " had converged already");
        }
        double[][] exact = exactEdges(vars, rows, 3);
        for (int a = 0; a < 4; a++) {
            for (int b = 0; b < 4; b++) {
                if (a != b) {
                    Estimate e = edge(o, a, b);
                    assertTrue(Math.abs(e.mean() - exact[a][b]) <= 0.03 + 4 * e.mcse(), String.format(Locale.ROOT,
                            "P(x%d -> x%d): augmented %.4f ± %.4f, exact %.4f", a, b, e.mean(), e.mcse(), exact[a][b]));
                }
            }
        }
    }

    @Test
    void theBruteForceSumIsTheCompleteTableWhenNothingIsMissing() {
        // with no missing cell the sum over completions has one term: P(D_obs | G) = P(D | G)
        List<Variable> vars = binary(4);
        int[][] rows = rows(100, 7);
        double[][] none = exactEdges(vars, rows, 3);
        rows[5][2] = -1;
        double[][] one = exactEdges(vars, rows, 3);
        double diff = 0;
        for (int a = 0; a < 4; a++) {
            for (int b = 0; b < 4; b++) {
                diff = Math.max(diff, Math.abs(none[a][b] - one[a][b]));
            }
        }
        assertTrue(diff > 0, "hiding a cell changes the posterior");
        assertTrue(diff < 0.2, "one hidden cell of 400 changes it a little: " + diff);
    }

    @Test
    void aRowsMissingCellsAreDrawnFromTheirExactConditional() {
        // x0 → x1 with θ given; x1 missing in a row with x0 = 1: P(x1 = 1 | x0 = 1) = θ_1(1 | 1)
        List<Variable> vars = binary(2);
        int[][] rows = {{1, 1}, {1, 1}, {1, 0}, {0, 0}, {0, 0}, {0, 1}};
        ScoreStore s = InMemoryTally.tally(vars, rows, 1, BDEU);
        DrawnNetwork net = DrawnNetwork.draw(s, BDEU, new int[][] {{}, {0}}, new SplittableRandom(3));
        double p1 = Math.exp(net.logTheta(1, 1, 1));
        SplittableRandom rng = new SplittableRandom(5);
        int hits = 0;
        int draws = 200_000;
        for (int i = 0; i < draws; i++) {
            int[] x = {1, 0};
            net.complete(x, new int[] {1}, rng);
            hits += x[1];
        }
        // binomial standard error √(p(1−p)/K) ≤ 0.0012: 5 of them
        assertEquals(p1, hits / (double) draws, 0.006);
        // x0 missing, x1 = 1 observed: Bayes' rule over both factors
        double a1 = Math.exp(net.logTheta(0, 0, 1) + net.logTheta(1, 1, 1));
        double a0 = Math.exp(net.logTheta(0, 0, 0) + net.logTheta(1, 0, 1));
        hits = 0;
        for (int i = 0; i < draws; i++) {
            int[] x = {0, 1};
            net.complete(x, new int[] {0}, rng);
            hits += x[0];
        }
        assertEquals(a1 / (a0 + a1), hits / (double) draws, 0.006);
    }
}
