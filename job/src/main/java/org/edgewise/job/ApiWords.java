package org.edgewise.job;

import java.util.regex.Matcher;
import java.util.regex.Pattern;

/**
 * The job's refusals name command-line options ({@code --columns: no column 'zz' …}, {@code choose
 * --missing drop or --missing state}); a caller of the Java API ({@link Tally}) set the same things
 * with builder methods, so its messages name those instead ({@code columns: no column 'zz' …},
 * {@code choose missing("drop") or missing("state")}). One mapping, applied to the message of a
 * refusal as it leaves {@link Tally#writeTo}; the command line's words stay as they are.
 */
final class ApiWords {
    private static final Pattern MISSING = Pattern.compile("--missing (error|drop|state|average)\\b");
    private static final Pattern DISCRETIZE = Pattern.compile("--discretize (\\S+?)=(\\d+)");
    private static final Pattern EDGE = Pattern.compile("--(forbid|require) (\\S+?->\\S+?)(?=[:,;]?(\\s|$))");
    private static final Pattern NAMED = Pattern.compile("--(exclude|discretize|weight) ([^\\s:,;]+)(?=[:,;]?(\\s|$))");
    private static final Pattern CANDIDATES = Pattern.compile("--candidates K\\b");
    private static final Pattern OPTION = Pattern.compile("--([a-z]+(?:-[a-z]+)*)");

    private ApiWords() {
    }

    /** The message with every option named as the builder method that sets it. */
    static String of(String message) {
        String m = message.replace("--columns/--exclude", "columns/exclude");
        m = MISSING.matcher(m).replaceAll("missing(\"$1\")");
        m = DISCRETIZE.matcher(m).replaceAll(r -> "discretize(\"" + Matcher.quoteReplacement(r.group(1)) + "\", "
                + r.group(2) + ")");
        m = EDGE.matcher(m).replaceAll(r -> Matcher.quoteReplacement(r.group(1) + "(\"" + r.group(2) + "\")"));
        m = NAMED.matcher(m).replaceAll(r -> Matcher.quoteReplacement(r.group(1) + "(\"" + r.group(2) + "\""
                + (r.group(1).equals("discretize") ? ", k)" : ")")));
        m = CANDIDATES.matcher(m).replaceAll("candidates(K)");
        return OPTION.matcher(m).replaceAll(r -> method(r.group(1)));
    }

    /** {@code max-parents} → {@code maxParents}; {@code tiers} → {@code tier} (one call per tier). */
    private static String method(String option) {
        if (option.equals("tiers")) {
            return "tier";
        }
        StringBuilder sb = new StringBuilder();
        boolean up = false;
        for (char c : option.toCharArray()) {
            if (c == '-') {
                up = true;
            } else {
                sb.append(up ? Character.toUpperCase(c) : c);
                up = false;
            }
        }
        return sb.toString();
    }
}
