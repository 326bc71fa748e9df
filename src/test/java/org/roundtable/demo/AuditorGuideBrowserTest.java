package org.roundtable.demo;

import static org.assertj.core.api.Assertions.assertThat;

import io.quarkus.test.common.http.TestHTTPResource;
import io.quarkus.test.junit.QuarkusTest;
import io.quarkus.test.junit.TestProfile;
import jakarta.inject.Inject;
import java.net.URL;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.openqa.selenium.By;
import org.openqa.selenium.support.ui.Select;
import org.roundtable.job.JobRunner;

/**
 * docs/guide-auditor.md, step by step, on the demo: the auditor signs in, finds Kestrel's reports in the library,
 * downloads one and verifies it (its SHA-256 computed here equals the one the verification page names), reads
 * Kestrel's record over rounds; Kestrel's manager issues the export for the assessor, and the auditor verifies it.
 * The guide's images are its screenshots (docs/images/auditor/ with -Dguides.images=docs/images). Shares its demo
 * with {@link LaboratoryGuideBrowserTest}: it reads only past rounds, and the export it issues is Kestrel's own.
 */
@QuarkusTest
@TestProfile(DemoProfile.class)
class AuditorGuideBrowserTest {

    @TestHTTPResource("/")
    URL home;

    @Inject
    JobRunner jobs;

    @Test
    void anAuditorFollowsTheGuideFromTheLibraryToAVerifiedReportTheHistoryAndTheExport() {
        try (GuideWalk walk = new GuideWalk(home, "auditor", jobs)) {
            // task 1: sign in; the laboratories that granted access
            walk.signIn("auditor");
            assertThat(walk.text(By.tagName("h1"))).isEqualTo("Laboratories that granted you access");
            assertThat(walk.text(By.tagName("table"))).contains("Kestrel Alloys QC Laboratory")
                    .contains("Brennholt Werkstofflabor").contains("Lumeris Laboratoire d'analyse");
            walk.image("01-granted");

            // task 2: the library, filtered to one laboratory
            walk.click(By.id("auditor-reports-link"));
            new Select(walk.find(By.id("f-laboratory"))).selectByVisibleText("Kestrel Alloys QC Laboratory");
            walk.click(By.cssSelector("#library-filters button[type=submit]"));
            assertThat(walk.text(By.id("library"))).contains("Kestrel Alloys QC Laboratory").doesNotContain("Brennholt");
            walk.image("02-library");

            // task 3: download a laboratory report, verify it by its SHA-256
            String href = walk.find(By.cssSelector("#library a.download-lab-report")).getAttribute("href");
            byte[] pdf = walk.download(href);
            String sha256 = GuideWalk.sha256(pdf);
            Path file = GuideWalk.saved(pdf, "laboratory-report.pdf");
            walk.clickLink("Verify a report");
            walk.upload(By.id("file"), file);
            walk.click(By.cssSelector("form[action='/verify'] button[type=submit]"));
            assertThat(walk.text(By.id("verification"))).contains("Issued here").contains(sha256);
            walk.image("03-verified");

            // task 4: the laboratory's record over rounds
            walk.clickLink("Granted laboratories");
            walk.clickLink("Kestrel Alloys QC Laboratory");
            assertThat(walk.text(By.tagName("h1"))).isEqualTo("Record over rounds: Kestrel Alloys QC Laboratory");
            walk.image("04-history");
            walk.show(By.id("history-corrective-actions"));

            // task 5: the laboratory issues its export for the assessor and hands it over; the auditor verifies it
            walk.signIn("kestrel.manager");
            walk.clickLink("Record over rounds");
            walk.click(By.id("exports-link"));
            walk.find(By.id("export-confirm")).click();
            walk.click(By.id("export-issue"));
            assertThat(walk.text(By.id("export-issued"))).contains("SHA-256 of the PDF");
            walk.image("05-export");
            java.util.regex.Matcher issued = java.util.regex.Pattern.compile("Issued (\\S+) \\(PDF\\)")
                    .matcher(walk.text(By.id("export-issued")));
            assertThat(issued.find()).isTrue();
            String exportHref = walk.find(By.linkText(issued.group(1))).getAttribute("href");
            byte[] export = walk.download(exportHref);
            Path exportFile = GuideWalk.saved(export, "export.pdf");
            walk.signIn("auditor");
            walk.clickLink("Verify a report");
            walk.upload(By.id("file"), exportFile);
            walk.click(By.cssSelector("form[action='/verify'] button[type=submit]"));
            assertThat(walk.text(By.id("verification"))).contains("Issued here").contains(GuideWalk.sha256(export));
            walk.image("06-export-verified");
        }
    }
}
