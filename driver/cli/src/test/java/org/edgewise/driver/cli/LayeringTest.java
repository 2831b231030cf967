package org.edgewise.driver.cli;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;
import static com.tngtech.archunit.library.dependencies.SlicesRuleDefinition.slices;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

/**
 * The driver's layers (DEVELOPERS.md): the core library knows nothing of the command line or of
 * Spark; within the core, the engines do not reach up into reports. The Maven modules already keep
 * picocli and Spark off the core's compile classpath; these rules make the intent explicit and
 * catch a package-level slip (e.g. a core class calling back into the CLI through reflection-free
 * code after someone adds the dependency).
 */
class LayeringTest {
    private static JavaClasses classes;

    @BeforeAll
    static void load() {
        // Main classes only: neither this module's tests nor the core's test-jar (shared fixtures).
        classes = new ClassFileImporter().withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
                .withImportOption(location -> !location.contains("-tests.jar"))
                .importPackages("org.edgewise.driver");
    }

    @Test
    void coreNeverImportsTheCliPicocliOrSpark() {
        noClasses().that().resideOutsideOfPackage("org.edgewise.driver.cli..")
                .should().dependOnClassesThat().resideInAnyPackage("org.edgewise.driver.cli..", "picocli..",
                        "me.tongfei..", "org.jline..", "org.apache.spark..", "scala..")
                .because("the core is a library that the job ships to executors and other programs embed")
                .check(classes);
    }

    @Test
    void enginesDoNotDependOnReportsOrResults() {
        noClasses().that().resideInAnyPackage("org.edgewise.driver.score..", "org.edgewise.driver.store..")
                .should().dependOnClassesThat().resideInAnyPackage("org.edgewise.driver.average..",
                        "org.edgewise.driver.query..", "org.edgewise.driver.report..", "org.edgewise.driver.result..")
                .because("score math and the store contract sit below the averaging engines and the writers")
                .check(classes);
        noClasses().that().resideInAnyPackage("org.edgewise.driver.average..", "org.edgewise.driver.query..")
                .should().dependOnClassesThat().resideInAnyPackage("org.edgewise.driver.report..")
                .because("engines compute; report writers present")
                .check(classes);
    }

    @Test
    void packagesFormNoCycles() {
        slices().matching("org.edgewise.driver.(*)..").should().beFreeOfCycles()
                .because("each layer may use the ones below it only (DEVELOPERS.md, 'Layers')")
                .check(classes);
    }

    @Test
    void theResultAssemblyDoesNotRunEngines() {
        noClasses().that().resideInAnyPackage("org.edgewise.driver.average..", "org.edgewise.driver.query..",
                        "org.edgewise.driver.result..")
                .should().dependOnClassesThat().resideInAnyPackage("org.edgewise.driver.analysis..")
                .because("analysis/ runs the engines for a request and assembles results; nothing below calls up")
                .check(classes);
    }

    @Test
    void theCliImportsNoEngine() {
        noClasses().that().resideInAPackage("org.edgewise.driver.cli..")
                .should().dependOnClassesThat().resideInAnyPackage("org.edgewise.driver.average..",
                        "org.edgewise.driver.query..", "org.edgewise.driver.effect..", "org.edgewise.driver.posterior..")
                .because("the CLI parses and prints; every command calls one service in analysis/ (DEVELOPERS.md)")
                .check(classes);
    }

    @Test
    void resultsImportNoEngine() {
        noClasses().that().resideInAPackage("org.edgewise.driver.result..")
                .should().dependOnClassesThat().resideInAnyPackage("org.edgewise.driver.average..",
                        "org.edgewise.driver.query..", "org.edgewise.driver.effect..", "org.edgewise.driver.posterior..",
                        "org.edgewise.driver.analysis..")
                .because("result/ holds the JSON records and their reading and writing; analysis/ assembles them")
                .check(classes);
    }

    @Test
    void onlyAnalysisChoosesThePosterior() {
        noClasses().that().resideInAnyPackage("org.edgewise.driver.average..", "org.edgewise.driver.query..",
                        "org.edgewise.driver.effect..", "org.edgewise.driver.report..", "org.edgewise.driver.result..")
                .should().dependOnClassesThat().resideInAPackage("org.edgewise.driver.posterior..")
                .because("the structure posterior is chosen once per request, by the services in analysis/")
                .check(classes);
    }
}
