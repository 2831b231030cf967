package org.edgewise.driver;

import java.util.Locale;

/**
 * Argument checks of values a user chooses (an ESS, a count of chains, a tail mass), in one place
 * with their message templates, as Commons Statistics keeps its argument checks. Each check throws
 * a {@link UserError} whose message starts with {@code what}: the caller names the value the way
 * its user knows it (the CLI passes its option, {@code --ess}; a library caller passes {@code ESS}).
 * Values a program computes are not checked here: a wrong one is a bug and throws
 * {@link IllegalArgumentException}.
 */
public final class Checks {
    /** Template of {@link #ess}: {@code what}, the value. */
    static final String NOT_POSITIVE = "%s must be positive, got %s";
    /** Template of {@link #ess} for an infinite value. */
    static final String NOT_FINITE = "%s must be finite, got %s";
    /** Template of {@link #ess} for NaN. */
    static final String NOT_A_NUMBER = "%s must be a number, got NaN";
    /** Template of {@link #ess} outside {@link #ESS_MIN} … {@link #ESS_MAX}. */
    static final String ESS_RANGE = "%s must be between 1e-9 and 1e15, got %s (beyond these the prior alone"
            + " decides every score, or the data alone)";
    /** Smallest ESS accepted: α = ESS/(r·q) stays far above the double range's end even for q near 1e30. */
    public static final double ESS_MIN = 1e-9;
    /** Largest ESS accepted: a·r and a + N stay exact enough, and the scores are by then flat in the data. */
    public static final double ESS_MAX = 1e15;
    /** Template of {@link #atLeast}: {@code what}, the minimum, the value. */
    static final String TOO_SMALL = "%s must be at least %d, got %d";
    /** Template of {@link #notNegative}: {@code what}, the value. */
    static final String NEGATIVE = "%s must not be negative, got %d";
    /** Template of {@link #atMost}: {@code what}, the maximum, the value, why. */
    static final String TOO_LARGE = "%s must be at most %d, got %d (%s)";
    /**
     * Most (DAG, parameter) draws of an effect: every draw's value is kept for every question (with
     * the sort for its interval, about 20 bytes each), so 10^6 stay within a small heap; the Monte
     * Carlo error of an interval is by then far below the posterior's own spread.
     */
    public static final long MAX_EFFECT_DRAWS = 1_000_000;
    /** Most DAGs drawn for features: every DAG is kept (a parent mask per variable, up to ~150 bytes). */
    public static final long MAX_DAG_SAMPLES = 1_000_000;

    /** Template of {@link #zeroOrMore}: {@code what}, the value. */
    static final String BELOW_ZERO = "%s must be 0 or more, got %d";
    /** Template of {@link #unitInterval}: {@code what}, the value. */
    static final String NOT_IN_UNIT_INTERVAL = "%s must be in [0, 1), got %s";

    /** Template of {@link #between}: {@code what}, the least, the largest, the value. */
    static final String NOT_BETWEEN = "%s must be between %s and %s, got %s";

    /** Template of {@link #notApplicable}: the option, the situation, why. */
    static final String NOT_APPLICABLE = "%s does not apply %s: %s";

    /** Template of {@link #path}: {@code what}, the text (escaped), why. */
    static final String NOT_A_PATH = "%s: '%s' is not a file name this system can use: %s";

    private Checks() {
    }

    /**
     * A file name a user gave, as a {@link java.nio.file.Path}: one holding a NUL character or a
     * character the platform's file-name encoding ({@code sun.jnu.encoding}) cannot represent (an
     * unpaired surrogate, or e.g. {@code é} under a C/POSIX locale) is refused naming {@code what},
     * instead of the JVM's {@code InvalidPathException}. The text is shown with such characters
     * escaped as a backslash, u and four hex digits.
     */
    public static java.nio.file.Path path(String text, String what) {
        try {
            return java.nio.file.Path.of(text);
        } catch (java.nio.file.InvalidPathException e) {
            String why = text.indexOf('\0') >= 0 ? "it holds a NUL character"
                    : "it holds a character the platform encoding " + System.getProperty("sun.jnu.encoding",
                    java.nio.charset.Charset.defaultCharset().name()) + " cannot represent";
            throw new UserError(String.format(Locale.ROOT, NOT_A_PATH, what, printable(text), why));
        }
    }

