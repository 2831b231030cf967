package org.edgewise.driver.report;

/**
 * How a reader of a result without essential-graph features gets them, in the words of the front
 * end that made it: the report names it where directions were not assessed. The CLI passes its
 * command and option; {@link #API} names the Java API's setting.
 *
 * @param command what to run (the CLI: {@code edges})
 * @param option  the setting that asks for essential-graph features (the CLI: its option)
 */
public record AssessHint(String command, String option) {
    /** The Java API: the unknown-order analysis with {@code essentialGraph} set in its settings. */
    public static final AssessHint API = new AssessHint("UnknownOrderAveraging", "essentialGraph = true");

    /** "command with option" in HTML, each as code. */
    String html() {
        return "<code>" + Html.esc(command) + "</code> with <code>" + Html.esc(option) + "</code>";
    }

    /** "command with option" as plain text. */
    String text() {
        return command + " with " + option;
    }
}
