package org.roundtable;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;
import static com.tngtech.archunit.library.dependencies.SlicesRuleDefinition.slices;

/** The layout rules of the contributor guide, checked on the compiled classes. */
class ArchitectureTest {

    private static JavaClasses classes;

    @BeforeAll
    static void importClasses() {
        classes = new ClassFileImporter()
                .withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
                .importPackages("org.roundtable");
    }

    @Test
    void featurePackagesDoNotDependOnTheWebPlumbing() {
        noClasses().that().resideOutsideOfPackages("org.roundtable.web..", "org.roundtable")
                .should().dependOnClassesThat().resideInAPackage("org.roundtable.web..")
                .check(classes);
    }

    @Test
    void evaluationDoesNotDependOnTheReports() {
        // reports are drawn from evaluations, never the other way round: what has been published is asked
        // through evaluation.PublishedRuns, which the report feature implements
        noClasses().that().resideInAPackage("org.roundtable.evaluation..")
                .should().dependOnClassesThat().resideInAPackage("org.roundtable.report..")
                .check(classes);
    }

    @Test
    void noFeatureDependsOnTheHistory() {
        // the history reads what the other features publish (services, report.RoundReportIssued); no feature reads
        // it — only the demo loader, which assembles every feature's demo data
        noClasses().that().resideOutsideOfPackages("org.roundtable.history..", "org.roundtable.demo..")
                .should().dependOnClassesThat().resideInAPackage("org.roundtable.history..")
                .check(classes);
    }

    @Test
    void theStatisticsAndTheReportRenderingFormNoCycles() {
        slices().matching("org.roundtable.report.(*)..").should().beFreeOfCycles().check(classes);
        slices().matching("org.roundtable.statistics.(*)..").should().beFreeOfCycles().check(classes);
    }
}
