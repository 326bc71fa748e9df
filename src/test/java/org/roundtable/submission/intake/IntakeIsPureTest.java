package org.roundtable.submission.intake;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.classes;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import org.junit.jupiter.api.Test;

/** The result intake is a plain library: Java, Commons CSV, POI (with its XML and zip types) and Jackson only. */
class IntakeIsPureTest {

    private static final JavaClasses INTAKE = new ClassFileImporter()
            .withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
            .importPackages("org.roundtable.submission.intake");

    @Test
    void intakeDependsOnlyOnJavaCommonsCsvPoiJacksonAndItself() {
        classes().that().resideInAPackage("org.roundtable.submission.intake..")
                .should().onlyDependOnClassesThat()
                .resideInAnyPackage("java..", "javax.xml..", "org.xml.sax..", "org.apache.commons.csv..",
                        "org.apache.poi..", "com.fasterxml.jackson..", "org.roundtable.submission.intake..")
                .check(INTAKE);
    }
}
