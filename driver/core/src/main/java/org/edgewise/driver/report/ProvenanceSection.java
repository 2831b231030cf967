package org.edgewise.driver.report;

import static org.edgewise.driver.report.Html.esc;
import static org.edgewise.driver.report.Html.num;
import static org.edgewise.driver.report.Html.row;

import java.util.ArrayList;
import java.util.List;
import org.edgewise.driver.result.EdgeResult;

/**
 * The report's "Provenance" table: the result file, the score store and its data, the score and
 * priors used, the constraints, the DAG prior and the evidence convention.
 */
final class ProvenanceSection {
    private ProvenanceSection() {
    }

    static void write(StringBuilder h, EdgeResult r, String resultName) {
        h.append("<h2>Provenance</h2>\n<table>\n");
        row(h, "result file", esc(resultName));
        EdgeResult.Provenance p = r.store();
        if (p != null) {
            row(h, "score store", esc(p.path()));
            row(h, "input", p.input() == null ? "" : esc(String.join(", ", p.input())));
            row(h, "rows", String.valueOf(p.rows()));
            row(h, "data fingerprint", esc(p.fingerprint()));
            row(h, "store written", esc(p.createdAt()));
            row(h, "stored score", esc(p.storedScore()) + ", ESS " + esc(num(p.storedEss())));
            if (p.missingValues() != null) {
                row(h, "missing values", esc(p.missingValues()));
            }
        }
        EdgeResult.Settings s = r.settings();
        if (s != null) {
            row(h, "score used", esc(s.score()) + (s.ess() == null ? " (no ESS)" : ", ESS " + esc(num(s.ess()))));
            row(h, "structure prior", esc(s.prior()));
            row(h, "maximum parents (d)", String.valueOf(s.maxParents()));
            if (s.forbid() != null && !s.forbid().isEmpty()) {
                row(h, "forbidden edges", esc(String.join(", ", s.forbid())));
            }
            if (s.require() != null && !s.require().isEmpty()) {
                row(h, "required edges", esc(String.join(", ", s.require())));
            }
            if (s.tiers() != null && !s.tiers().isEmpty()) {
                List<String> tiers = new ArrayList<>();
                for (List<String> tier : s.tiers()) {
                    tiers.add(String.join(", ", tier));
                }
                row(h, "tiers", esc(String.join(" ; ", tiers)));
            }
        }
        row(h, "DAG prior", SummarySection.dagPriorLabel(r));
        if (r.evidenceConvention() != null) {
            row(h, "evidence convention", esc(r.evidenceConvention()));
        }
        h.append("</table>\n");
    }
}
