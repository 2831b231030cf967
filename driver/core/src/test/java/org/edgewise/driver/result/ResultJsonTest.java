package org.edgewise.driver.result;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.edgewise.driver.UserError;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The edges result's format version: written first by ResultJson, checked by readEdges (report, compare). */
class ResultJsonTest {
    static EdgeResult small() {
        return new EdgeResult("order", List.of("a", "b"), -3.5, -3.5, null, List.of("a", "b"), null, null,
                List.of(new EdgeResult.Edge("a", "b", 0.75), new EdgeResult.Edge("b", "a", 0.0)),
                null, null, null, null, null, null, null);
    }

    @Test
    void writtenWithTheVersionFirstAndReadBack(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("r.json");
        ResultJson.write(f, small());
        String text = Files.readString(f);
        assertTrue(text.startsWith("{\n  \"formatVersion\" : 2,\n  \"kind\" : \"edges\",\n  \"method\" : \"order\""), text);
        assertEquals(small(), ResultJson.readEdges(f));
    }

    @Test
    void anotherVersionOrNoneIsRefusedNamingTheFile(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("r.json");
        ResultJson.write(f, small());
        String text = Files.readString(f);
        Files.writeString(f, text.replace("\"formatVersion\" : 2", "\"formatVersion\" : 3"));
        UserError e = assertThrows(UserError.class, () -> ResultJson.readEdges(f));
        assertEquals("result file " + f + " has format version 3; this Edgewise reads edges results of format version 2; "
                + "re-run the analysis that wrote it with this Edgewise", e.getMessage());
        Files.writeString(f, text.replace("\"formatVersion\" : 2,", ""));
        e = assertThrows(UserError.class, () -> ResultJson.readEdges(f));
        assertEquals("result file " + f + " has no format version; this Edgewise reads edges results of format version 2; "
                + "re-run the analysis that wrote it with this Edgewise", e.getMessage());
    }

    /** Version 1 called the MCMC effective sample size {@code ess}: such a result is refused in one line, not misread. */
    @Test
    void aVersionOneResultWithTheOldNamesIsRefusedWithAHintToRerun(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("old.json");
        Files.writeString(f, """
                {
                  "formatVersion" : 1,
                  "method" : "mcmc",
                  "variables" : [ "a", "b" ],
                  "edges" : [ { "from" : "a", "to" : "b", "posterior" : 0.5, "mcse" : 0.01, "rhat" : 1.001 } ],
                  "diagnostics" : { "chains" : 4, "steps" : 1000, "burnIn" : 1000, "seed" : 1, "acceptance" : 0.3,
                    "rhat" : 1.001, "ess" : 812.0, "converged" : true, "traceThin" : 1, "essTarget" : 400.0,
                    "essTail" : 640.0, "worst" : [ { "quantity" : "edge a -> b", "rhat" : 1.001, "ess" : 812.0 } ] }
                }
                """);
        UserError e = assertThrows(UserError.class, () -> ResultJson.readEdges(f));
        assertEquals("result file " + f + " has format version 1; this Edgewise reads edges results of format version 2; "
                + "re-run the analysis that wrote it with this Edgewise", e.getMessage());
    }
}
