package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;

import com.fasterxml.jackson.databind.JsonNode;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/**
 * Every command's JSON result starts with {@code formatVersion} and {@code kind}, stamped in one
 * place ({@code ResultJson}), so a reader can tell what a file holds (issue 18: one name, one meaning).
 */
class ResultKindsTest extends StoreFixture {
    @Override
    long seed() {
        return 18_018L;
    }

    private static List<String> firstTwo(String json) throws Exception {
        JsonNode n = JSON.readTree(json);
        List<String> names = new ArrayList<>();
        n.fieldNames().forEachRemaining(names::add);
        return List.of(names.get(0), names.get(1) + "=" + n.get("kind").asText());
    }

    private void check(String kind, int version, String... args) throws Exception {
        CliRun r = CliRun.of(args);
        assertEquals(0, r.status(), r.err());
        assertEquals(List.of("formatVersion", "kind=" + kind), firstTwo(r.out()), r.out());
        assertEquals(version, JSON.readTree(r.out()).get("formatVersion").asInt());
    }

    @Test
    void everyResultCarriesItsFormatVersionAndKindFirst() throws Exception {
        String s = store.toString();
        check("edges", 2, "edges", "--store", s, "--order", ORDER, "--format", "json");
        check("prediction", 2, "predict", "--store", s, "--order", ORDER, "--case", "v0=s1", "--format", "json");
        check("effect", 1, "effect", "--store", s, "--order", ORDER, "--do", "v0=s1", "--target", "v2=s0", "--format", "json");
        check("scores", 1, "scores", "--store", s);
        java.nio.file.Path cases = java.nio.file.Files.writeString(dir.resolve("cases.csv"), "v0,v2\ns0,s1\n");
        check("target-prediction", 1, "predict", "--store", s, "--order", ORDER, "--cases", cases.toString(), "--target", "v2",
                "--format", "json");
    }
}
