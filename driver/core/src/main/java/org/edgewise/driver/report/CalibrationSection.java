package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.c;
import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.f;

import java.util.List;
import org.edgewise.driver.result.TargetPredictions;

/**
 * The report of a {@code predict --target} result: what was predicted and averaged over, the
 * held-out scores, and per calibration table a reliability diagram (SVG: mean predicted probability
 * of a bin against the observed share of the state in it, dot areas proportional to the bin's rows,
 * the diagonal of perfect calibration dashed) beside the table itself. A page of its own
 * ({@link #page}); every name from the data passes through {@link Html#esc}.
 */
public final class CalibrationSection {
    /** Side of the diagram's plotting square (SVG units). */
    static final double SIDE = 300;
    static final double MARGIN = 46;

    private CalibrationSection() {
    }

    /** A self-contained page. */
    public static String page(TargetPredictions r, String name) {
        StringBuilder h = new StringBuilder(16 * 1024);
        h.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\">\n")
                .append("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; style-src 'unsafe-inline'; img-src data:\">\n")
                .append("<title>Edgewise predictions: ").append(esc(name)).append("</title>\n<style>body{font-family:system-ui,sans-serif;")
                .append("max-width:1000px;margin:24px auto;padding:0 16px;color:#1f2d3d}table{border-collapse:collapse;margin:8px 0}")
                .append("td,th{border:1px solid #d5dce4;padding:4px 9px;text-align:left}td.num{text-align:right}")
                .append(".cap{color:#5a6b7d;font-size:14px}.fig{display:inline-block;vertical-align:top;margin-right:24px}</style>\n")
                .append("</head>\n<body>\n");
        h.append("<h1>Predictions of ").append(esc(r.target())).append("</h1>\n<p class=\"cap\">Edgewise report of <code>")
                .append(esc(name)).append("</code>: P(").append(esc(r.target())).append(" | each row's other cells")
                .append(r.given() == null ? "" : ", " + esc(text(r.given()))).append(") for ").append(r.rows()).append(" rows of <code>")
                .append(esc(r.cases())).append("</code>, averaged over ").append(esc(r.averagedOver()))
                .append(r.dagPrior() == null ? "" : " (" + esc(r.dagPrior()) + " DAG prior)").append("; ").append(esc(r.estimate()))
                .append(r.sample() == null ? "" : "; from the saved sample <code>" + esc(r.sample().path()) + "</code> (SHA-256 "
                        + esc(String.valueOf(r.sample().fingerprint())) + ")")
                .append(".</p>\n");
        if (r.interval() != null) {
            h.append("<p class=\"cap\">Intervals: ").append(esc(r.interval().of())).append("; largest Monte Carlo error of an end ")
                    .append(f(r.interval().endpointMcse(), 4)).append(".</p>\n");
        }
        TargetPredictions.Scores s = r.scores();
        if (s == null) {
            h.append("<p>No row carries a truth, so nothing is scored and there is no calibration curve.</p>\n");
        } else {
            h.append("<h2>Held-out scores</h2>\n<table>\n<tr><th>rows scored</th><td class=\"num\">").append(r.scoredRows())
                    .append("</td><td>rows with a truth in column <code>").append(esc(r.truthColumn())).append("</code>")
                    .append(r.unscoredRows() == 0 ? "" : "; " + r.unscoredRows() + " without one were predicted, not scored")
                    .append("</td></tr>\n<tr><th>log loss</th><td class=\"num\">").append(f(s.logLoss(), 4))
                    .append("</td><td>mean \u2212ln P(true state); lower is better</td></tr>\n<tr><th>Brier score</th><td class=\"num\">")
                    .append(f(s.brier(), 4)).append("</td><td>mean over rows of \u03a3 over states of (p \u2212 o)\u00b2 (Brier 1950; 0 to 2)")
                    .append("</td></tr>\n<tr><th>AUC</th><td class=\"num\">").append(s.auc() == null ? "undefined" : f(s.auc(), 4))
                    .append("</td><td>").append(esc(s.aucOf())).append("; 0.5 is chance, 1 a perfect ranking")
                    .append(perState(r)).append("</td></tr>\n</table>\n");
            h.append("<h2>Calibration</h2>\n<p class=\"cap\">Rows are binned by their predicted probability of the state; a bin's dot sits ")
                    .append("at its mean prediction (across) and the share of its rows that had the state (up). Dots on the dashed diagonal ")
                    .append("are well calibrated; below it the model is over-confident in the state, above it under-confident. Dot areas ")
                    .append("grow with the bin's rows: a bin of few rows says little.</p>\n");
            for (TargetPredictions.Calibration cal : s.calibration()) {
                h.append("<div class=\"fig\">").append(diagram(r.target(), cal)).append("</div><div class=\"fig\">");
                table(h, cal);
                h.append("</div>\n");
            }
        }
        h.append("<p class=\"cap\">").append(esc(r.note())).append("</p>\n</body>\n</html>\n");
        return h.toString();
    }

    /** The one-vs-rest AUC of every state, when there are more than two. */
    private static String perState(TargetPredictions r) {
        List<Double> a = r.scores().aucPerState();
        if (a == null || r.states().size() <= 2) {
            return "";
        }
        List<String> parts = new java.util.ArrayList<>();
        for (int k = 0; k < a.size(); k++) {
            parts.add(esc(r.states().get(k)) + " " + (a.get(k) == null ? "undefined" : f(a.get(k), 3)));
        }
        return " (per state: " + String.join(", ", parts) + ")";
    }

    private static void table(StringBuilder h, TargetPredictions.Calibration cal) {
        h.append("<table>\n<tr><th>bin</th><th>rows</th><th>mean predicted</th><th>observed share</th></tr>\n");
        for (TargetPredictions.Bin b : cal.bins()) {
            h.append("<tr><td>[").append(f(b.low(), 1)).append(", ").append(f(b.high(), 1)).append(b.high() >= 1 ? "]" : ")")
                    .append("</td><td class=\"num\">").append(b.count()).append("</td><td class=\"num\">")
                    .append(b.meanPredicted() == null ? "" : f(b.meanPredicted(), 3)).append("</td><td class=\"num\">")
                    .append(b.observedFrequency() == null ? "" : f(b.observedFrequency(), 3)).append("</td></tr>\n");
        }
        h.append("</table>\n");
    }

    /** The reliability diagram of one state. */
    static String diagram(String target, TargetPredictions.Calibration cal) {
        double x0 = MARGIN;
        double y0 = 12 + SIDE;
        int max = 1;
        for (TargetPredictions.Bin b : cal.bins()) {
            max = Math.max(max, b.count());
        }
        String title = "P(" + target + "=" + cal.state() + ")";
        StringBuilder s = new StringBuilder();
        s.append("<svg xmlns=\"http://www.w3.org/2000/svg\" role=\"img\" width=\"").append(c(SIDE + 2 * MARGIN)).append("\" height=\"")
                .append(c(SIDE + 60)).append("\" font-family=\"sans-serif\" font-size=\"12\">\n<title>Calibration of ").append(esc(title))
                .append("</title>\n");
        s.append("<rect x=\"").append(c(x0)).append("\" y=\"").append(c(y0 - SIDE)).append("\" width=\"").append(c(SIDE))
                .append("\" height=\"").append(c(SIDE)).append("\" fill=\"none\" stroke=\"#34495e\"/>\n");
        s.append("<line x1=\"").append(c(x0)).append("\" y1=\"").append(c(y0)).append("\" x2=\"").append(c(x0 + SIDE)).append("\" y2=\"")
                .append(c(y0 - SIDE)).append("\" stroke=\"#8a99a8\" stroke-dasharray=\"5 4\"/>\n");
        for (int t = 0; t <= 4; t++) {
            double v = t / 4.0;
            s.append("<text x=\"").append(c(x0 + v * SIDE)).append("\" y=\"").append(c(y0 + 16)).append("\" text-anchor=\"middle\">")
                    .append(f(v, 2)).append("</text>\n<text x=\"").append(c(x0 - 6)).append("\" y=\"").append(c(y0 - v * SIDE + 4))
                    .append("\" text-anchor=\"end\">").append(f(v, 2)).append("</text>\n");
        }
        StringBuilder path = new StringBuilder();
        for (TargetPredictions.Bin b : cal.bins()) {
            if (b.count() == 0 || b.meanPredicted() == null || b.observedFrequency() == null) {
                continue;
            }
            double x = x0 + b.meanPredicted() * SIDE;
            double y = y0 - b.observedFrequency() * SIDE;
            path.append(path.length() == 0 ? "M" : " L").append(c(x)).append(' ').append(c(y));
        }
        if (path.length() > 0) {
            s.append("<path d=\"").append(path).append("\" fill=\"none\" stroke=\"#4292c6\" stroke-width=\"1.5\"/>\n");
        }
        for (TargetPredictions.Bin b : cal.bins()) {
            if (b.count() == 0 || b.meanPredicted() == null || b.observedFrequency() == null) {
                continue;
            }
            double rad = 3 + 9 * Math.sqrt(b.count() / (double) max);
            s.append("<circle cx=\"").append(c(x0 + b.meanPredicted() * SIDE)).append("\" cy=\"")
                    .append(c(y0 - b.observedFrequency() * SIDE)).append("\" r=\"").append(c(rad))
                    .append("\" fill=\"#2171b5\" fill-opacity=\"0.7\"><title>").append(b.count()).append(" rows; mean predicted ")
                    .append(f(b.meanPredicted(), 3)).append(", observed ").append(f(b.observedFrequency(), 3)).append("</title></circle>\n");
        }
        s.append("<text x=\"").append(c(x0 + SIDE / 2)).append("\" y=\"").append(c(y0 + 36)).append("\" text-anchor=\"middle\">predicted ")
                .append(esc(title)).append("</text>\n<text x=\"12\" y=\"").append(c(y0 - SIDE / 2)).append("\" transform=\"rotate(-90 12 ")
                .append(c(y0 - SIDE / 2)).append(")\" text-anchor=\"middle\">observed share</text>\n</svg>");
        return s.toString();
    }

    private static String text(java.util.Map<String, String> m) {
        List<String> parts = new java.util.ArrayList<>();
        m.forEach((k, v) -> parts.add(k + "=" + v));
        return String.join(", ", parts);
    }
}
