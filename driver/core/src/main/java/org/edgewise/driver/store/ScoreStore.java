package org.edgewise.driver.store;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;

/**
 * A score store in memory: its manifest, every family's counts, and the stored log score of each
 * family (under the manifest's score kind and ESS). Families are grouped by child in increasing
 * child order; {@link #familiesOf(int)} gives the index range of one child.
 */
public final class ScoreStore {
    private final Manifest manifest;
    private final List<FamilyCounts> families;
    private final double[] logScores;
    private final int[] childStart;

    public ScoreStore(Manifest manifest, List<FamilyCounts> families, double[] logScores) {
        if (families.size() != logScores.length) {
            throw new IllegalArgumentException(families.size() + " families but " + logScores.length + " scores");
        }
        this.manifest = manifest;
        this.families = Collections.unmodifiableList(new ArrayList<>(families));
        this.logScores = logScores.clone();
        int n = manifest.variables().size();
        this.childStart = new int[n + 1];
        int prev = -1;
        for (int f = 0; f < families.size(); f++) {
            int c = families.get(f).child();
            if (c < prev || c < 0 || c >= n) {
                throw new IllegalArgumentException("families must be grouped by child in increasing order");
            }
            prev = c;
        }
        int f = 0;
        for (int c = 0; c <= n; c++) {
            while (f < families.size() && families.get(f).child() < c) {
                f++;
            }
            childStart[c] = f;
        }
    }

    public Manifest manifest() {
        return manifest;
    }

    public List<Variable> variables() {
        return manifest.variables();
    }

    /** Whether the families' counts were read (false for {@link StoreReader#readScores}: stored scores only). */
    public boolean hasCounts() {
        return families.isEmpty() || families.get(0).hasCounts();
    }

    public int variableCount() {
        return manifest.variables().size();
    }

    public int arity(int variable) {
        return manifest.variables().get(variable).arity();
    }

    public List<FamilyCounts> families() {
        return families;
    }

    public FamilyCounts family(int index) {
        return families.get(index);
    }

    /** Stored log score of family {@code index}. */
    public double logScore(int index) {
        return logScores[index];
    }

    public double[] logScores() {
        return logScores.clone();
    }

    /** First family index of {@code child}. */
    public int firstFamilyOf(int child) {
        return childStart[child];
    }

    /** One past the last family index of {@code child}. */
    public int endFamilyOf(int child) {
        return childStart[child + 1];
    }

    /** Number of parent configurations Π r_u of a parent set (a double: it can exceed int range). */
    public double configurations(int[] parents) {
        double q = 1;
        for (int p : parents) {
            q *= arity(p);
        }
        return q;
    }
}
