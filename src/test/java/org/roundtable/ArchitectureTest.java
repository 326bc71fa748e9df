package org.roundtable;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.noClasses;

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
}
