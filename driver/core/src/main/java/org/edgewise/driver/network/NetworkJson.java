package org.edgewise.driver.network;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.util.ArrayList;
import java.util.List;

/**
 * Writes a {@link Network} in the network JSON format {@link NetworkReader} reads (docs/report.md):
 * {@code {"edgewiseNetwork": 1, "name", "description", "variables": [{"name", "states", "parents",
 * "cpt"}]}}, one probability row per line. Numbers are written as Java's shortest decimal that reads
 * back to the same double, so a written network reads back equal.
 */
public final class NetworkJson {
    private static final ObjectMapper MAPPER = new ObjectMapper();

    private NetworkJson() {
    }

    /** The network as JSON text, ending with a newline. */
    public static String write(Network net) {
        StringBuilder sb = new StringBuilder();
        sb.append("{\n  \"edgewiseNetwork\": ").append(NetworkReader.VERSION).append(",\n");
        sb.append("  \"name\": ").append(json(net.name())).append(",\n");
        sb.append("  \"description\": ").append(json(net.description())).append(",\n");
        sb.append("  \"variables\": [");
        for (int i = 0; i < net.size(); i++) {
            List<String> parents = new ArrayList<>();
            for (int p : net.parents()[i]) {
                parents.add(net.names().get(p));
            }
            sb.append(i == 0 ? "\n" : ",\n");
            sb.append("    {\n      \"name\": ").append(json(net.names().get(i))).append(",\n");
            sb.append("      \"states\": ").append(json(net.states().get(i))).append(",\n");
            sb.append("      \"parents\": ").append(json(parents)).append(",\n");
            sb.append("      \"cpt\": [");
            int r = net.arity(i);
            int q = net.configurations(i);
            for (int j = 0; j < q; j++) {
                sb.append(j == 0 ? "\n        [" : ",\n        [");
                for (int k = 0; k < r; k++) {
                    sb.append(k == 0 ? "" : ", ").append(net.probability(i, j, k));
                }
                sb.append(']');
            }
            sb.append("\n      ]\n    }");
        }
        sb.append("\n  ]\n}\n");
        return sb.toString();
    }

    private static String json(Object value) {
        try {
            return MAPPER.writeValueAsString(value);
        } catch (JsonProcessingException e) {
            throw new IllegalStateException(e); // strings and lists of strings always serialise
        }
    }
}
