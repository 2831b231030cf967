package org.edgewise.driver.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.edgewise.driver.effect.PublicTablesTest;
import org.edgewise.driver.store.ScoreStore;
import org.edgewise.driver.store.StoreWriter;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Issue 21's done-when, end to end through the CLI: on each of the three public tables of R's
 * {@code datasets} package, with and without their natural tiers, {@code effect} states within its
 * first screen (40 rows of 80 columns) the effect's measure with its interval, the raw frequencies
 * labelled as such and the reason for the gap to the observational association; and the summary of
 * {@code report} (an {@code edges} result with the essential graph, and the effect) names the
 * directions the data fix, those the tiers fix and the open ones.
 * <ul>
 * <li>UCBAdmissions (Bickel, Hammel &amp; O'Connell 1975): do(Gender) on Admit; tiers Gender; Dept; Admit.</li>
 * <li>Titanic (Dawson 1995): do(Class) on Survived; tiers Sex, Age; Class; Survived.</li>
 * <li>esoph (Breslow &amp; Day 1980), a case-control sample drawn on status: do(alcgp = 120+ g/day)
 * against 0–39 g/day on status = case, {@code --design case-control --outcome status}; tiers agegp;
 * alcgp, tobgp; status.</li>
 * </ul>
 * The raw frequencies are checked against the counts summed by hand from the typed-in tables
 * (core's {@link PublicTablesTest}); the directions the tiers fix are the drawn pairs that cross two
 * tiers, read off the tiers by hand.
 */
class PublicTablesScreenTest {
    /** One screen: rows of this many columns. */
    static final int COLUMNS = 80;
    static final int ROWS = 40;

    @TempDir
    static Path dir;

    record Run(String screen, String summary) {
    }

    static Run run(String name, ScoreStore s, String tiers, String... effect) throws Exception {
        Path store = dir.resolve(name);
        if (!Files.exists(store)) {
            StoreWriter.write(store, s.manifest(), s.families(), s.logScores(), false);
        }
        String tag = name + (tiers == null ? "-open" : "-tiers");
        Path edges = dir.resolve(tag + "-edges.json");
        Path eff = dir.resolve(tag + "-effect.json");
        Path html = dir.resolve(tag + ".html");
        List<String> e = new ArrayList<>(List.of("edges", "--store", store.toString(), "--method", "exact",
                "--features", "essential-graph", "--out", edges.toString()));
        List<String> f = new ArrayList<>(List.of("effect", "--store", store.toString(), "--method", "exact",
                "--effect-draws", "400", "--out", eff.toString(), "--format", "table"));
        f.addAll(List.of(effect));
        if (tiers != null) {
            e.addAll(List.of("--tiers", tiers));
            f.addAll(List.of("--tiers", tiers));
        }
        CliRun er = CliRun.of(e.toArray(String[]::new));
        assertEquals(0, er.status(), er.err());
        CliRun fr = CliRun.of(f.toArray(String[]::new));
        assertEquals(0, fr.status(), fr.err());
        CliRun rr = CliRun.of("report", "--result", edges.toString(), "--effect", eff.toString(), "--out", html.toString());
        assertEquals(0, rr.status(), rr.err());
        String page = Files.readString(html);
        int a = page.indexOf("<h2 id=\"summary\">");
        int b = page.indexOf("<div class=\"caution\">", a);
        return new Run(fr.out(), page.substring(a, b));
    }

    /** The line of {@code screen} that contains {@code part}, checked to end within the first screen. */
    static String onFirstScreen(String screen, String part) {
        return onFirstScreen(screen, part, false);
    }

    /** As above; with {@code start}, the line that starts with {@code part}. */
    static String onFirstScreen(String screen, String part, boolean start) {
        int rows = 0;
        for (String line : screen.split("\n", -1)) {
            rows += Math.max(1, (line.length() + COLUMNS - 1) / COLUMNS);
            if (start ? line.startsWith(part) : line.contains(part)) {
                assertTrue(rows <= ROWS, "'" + part + "' ends on row " + rows + " of the screen:\n" + screen);
                return line;
            }
        }
        throw new AssertionError("'" + part + "' not on the screen:\n" + screen);
    }

    /** The measure that leads, with its interval, on the first screen. */
    static void leadingMeasure(String screen, String measure) {
        String line = onFirstScreen(screen, measure + " ", true);
        Matcher m = Pattern.compile("^" + measure + " -?\\d+\\.\\d{4}, 95% credible interval \\[-?\\d+\\.\\d{4}, -?\\d+\\.\\d{4}\\]$")
                .matcher(line);
        assertTrue(m.matches(), line);
    }

    static String rawLine(String y, String x, long events, long rows, String x0, long events0, long rows0) {
        return String.format(java.util.Locale.ROOT, "P(%s | %s) = %d/%d = %.4f, P(%s | %s) = %d/%d = %.4f", y, x, events, rows,
                (double) events / rows, y, x0, events0, rows0, (double) events0 / rows0);
    }

    static void why(String screen, String reason) {
        String line = onFirstScreen(screen, "why conditioning and setting differ: ");
        assertTrue(line.contains(reason), line);
    }

    @Test
    void ucbAdmissions() throws Exception {
        String[] q = {"--do", "Gender=Female", "--versus", "Gender=Male", "--target", "Admit=Admitted"};
        // by hand from the table: women admitted / applied, men admitted / applied, over the six departments
        long wa = 0;
        long wn = 0;
        long ma = 0;
        long mn = 0;
        for (int[][] d : PublicTablesTest.UCB) {
            ma += d[0][0];
            mn += d[0][0] + d[0][1];
            wa += d[1][0];
            wn += d[1][0] + d[1][1];
        }
        String raw = rawLine("Admit=Admitted", "Gender=Female", wa, wn, "Gender=Male", ma, mn);
        assertTrue(raw.startsWith("P(Admit=Admitted | Gender=Female) = 557/1835"), raw);
        for (String tiers : new String[] {null, "Gender;Dept;Admit"}) {
            Run r = run("ucb", PublicTablesTest.ucbStore(), tiers, q);
            leadingMeasure(r.screen(), "risk difference");
            assertTrue(onFirstScreen(r.screen(), "raw frequencies from the counts (family Admit <- Gender): ").contains(raw + ", crude odds ratio "),
                    r.screen());
            if (tiers == null) {
                why(r.screen(), "the gap comes mostly from an unknown direction \u2014 the data do not fix the directions between "
                        + "Gender and Admit");
                directions(r.summary(), "none", null, "Dept \u2014 Gender; Dept \u2014 Admit");
                headline(r.summary(), "mostly an unknown direction", "557/1835");
            } else {
                why(r.screen(), "they agree, so the association is the effect");
                directions(r.summary(), "none", "Gender \u2192 Dept; Dept \u2192 Admit", "none");
                headline(r.summary(), "none: setting and conditioning agree", "557/1835");
            }
        }
    }

    @Test
    void titanic() throws Exception {
        String[] q = {"--do", "Class=1st", "--versus", "Class=3rd", "--target", "Survived=Yes"};
        long[] yes = new long[4];
        long[] all = new long[4];
        int[][][][] t = PublicTablesTest.TITANIC;
        for (int s = 0; s < 2; s++) {
            for (int a = 0; a < 2; a++) {
                for (int x = 0; x < 2; x++) {
                    for (int c = 0; c < 4; c++) {
                        yes[c] += s == 1 ? t[s][a][x][c] : 0;
                        all[c] += t[s][a][x][c];
                    }
                }
            }
        }
        String raw = rawLine("Survived=Yes", "Class=1st", yes[0], all[0], "Class=3rd", yes[2], all[2]);
        assertTrue(raw.startsWith("P(Survived=Yes | Class=1st) = 203/325"), raw);
        for (String tiers : new String[] {null, "Sex,Age;Class;Survived"}) {
            Run r = run("titanic", PublicTablesTest.titanicStore(), tiers, q);
            leadingMeasure(r.screen(), "risk difference");
            assertTrue(onFirstScreen(r.screen(), "raw frequencies from the counts (family Survived <- Class): ").contains(raw + ", crude odds ratio "),
                    r.screen());
            if (tiers == null) {
                why(r.screen(), "the gap comes mostly from an unknown direction");
                directions(r.summary(), "none", null, "Class \u2014 Sex; Class \u2014 Age; Class \u2014 Survived; "
                        + "Survived \u2014 Sex; Survived \u2014 Age");
                headline(r.summary(), "mostly an unknown direction", "203/325");
            } else {
                // Class's back-door paths run through the earlier tier
                why(r.screen(), "the gap comes mostly from confounding through the back-door variables Sex, Age");
                directions(r.summary(), "none", "Sex \u2192 Class; Age \u2192 Class; Class \u2192 Survived; Sex \u2192 Survived; "
                        + "Age \u2192 Survived", "Age \u2014 Sex");
                headline(r.summary(), "mostly confounding through Sex, Age", "203/325");
            }
        }
    }

    @Test
    void esophCaseControl() throws Exception {
        String[] q = {"--do", "alcgp=120+", "--versus", "alcgp=0-39", "--target", "status=case",
            "--design", "case-control", "--outcome", "status"};
        long[] cases = new long[4];
        long[] all = new long[4];
        for (int[] c : PublicTablesTest.ESOPH) {
            cases[c[1]] += c[3];
            all[c[1]] += c[3] + c[4];
        }
        String raw = rawLine("status=case", "alcgp=120+", cases[3], all[3], "alcgp=0-39", cases[0], all[0]);
        assertTrue(raw.startsWith("P(status=case | alcgp=120+) = 45/67"), raw);
        // the crude odds ratio (ad)/(bc) by hand: 45 cases and 22 controls at 120+, 29 and 386 at 0-39
        double crude = 45.0 * 386 / (22.0 * 29);
        for (String tiers : new String[] {null, "agegp;alcgp,tobgp;status"}) {
            Run r = run("esoph", PublicTablesTest.esophStore(), tiers, q);
            // only the odds ratio: risks are not estimable from a sample drawn on the outcome
            leadingMeasure(r.screen(), "odds ratio");
            assertTrue(r.screen().lines().noneMatch(l -> l.startsWith("risk ") || l.startsWith("  also:")), r.screen());
            assertTrue(onFirstScreen(r.screen(), "raw frequencies from the counts (family status <- alcgp): ").endsWith(
                    raw + String.format(java.util.Locale.ROOT, ", crude odds ratio %.4f (shares in the case-control sample, not "
                            + "population risks)", crude)), r.screen());
            if (tiers == null) {
                why(r.screen(), "conditioning shows an odds ratio of ");
                why(r.screen(), "the gap comes mostly from an unknown direction");
                directions(r.summary(), "none", null, "status \u2014 agegp; status \u2014 alcgp; status \u2014 tobgp");
                headline(r.summary(), "mostly an unknown direction", "45/67");
            } else {
                why(r.screen(), "they agree, so the association is the effect");
                directions(r.summary(), "none", "alcgp \u2192 status; agegp \u2192 status", "none");
                headline(r.summary(), "none: setting and conditioning agree", "45/67");
            }
            assertTrue(r.summary().contains("Raw frequencies in the data (shares in the case-control sample, not risks): 45/67"),
                    r.summary());
        }
    }

    /** The summary names, by list, what the data fix, what the tiers fix (null: no tiers given) and what is open. */
    static void directions(String summary, String data, String tiers, String open) {
        assertTrue(summary.contains("<li><b>fixed by the data</b> (compelled: the same in every network that fits the data equally "
                + "well): " + (data.equals("none") ? "none" : "<b>" + data + "</b>") + "</li>"), summary);
        if (tiers == null) {
            assertTrue(!summary.contains("fixed by the tiers"), summary);
        } else {
            assertTrue(summary.contains("<li><b>fixed by the tiers you gave</b>: " + tiers + "</li>"), summary);
        }
        assertTrue(summary.contains("<li><b>open</b> (either way as far as these data tell): " + open + "</li>"), summary);
    }

    /** The effect's sentence in the summary: the measure's interval, the raw counts and the reason for the gap. */
    static void headline(String summary, String reason, String counts) {
        int at = summary.indexOf("<b>Effect asked:</b>");
        assertTrue(at >= 0, summary);
        String s = summary.substring(at, summary.indexOf("</p>", at));
        assertTrue(s.contains("(95% credible interval ["), s);
        assertTrue(s.contains("Raw frequencies in the data") && s.contains(counts), s);
        assertTrue(s.contains("Why setting and conditioning differ: <b>" + reason + "</b>"), s);
    }
}
