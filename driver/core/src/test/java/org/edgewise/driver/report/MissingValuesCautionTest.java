package org.edgewise.driver.report;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.edgewise.driver.result.EdgeResult;
import org.junit.jupiter.api.Test;

/**
 * The report states the data's missing-value assumption: complete data for a plain store, missing at
 * random — in the "Read this first" box and in the provenance table — for a store whose missing
 * values were averaged over (Rubin 1976's definition, worded for readers).
 */
class MissingValuesCautionTest {
    @Test
    void theCautionNamesMissingAtRandomOnlyWhenValuesWereAveragedOver() {
        EdgeResult plain = ReportFixtures.tiny(List.of("a", "b", "c"));
        String words = "averaged over missing values by data augmentation, 20 rounds, burn-in 10";
        EdgeResult averaged = new EdgeResult(plain.method(), plain.variables(), plain.logEvidence(),
                plain.logEvidenceNormalized(), plain.evidenceConvention(), plain.order(), plain.settings(),
                plain.store().withMissingValues(words), plain.edges(), plain.parentSets(), plain.bestNetwork(),
                plain.diagnostics(), plain.features(), plain.sensitivity(), plain.dagPrior(), plain.essentialGraph());
        String p = HtmlReport.render(plain, "r.json", null, null, 0.5);
        String a = HtmlReport.render(averaged, "r.json", null, null, 0.5);
        assertTrue(p.contains("complete data with no missing values"), "plain store: complete data");
        assertFalse(p.contains("missing at random"));
        assertTrue(a.contains("missing values averaged over under the assumption that they are missing at random"), a);
        assertFalse(a.contains("complete data with no missing values"));
        assertTrue(a.contains(words), "the provenance table says how");
    }
}
