package org.edgewise.driver.network;

import org.edgewise.driver.ProjectFiles;
import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;

import java.nio.file.Files;
import java.nio.file.Path;
import org.edgewise.driver.UserError;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The network reader accepts the demo network and refuses bad ones with a message naming the variable and row. */
class NetworkReaderTest {
    @TempDir
    Path dir;

    static final String HEAD = "{\"edgewiseNetwork\": 1, \"variables\": [";

    static String net(String variables) {
        return HEAD + variables + "]}";
    }

    static final String A = "{\"name\":\"a\",\"states\":[\"0\",\"1\"],\"cpt\":[[0.3,0.7]]}";

    private static String refuse(String json) {
        return assertThrows(UserError.class, () -> NetworkReader.parse("t.json", json)).getMessage();
    }

    @Test
    void readsTheDemoNetwork() {
        Network n = NetworkReader.read(ProjectFiles.path("sample-data", "fleet-network.json"));
        assertEquals(13, n.size());
        assertEquals(14, n.edges().size(), "the 14 edges listed in sample-data/README.md");
        int exc = n.indexOf("temp_excursion");
        assertArrayEquals(new int[] {n.indexOf("door_openings"), n.indexOf("setpoint_drift")}, n.parents()[exc]);
        // mixed radix, first parent most significant: (door_openings=many, setpoint_drift=small) is row 1*3+1 = 4
        assertEquals(0.43, n.probability(exc, 4, 1), 0);
        // the file lists parents before children (scripts/demo uses the CSV header as an order)
        assertArrayEquals(java.util.stream.IntStream.range(0, 13).toArray(), n.topoOrder());
        // topological order: every parent before its child
        int[] pos = new int[n.size()];
        for (int i = 0; i < n.size(); i++) {
            pos[n.topoOrder()[i]] = i;
        }
        for (int c = 0; c < n.size(); c++) {
            for (int p : n.parents()[c]) {
                assertEquals(true, pos[p] < pos[c], n.names().get(p) + " before " + n.names().get(c));
            }
        }
    }

    /** The example in docs/report.md parses and means what the text says about its rows. */
    @Test
    void documentedExampleParses() throws Exception {
        String doc = Files.readString(ProjectFiles.path("docs", "report.md"));
        int start = doc.indexOf("```json\n") + 8;
        Network n = NetworkReader.parse("docs/report.md", doc.substring(start, doc.indexOf("```", start)));
        int wet = n.indexOf("wet");
        assertEquals(0.9, n.probability(wet, 1, 1), 0); // rain = no, sprinkler = on
        assertEquals(0.8, n.probability(wet, 2, 1), 0); // rain = yes, sprinkler = off
    }

    @Test
    void refusesRowsThatDoNotSumToOne() {
        String b = "{\"name\":\"b\",\"states\":[\"x\",\"y\"],\"parents\":[\"a\"],\"cpt\":[[0.5,0.5],[0.6,0.5]]}";
        assertEquals("network t.json: variable 'b': cpt row 2 (a=1) sums to 1.1, not 1", refuse(net(A + "," + b)));
        // within 1e-9 is accepted (the tolerance is documented in docs/report.md)
        String ok = "{\"name\":\"b\",\"states\":[\"x\",\"y\"],\"parents\":[\"a\"],\"cpt\":[[0.5,0.5],[0.6,0.4000000000001]]}";
        assertEquals(2, NetworkReader.parse("t.json", net(A + "," + ok)).size());
    }

