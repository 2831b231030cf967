package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import org.junit.jupiter.api.Test;

/**
 * One meaning of {@code --tiers} in every query: {@code ;} separates tiers within one value and a
 * repeated option appends tiers, so {@code --tiers "a,b;c"} and {@code --tiers a,b --tiers c} give the
 * same constraints (the same result) in {@code edges} and {@code effect}; the refusals word for word.
 */
class TiersOptionTest extends StoreFixture {
    @Override
    long seed() {
        return 181_818L;
    }

    private CliRun run(String command, String... extra) {
        String[] base = {command, "--store", store.toString()};
        String[] all = new String[base.length + extra.length];
        System.arraycopy(base, 0, all, 0, base.length);
        System.arraycopy(extra, 0, all, base.length, extra.length);
        return CliRun.of(all);
    }

    /** The result without what differs between two runs of the same request (timings). */
    private static JsonNode stable(CliRun r) throws Exception {
        assertEquals(0, r.status(), r.err());
        JsonNode j = JSON.readTree(r.out());
        strip(j);
        return j;
    }

    private static void strip(JsonNode j) {
        if (j instanceof ObjectNode o) {
            o.remove(java.util.List.of("seconds", "setupSeconds", "samplingSeconds", "cpuSeconds", "elapsedSeconds"));
        }
        j.forEach(TiersOptionTest::strip);
    }

    @Test
    void edgesReadsBothSpellingsAlike() throws Exception {
        String[] exact = {"--method", "exact", "--dag-prior", "order-modular", "--format", "json"};
        JsonNode semicolons = stable(run("edges", concat(exact, "--tiers", "v0,v1;v2;v3,v4")));
        JsonNode repeated = stable(run("edges", concat(exact, "--tiers", "v0,v1", "--tiers", "v2", "--tiers", "v3,v4")));
        JsonNode mixed = stable(run("edges", concat(exact, "--tiers", "v0,v1;v2", "--tiers", "v3,v4")));
        assertEquals(semicolons, repeated);
        assertEquals(semicolons, mixed);
        assertNotEquals(stable(run("edges", exact)), semicolons); // the tiers count
    }

    @Test
    void effectReadsBothSpellingsAlike() throws Exception {
        String[] q = {"--method", "exact", "--dag-prior", "order-modular", "--do", "v0=s1", "--target", "v2=s0",
                "--format", "json", "--effect-draws", "50"};
        JsonNode semicolons = stable(run("effect", concat(q, "--tiers", "v0;v1;v2")));
        JsonNode repeated = stable(run("effect", concat(q, "--tiers", "v0", "--tiers", "v1", "--tiers", "v2")));
        assertEquals(semicolons, repeated);
    }

    @Test
    void refusalsWordForWord() {
        String[] exact = {"--method", "exact"};
        assertEquals("edges: --tiers: unknown variable 'a' (variables: v0, v1, v2, v3, v4)",
                run("edges", concat(exact, "--tiers", "a;b;c")).errLine());
        assertEquals("effect: --tiers: unknown variable 'a' (variables: v0, v1, v2, v3, v4)",
                run("effect", concat(exact, "--do", "v0=s1", "--target", "v2=s0", "--tiers", "a;b;c")).errLine());
        assertEquals("edges: --tiers: variable 'v1' is in tiers 1 and 2",
                run("edges", concat(exact, "--tiers", "v0,v1", "--tiers", "v1")).errLine());
        assertEquals("edges: --tiers: empty variable name in 'v0;;v1'",
                run("edges", concat(exact, "--tiers", "v0;;v1")).errLine());
    }

    private static String[] concat(String[] a, String... b) {
        String[] out = java.util.Arrays.copyOf(a, a.length + b.length);
        System.arraycopy(b, 0, out, a.length, b.length);
        return out;
    }
}
