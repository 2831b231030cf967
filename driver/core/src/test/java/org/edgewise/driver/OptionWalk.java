package org.edgewise.driver;

import static org.junit.jupiter.api.Assertions.fail;

import java.util.List;

/**
 * What the option walks of the command-line tests share (edgewise's commands and the tally job):
 * the refusal a tried value may meet and how the value to try is picked.
 */
public final class OptionWalk {
    private OptionWalk() {
    }

    /** A command refused: {@code problem} is null when the refusal is a proper one-line user error. */
    public static final class Refused extends Exception {
        public final String problem;

        public Refused(String problem) {
            super(problem, null, false, false);
            this.problem = problem;
        }
    }

    /** One run of a command with an option set to a value: its masked output, or a {@link Refused}. */
    @FunctionalInterface
    public interface Attempt {
        String output() throws Exception;
    }

    /**
     * Runs {@code attempt} (the option and value {@code what}) and adds to {@code problems} what is
     * wrong with it: an improper refusal, an output the same as {@code before} when no {@code reason}
     * (an UNCHANGED entry) says why, or one that changes although a reason is given (a stale entry).
     */
    public static void judge(List<String> problems, String what, String before, String reason, Attempt attempt)
            throws Exception {
        String after;
        try {
            after = attempt.output();
        } catch (Refused r) {
            if (r.problem != null) {
                problems.add(what + ": " + r.problem);
            }
            return;
        }
        if (after.equals(before) && reason == null) {
            problems.add(what + ": accepted and changes nothing");
        } else if (!after.equals(before) && reason != null) {
            problems.add(what + ": changes the output although UNCHANGED says '" + reason + "' (stale entry)");
        }
    }

    /** Fails listing {@code problems}, when there are any. */
    public static void failOn(List<String> problems) {
        if (!problems.isEmpty()) {
            fail(problems.size() + " option(s) that neither act nor are refused:\n  " + String.join("\n  ", problems));
        }
    }

    /** The first candidate value that differs from the baseline's own value of {@code name}. */
    public static String pick(List<String> args, String name, List<String> values) {
        int at = args.indexOf(name);
        for (String v : values) {
            if (v == null || at < 0 || !args.get(at + 1).equals(v)) {
                return v;
            }
        }
        throw new AssertionError(name + ": every value to try is the baseline's own");
    }
}
