package org.edgewise.job;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;
import static org.junit.jupiter.api.Assertions.assertThrows;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import org.junit.jupiter.api.Test;

/** The job depends on the core library only, never on the driver's command line (DEVELOPERS.md). */
class LayeringTest {
    @Test
    void jobNeverImportsTheDriverCli() {
        JavaClasses job = new ClassFileImporter().withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
                .importPackages("org.edgewise.job");
        noClasses().should().dependOnClassesThat().resideInAnyPackage("org.edgewise.driver.cli..", "me.tongfei..", "org.jline..")
                .because("executors get the job jar, the core jar and the core's third-party jars, nothing else")
                .check(job);
    }

    @Test
    void theDriverCliIsNotEvenOnTheJobsClasspath() {
        assertThrows(ClassNotFoundException.class, () -> Class.forName("org.edgewise.driver.cli.EdgewiseCli"));
    }
}
