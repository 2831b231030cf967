package org.edgewise.driver.store;

import java.util.ArrayList;
import java.util.List;

/**
 * The store's order of parent sets: by size, then lexicographically by members (sorted variable
 * indices). The job's plan and the reference tally both enumerate families this way.
 */
public final class ParentSets {
    private ParentSets() {
    }

    /** All {@code size}-subsets of {@code items}, in lexicographic order. */
    public static List<int[]> subsets(int[] items, int size) {
        List<int[]> out = new ArrayList<>();
        build(items, size, 0, new int[size], 0, out);
        return out;
    }

    private static void build(int[] items, int size, int from, int[] cur, int depth, List<int[]> out) {
        if (depth == size) {
            out.add(cur.clone());
            return;
        }
        for (int i = from; i <= items.length - (size - depth); i++) {
            cur[depth] = items[i];
            build(items, size, i + 1, cur, depth + 1, out);
        }
    }
}
