package org.edgewise.job;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.edgewise.job.plan.Constraints;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;

/**
 * {@code tally --tiers} means what it means in the queries: {@code ;} separates tiers within one
 * value, a repeated option appends tiers; both spellings and the Java API's {@code tier(…)} calls give
 * the same tiers and the same candidate parents (no Spark needed).
 */
class TiersOptionTest {
    private static final List<String> VARS = List.of("a", "b", "c", "d", "e");

    private static TallyOptions options(String... tiers) {
        TallyMain m = new TallyMain(null);
        String[] base = {"--input", "in.csv", "--out", "store"};
        String[] all = java.util.Arrays.copyOf(base, base.length + tiers.length);
        System.arraycopy(tiers, 0, all, base.length, tiers.length);
        new CommandLine(m).parseArgs(all);
        return m.options();
    }

    @Test
    void bothSpellingsGiveTheSameConstraints() {
        TallyOptions semicolons = options("--tiers", "a,b;c,d,e");
        TallyOptions repeated = options("--tiers", "a,b", "--tiers", "c,d,e");
        assertEquals(List.of(List.of("a", "b"), List.of("c", "d", "e")), semicolons.tiers());
        assertEquals(semicolons.tiers(), repeated.tiers());
        int[][] one = Constraints.resolve(VARS, List.of(), List.of(), semicolons.tiers(), 2).candidates();
        int[][] two = Constraints.resolve(VARS, List.of(), List.of(), repeated.tiers(), 2).candidates();
        int[][] api = Constraints.resolve(VARS, List.of(), List.of(), List.of(List.of("a", "b"), List.of("c", "d", "e")), 2)
                .candidates();
        for (int i = 0; i < VARS.size(); i++) {
            assertArrayEquals(one[i], two[i]);
            assertArrayEquals(one[i], api[i]);
        }
        assertArrayEquals(new int[] {1}, one[0]); // a: no parent from the later tier
        assertArrayEquals(new int[] {0, 1, 3, 4}, one[2]);
    }
}
