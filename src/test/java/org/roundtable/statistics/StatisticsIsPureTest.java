package org.roundtable.statistics;

import static com.tngtech.archunit.lang.syntax.ArchRuleDefinition.classes;

import com.tngtech.archunit.core.domain.JavaClasses;
import com.tngtech.archunit.core.importer.ClassFileImporter;
import com.tngtech.archunit.core.importer.ImportOption;
import org.junit.jupiter.api.Test;

/** The statistics core is a plain library: no framework, none of our other packages. */
class StatisticsIsPureTest {

    private static final JavaClasses CORE = new ClassFileImporter()
            .withImportOption(ImportOption.Predefined.DO_NOT_INCLUDE_TESTS)
            .importPackages("org.roundtable.statistics");

    @Test
    void statisticsDependsOnlyOnJavaHipparchusAndItself() {
        classes().that().resideInAPackage("org.roundtable.statistics..")
                .should().onlyDependOnClassesThat()
                .resideInAnyPackage("java..", "org.hipparchus..", "org.roundtable.statistics..")
                .check(CORE);
    }
}