    /** {@code text} with control characters and unpaired surrogates escaped as a backslash, u and four hex digits. */
    static String printable(String text) {
        StringBuilder sb = new StringBuilder();
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            boolean pair = Character.isHighSurrogate(c) && i + 1 < text.length() && Character.isLowSurrogate(text.charAt(i + 1));
            if (pair) {
                sb.append(c).append(text.charAt(++i));
            } else if (c < 0x20 || c == 0x7f || Character.isSurrogate(c)) {
                sb.append(String.format(Locale.ROOT, "\\u%04X", (int) c));
            } else {
                sb.append(c);
            }
        }
        return sb.toString();
    }

    /**
     * An equivalent sample size (BDeu's ESS): a number in [{@link #ESS_MIN}, {@link #ESS_MAX}]. One
     * check for every program that takes an ESS (the job's {@code tally}, every driver command,
     * {@code FamilyScore}), so {@code NaN}, 0, ∞ and absurd values are refused alike everywhere.
     */
    public static double ess(double ess, String what) {
        if (Double.isNaN(ess)) {
            throw new UserError(String.format(Locale.ROOT, NOT_A_NUMBER, what));
        }
        if (!(ess > 0)) {
            throw new UserError(String.format(Locale.ROOT, NOT_POSITIVE, what, ess));
        }
        if (Double.isInfinite(ess)) {
            throw new UserError(String.format(Locale.ROOT, NOT_FINITE, what, ess));
        }
        if (ess < ESS_MIN || ess > ESS_MAX) {
            throw new UserError(String.format(Locale.ROOT, ESS_RANGE, what, ess));
        }
        return ess;
    }

    /** {@code value ≥ min}. */
    public static long atLeast(long value, long min, String what) {
        if (value < min) {
            throw new UserError(String.format(Locale.ROOT, TOO_SMALL, what, min, value));
        }
        return value;
    }

    /** {@code value ≤ max}, with {@code why} the bound exists (e.g. "each draw is kept in memory"). */
    public static long atMost(long value, long max, String what, String why) {
        if (value > max) {
            throw new UserError(String.format(Locale.ROOT, TOO_LARGE, what, max, value, why));
        }
        return value;
    }

    /** {@code value ≥ 0}, worded "must not be negative". */
    public static long notNegative(long value, String what) {
        if (value < 0) {
            throw new UserError(String.format(Locale.ROOT, NEGATIVE, what, value));
        }
        return value;
    }

    /** {@code value ≥ 0}, worded "must be 0 or more". */
    public static long zeroOrMore(long value, String what) {
        if (value < 0) {
            throw new UserError(String.format(Locale.ROOT, BELOW_ZERO, what, value));
        }
        return value;
    }

    /** {@code 0 ≤ value < 1} (a tail mass, a threshold). */
    public static double unitInterval(double value, String what) {
        if (!(value >= 0 && value < 1)) {
            throw new UserError(String.format(Locale.ROOT, NOT_IN_UNIT_INTERVAL, what, value));
        }
        return value;
    }

    /** {@code lo ≤ value ≤ hi} (a target, a share); NaN is refused too. */
    public static double between(double value, double lo, double hi, String what) {
        if (!(value >= lo && value <= hi)) {
            throw new UserError(String.format(Locale.ROOT, NOT_BETWEEN, what, lo, hi, value));
        }
        return value;
    }

    /**
     * Refuses an option that was given but does not apply (rather than dropping it silently):
     * "{@code what} does not apply {@code situation}: {@code why}", e.g. "--ess does not apply to
     * score k2: …".
     */
    public static void notApplicable(boolean given, String what, String situation, String why) {
        if (given) {
            throw new UserError(String.format(Locale.ROOT, NOT_APPLICABLE, what, situation, why));
        }
    }
}
