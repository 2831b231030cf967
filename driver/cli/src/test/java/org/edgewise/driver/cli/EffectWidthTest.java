package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * {@code effect} answered DAG by DAG refuses a DAG whose elimination would build a table above
 * {@code --max-hidden-states}, in one line naming the DAG, the table's size and what to change, before
 * anything is computed or written; the same question under a limit that fits answers, labelled sampled.
 */
class EffectWidthTest {
    @TempDir
    Path dir;

    @Test
    void aTooWideDagIsRefusedWithItsTableAndAFittingLimitAnswers() throws Exception {
        Path store = dir.resolve("store");
        CliRun.store(store, 5L, 2);
        Path sample = dir.resolve("sample");
        OptionWalkTest.ok(CliRun.of("sample", "--store", store.toString(), "--out", sample.toString(), "--order",
                StoreFixture.ORDER, "--dags", "50"));
        Path out = dir.resolve("effect.json");
        // the order v3, v0, v4, v1, v2: v2's hidden ancestors include v1 (3 states) and more
        CliRun r = CliRun.of("effect", "--store", store.toString(), "--sample", sample.toString(), "--do", "v0=s1", "--target",
                "v2=s0", "--max-hidden-states", "2", "--out", out.toString());
        assertEquals(EdgewiseCli.USER_ERROR, r.status(), r.err());
        assertTrue(r.errLine().matches("effect: sampled DAG \\d+: summing out the hidden ancestors of the target in a sampled "
                + "network by elimination would build a table of \\d+ entries \\(limit 2\\); observe more of them \\(evidence on "
                + "an ancestor\\), or raise --max-hidden-states"), r.errLine());
        assertTrue(!Files.exists(out));
        CliRun ok = CliRun.of("effect", "--store", store.toString(), "--sample", sample.toString(), "--do", "v0=s1", "--target",
                "v2=s0", "--format", "json", "--effect-draws", "100");
        OptionWalkTest.ok(ok);
        assertEquals("sampled", StoreFixture.JSON.readTree(ok.out()).get("estimate").asText());
    }
}
