package org.edgewise.driver.store;

import com.fasterxml.jackson.annotation.JsonInclude;
import java.util.List;

/**
 * One discrete variable of the store: its column name and its ordered state labels (state index
 * = position in {@code states}). {@code binEdges} holds the interior cut points when the job
 * discretised a numeric column ({@code states.size() - 1} of them), otherwise null.
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record Variable(String name, List<String> states, List<Double> binEdges) {
    public Variable {
        states = List.copyOf(states);
        binEdges = binEdges == null ? null : List.copyOf(binEdges);
    }

    public Variable(String name, List<String> states) {
        this(name, states, null);
    }

    public int arity() {
        return states.size();
    }

    /** Index of a state label, or −1. */
    public int stateIndex(String label) {
        return states.indexOf(label);
    }
}