    /**
     * Issue 23 item 14: names and states a table could not give back as written (the readers trim
     * blank space off every field and take an empty field for a missing value; the round trip through
     * simulate and tally is job/SimulateRoundTripTest) are refused at read, naming them.
     */
    @Test
    void refusesStatesATableCannotReadBack() {
        assertEquals("network t.json: variable 'a' state #1 is empty, which a table's reader takes for a missing value, "
                + "not a state; give it a name", refuse(net("{\"name\":\"a\",\"states\":[\"\",\"1\"],\"cpt\":[[0.3,0.7]]}")));
        assertEquals("network t.json: variable 'a' state #2 is blank, which a table's reader takes for a missing value, "
                + "not a state; give it a name", refuse(net("{\"name\":\"a\",\"states\":[\"0\",\"  \"],\"cpt\":[[0.3,0.7]]}")));
        assertEquals("network t.json: variable 'a' state ' 1 ' begins or ends with blank space, which a table's reader trims "
                + "off every field (it would read back as '1'); write it without",
                refuse(net("{\"name\":\"a\",\"states\":[\"0\",\" 1 \"],\"cpt\":[[0.3,0.7]]}")));
        assertEquals("network t.json: variable #1 'a\t' begins or ends with blank space, which a table's reader trims off a "
                + "column name (it would read back as 'a'); write it without",
                refuse(net("{\"name\":\"a\\t\",\"states\":[\"0\",\"1\"],\"cpt\":[[0.3,0.7]]}")));
        // blank space inside a state is kept by every reader: accepted
        assertEquals(1, NetworkReader.parse("t.json", net("{\"name\":\"a\",\"states\":[\"x y\",\"1\"],\"cpt\":[[0.3,0.7]]}")).size());
    }

    @Test
    void refusesCycles() {
        String x = "{\"name\":\"x\",\"states\":[\"0\",\"1\"],\"parents\":[\"z\"],\"cpt\":[[0.5,0.5],[0.5,0.5]]}";
        String y = "{\"name\":\"y\",\"states\":[\"0\",\"1\"],\"parents\":[\"x\"],\"cpt\":[[0.5,0.5],[0.5,0.5]]}";
        String z = "{\"name\":\"z\",\"states\":[\"0\",\"1\"],\"parents\":[\"y\"],\"cpt\":[[0.5,0.5],[0.5,0.5]]}";
        assertEquals("network t.json: the graph has a cycle: x -> y -> z -> x", refuse(net(A + "," + x + "," + y + "," + z)));
    }

    @Test
    void refusesUnknownNamesAndWrongShapes() {
        assertEquals("network t.json: variable 'b' has unknown parent 'q'",
                refuse(net(A + ",{\"name\":\"b\",\"states\":[\"x\",\"y\"],\"parents\":[\"q\"],\"cpt\":[[1,0]]}")));
        assertEquals("network t.json: variable 'b': cpt has 1 rows; 2 parent configurations need one row each",
                refuse(net(A + ",{\"name\":\"b\",\"states\":[\"x\",\"y\"],\"parents\":[\"a\"],\"cpt\":[[1,0]]}")));
        assertEquals("network t.json: variable 'b': cpt row 1 (a=0) has 3 entries; the variable has 2 states",
                refuse(net(A + ",{\"name\":\"b\",\"states\":[\"x\",\"y\"],\"parents\":[\"a\"],\"cpt\":[[0.2,0.3,0.5],[1,0]]}")));
        assertEquals("network t.json: variable 'b': cpt row 2 (a=1) entry 1 is -0.5, not a probability",
                refuse(net(A + ",{\"name\":\"b\",\"states\":[\"x\",\"y\"],\"parents\":[\"a\"],\"cpt\":[[1,0],[-0.5,1.5]]}")));
        assertEquals("network t.json: variable 'a' is defined twice", refuse(net(A + "," + A)));
        assertEquals("network t.json: variable 'a' lists itself as a parent",
                refuse(net("{\"name\":\"a\",\"states\":[\"0\",\"1\"],\"parents\":[\"a\"],\"cpt\":[[1,0],[0,1]]}")));
        assertEquals("network t.json: variable 'a' needs at least two states, has 1",
                refuse(net("{\"name\":\"a\",\"states\":[\"0\"],\"cpt\":[[1]]}")));
        assertEquals("network t.json: not an Edgewise network (no \"edgewiseNetwork\": 1)", refuse("{\"variables\": []}"));
    }

    @Test
    void namesTheLineOfBrokenJson() throws Exception {
        Path f = dir.resolve("bad.json");
        Files.writeString(f, "{\n  \"edgewiseNetwork\": 1,\n  \"variables\": [ oops ]\n}\n");
        UserError e = assertThrows(UserError.class, () -> NetworkReader.read(f));
        // Jackson reports where it stopped reading the bad token "oops" (line 3, just past it)
        assertEquals("network file " + f + " is not valid JSON (line 3, column 23)", e.getMessage());
        assertEquals("network file " + dir.resolve("none.json") + " does not exist",
                assertThrows(UserError.class, () -> NetworkReader.read(dir.resolve("none.json"))).getMessage());
    }
}
