package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.apache.commons.math3.special.Gamma;
import org.edgewise.driver.average.DagEnumeration;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.ResultJson;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Fragility between the two DAG priors (issue 21, point 6): {@code edges --dag-prior both} averages
 * under the structure-modular prior and, beside it, under the order-modular one, and marks every
 * headline edge that crosses 0.5 between them, in the text and in the report's summary.
 *
 * <p>The table is invented, found by enumeration over random 4-variable binary tables as one where
 * an edge posterior crosses 0.5 between the priors. The reference is brute force over all 543 DAGs
 * on 4 nodes (OEIS A003024), each weighted by its BDeu marginal likelihood (ESS 1; Heckerman, Geiger
 * &amp; Chickering 1995) computed here from the rows with lnΓ, times 1 (structure-modular, uniform
 * structure prior) or times its number of linear extensions (order-modular; Koivisto &amp; Sood 2004).
 * An independent script gave P(v2 → v3) = 0.560587234 and 0.408013049 under the two priors.
 */
class DagPriorFragilityTest {
    /** Rows per cell, the cell index 8·v0 + 4·v1 + 2·v2 + v3 (30 rows). */
    static final int[] CELLS = {2, 1, 1, 0, 5, 0, 1, 1, 4, 1, 1, 2, 0, 7, 4, 0};

    @TempDir
    Path dir;

    static int[][] rows() {
        List<int[]> out = new ArrayList<>();
        for (int c = 0; c < 16; c++) {
            for (int k = 0; k < CELLS[c]; k++) {
                out.add(new int[] {c >> 3 & 1, c >> 2 & 1, c >> 1 & 1, c & 1});
            }
        }
        return out.toArray(int[][]::new);
    }

    /** BDeu log marginal likelihood of child v with parent bitmask pa, ESS 1, binary variables. */
    static double bdeu(int[][] rows, int v, int pa) {
        int q = 1 << Integer.bitCount(pa);
        long[][] n = new long[q][2];
        for (int[] r : rows) {
            int j = 0;
            for (int u = 0; u < 4; u++) {
                if ((pa >> u & 1) == 1) {
                    j = 2 * j + r[u];
                }
            }
            n[j][r[v]]++;
        }
        double aij = 1.0 / q;
        double aijk = aij / 2;
        double s = 0;
        for (long[] c : n) {
            s += Gamma.logGamma(aij) - Gamma.logGamma(aij + c[0] + c[1]);
            for (long x : c) {
                s += Gamma.logGamma(aijk + x) - Gamma.logGamma(aijk);
            }
        }
        return s;
    }

    /** The number of orders of 0..3 consistent with the DAG (each parent before its child). */
    static int extensions(int[] pa) {
        int count = 0;
        int[] perm = {0, 1, 2, 3};
        do {
            int seen = 0;
            boolean ok = true;
            for (int v : perm) {
                ok &= (pa[v] & ~seen) == 0;
                seen |= 1 << v;
            }
            count += ok ? 1 : 0;
        } while (next(perm));
        return count;
    }

    static boolean next(int[] a) {
        int i = a.length - 2;
        while (i >= 0 && a[i] >= a[i + 1]) {
            i--;
        }
        if (i < 0) {
            return false;
        }
        int j = a.length - 1;
        while (a[j] <= a[i]) {
            j--;
        }
        int t = a[i];
        a[i] = a[j];
        a[j] = t;
        for (int l = i + 1, r = a.length - 1; l < r; l++, r--) {
            t = a[l];
            a[l] = a[r];
            a[r] = t;
        }
        return true;
    }

    /** P(a → b) for every ordered pair by brute force, "va\0vb" → posterior. */
    static Map<String, Double> brute(boolean orderModular) {
        int[][] rows = rows();
        List<int[]> dags = DagEnumeration.allDags(4);
        assertEquals(543, dags.size());
        double[] logW = new double[dags.size()];
        double max = Double.NEGATIVE_INFINITY;
        for (int g = 0; g < dags.size(); g++) {
            int[] pa = dags.get(g);
            for (int v = 0; v < 4; v++) {
                logW[g] += bdeu(rows, v, pa[v]);
            }
            logW[g] += orderModular ? Math.log(extensions(pa)) : 0;
            max = Math.max(max, logW[g]);
        }
        double total = 0;
        double[][] edge = new double[4][4];
        for (int g = 0; g < dags.size(); g++) {
            double w = Math.exp(logW[g] - max);
            total += w;
            for (int b = 0; b < 4; b++) {
                for (int a = 0; a < 4; a++) {
                    edge[a][b] += (dags.get(g)[b] >> a & 1) * w;
                }
            }
        }
        Map<String, Double> out = new HashMap<>();
        for (int a = 0; a < 4; a++) {
            for (int b = 0; b < 4; b++) {
                if (a != b) {
                    out.put("v" + a + "\u0000v" + b, edge[a][b] / total);
                }
            }
        }
        return out;
    }

    @Test
    void edgesThatCrossHalfBetweenThePriorsAreMarked() throws Exception {
        Path store = dir.resolve("store");
        CliRun.store(store, rows(), new int[] {2, 2, 2, 2}, 3);
        Path json = dir.resolve("r.json");
        CliRun r = CliRun.of("edges", "--store", store.toString(), "--method", "exact", "--dag-prior", "both", "--out", json.toString());
        assertEquals(0, r.status(), r.err());
        EdgeResult res = ResultJson.readEdges(json);
        Map<String, Double> sm = brute(false);
        Map<String, Double> om = brute(true);
        assertEquals("structure-modular", res.dagPrior());
        assertEquals("order-modular", res.priorComparison().dagPrior());
        for (EdgeResult.Edge e : res.edges()) {
            assertEquals(sm.get(e.from() + "\u0000" + e.to()), e.posterior(), 1e-9, e.toString());
        }
        for (EdgeResult.Edge e : res.priorComparison().edges()) {
            assertEquals(om.get(e.from() + "\u0000" + e.to()), e.posterior(), 1e-9, e.toString());
        }
        assertEquals(0.560587234, sm.get("v2\u0000v3"), 1e-9);
        assertEquals(0.408013049, om.get("v2\u0000v3"), 1e-9);
        // every pair whose brute-force posteriors lie on two sides of 0.5, and no other
        List<String> crossing = new ArrayList<>();
        for (String k : sm.keySet()) {
            if (sm.get(k) >= 0.5 != om.get(k) >= 0.5) {
                crossing.add(k.replace('\u0000', '>'));
            }
        }
        List<String> marked = new ArrayList<>();
        for (EdgeResult.PriorFragile f : res.priorComparison().fragile()) {
            assertEquals("edge", f.kind());
            assertEquals(sm.get(f.from() + "\u0000" + f.to()), f.posterior(), 1e-9);
            assertEquals(om.get(f.from() + "\u0000" + f.to()), f.other(), 1e-9);
            marked.add(f.from() + ">" + f.to());
        }
        crossing.sort(null);
        marked.sort(null);
        assertEquals(crossing, marked);
        assertTrue(marked.contains("v2>v3"), marked.toString());

        CliRun text = CliRun.of("edges", "--store", store.toString(), "--method", "exact", "--dag-prior", "both");
        assertEquals(0, text.status(), text.err());
        assertTrue(text.out().startsWith("Edge posteriors (exact; DAG prior structure-modular, compared with order-modular; "),
                text.out());
        assertTrue(text.out().contains("fragile between the DAG priors: v2 -> v3 0.56 under the structure-modular DAG prior, "
                + "0.41 under the order-modular\n"), text.out());

        Path html = dir.resolve("r.html");
        CliRun rep = CliRun.of("report", "--result", json.toString(), "--out", html.toString());
        assertEquals(0, rep.status(), rep.err());
        String page = Files.readString(html);
        String summary = page.substring(page.indexOf("<h2 id=\"summary\">"), page.indexOf("<details><summary>How these figures"));
        assertTrue(page.contains("<th>DAG prior</th><td>structure-modular; the order-modular posteriors computed beside it for "
                + "comparison</td>"), summary);
        assertTrue(summary.contains("<li><b>Fragile between the DAG priors:</b> ") && summary.contains(
                "v2 \u2192 v3 0.56 under the structure-modular DAG prior, 0.41 under the order-modular"), summary);
    }

    @Test
    void bothAppliesToEdgesOverUnknownOrdersOnly() {
        Path store = dir.resolve("store");
        CliRun.store(store, rows(), new int[] {2, 2, 2, 2}, 3);
        CliRun e = CliRun.of("effect", "--store", store.toString(), "--method", "exact", "--dag-prior", "both",
                "--do", "v2=s1", "--target", "v3=s1");
        assertEquals(2, e.status());
        assertEquals("effect: --dag-prior both applies to edges only (it compares the edge posteriors under the two priors): "
                + "give structure-modular or order-modular", e.errLine());
    }
}
