package org.roundtable.account;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * What the README and the guides promise a newcomer exists: every demo sign-in they name is an account the demo
 * creates, every demo account is named in rounds-demo/README.md, and every relative link points at a file of the
 * repository; the three task guides (docs/guide-*.md) are linked from the README, name demo sign-ins, number their
 * tasks, and link exactly the images of their own folder under docs/images (taken by the guide browser tests).
 */
class DocumentedSignInsTest {

    static final Pattern SIGN_IN = Pattern.compile("`([a-z]+\\.(?:manager|analyst)|coordinator|admin|auditor)`");
    static final Pattern IMAGE = Pattern.compile("!\\[[^\\]]*\\]\\(([^)\\s]+)\\)");
    static final Pattern TASK = Pattern.compile("(?m)^## (\\d+)\\. ");
    static final List<String> GUIDES = List.of("coordinator", "laboratory", "auditor");
    static final long LARGEST_IMAGE = 250_000;
    static final Pattern LINK = Pattern.compile("\\]\\(([^)#\\s]+)(?:#[^)]*)?\\)");

    static Set<String> demoSignIns() {
        Set<String> all = new HashSet<>(List.of("admin", "coordinator", "auditor"));
        for (DemoAccounts.DemoLab lab : DemoAccounts.LABORATORIES) {
            all.add(lab.manager());
            if (lab.member() != null) {
                all.add(lab.member());
            }
        }
        return all;
    }

    static List<Path> documents() throws IOException {
        List<Path> docs = new ArrayList<>(List.of(Path.of("README.md"), Path.of("DEVELOPERS.md"),
                Path.of("rounds-demo/README.md")));
        try (Stream<Path> files = Files.list(Path.of("docs"))) {
            files.filter(f -> f.toString().endsWith(".md")).sorted().forEach(docs::add);
        }
        return docs;
    }

    @Test
    void everySignInTheDocumentsNameIsADemoAccount() throws IOException {
        Set<String> accounts = demoSignIns();
        for (Path doc : documents()) {
            Matcher m = SIGN_IN.matcher(Files.readString(doc, StandardCharsets.UTF_8));
            while (m.find()) {
                assertThat(accounts).as(doc + " names " + m.group(1)).contains(m.group(1));
            }
        }
    }

    @Test
    void theDemoReadmeNamesEveryDemoAccount() throws IOException {
        String readme = Files.readString(Path.of("rounds-demo/README.md"), StandardCharsets.UTF_8);
        for (String account : demoSignIns()) {
            assertThat(readme).as(account).contains("`" + account + "`");
        }
    }

    @Test
    void everyRelativeLinkPointsAtAFileOfTheRepository() throws IOException {
        for (Path doc : documents()) {
            Matcher m = LINK.matcher(Files.readString(doc, StandardCharsets.UTF_8));
            while (m.find()) {
                String target = m.group(1);
                if (target.matches("[a-z]+:.*") || target.startsWith("/")) {
                    continue; // web addresses and paths on the running server
                }
                Path resolved = (doc.getParent() == null ? Path.of(".") : doc.getParent()).resolve(target).normalize();
                assertThat(Files.exists(resolved)).as(doc + " links " + target).isTrue();
            }
        }
    }

    @Test
    void eachGuideIsLinkedNamesDemoSignInsNumbersItsTasksAndLinksExactlyTheImagesOfItsFolder() throws IOException {
        String readme = Files.readString(Path.of("README.md"), StandardCharsets.UTF_8);
        Set<String> accounts = demoSignIns();
        for (String guide : GUIDES) {
            Path doc = Path.of("docs", "guide-" + guide + ".md");
            assertThat(readme).as("README links " + doc).contains("(" + doc.toString().replace('\\', '/') + ")");
            String text = Files.readString(doc, StandardCharsets.UTF_8);
            Matcher signIn = SIGN_IN.matcher(text);
            int named = 0;
            while (signIn.find()) {
                assertThat(accounts).as(doc + " names " + signIn.group(1)).contains(signIn.group(1));
                named++;
            }
            assertThat(named).as(doc + " names a demo sign-in").isPositive();
            Matcher task = TASK.matcher(text);
            int expected = 1;
            while (task.find()) {
                assertThat(Integer.parseInt(task.group(1))).as(doc + ": tasks numbered 1, 2, 3…").isEqualTo(expected++);
            }
            assertThat(expected).as(doc + " has numbered tasks").isGreaterThan(3);
            Set<Path> linked = new HashSet<>();
            Matcher image = IMAGE.matcher(text);
            while (image.find()) {
                Path file = doc.getParent().resolve(image.group(1)).normalize();
                assertThat(file.startsWith(Path.of("docs", "images", guide))).as(doc + " shows " + file).isTrue();
                assertThat(Files.isRegularFile(file)).as(doc + " shows " + file).isTrue();
                assertThat(Files.size(file)).as(file + " is small").isLessThan(LARGEST_IMAGE);
                linked.add(file);
            }
            assertThat(linked).as(doc + " shows images").isNotEmpty();
            try (Stream<Path> files = Files.list(Path.of("docs", "images", guide))) {
                assertThat(files.filter(f -> f.toString().endsWith(".png")).map(Path::normalize))
                        .as("every image of docs/images/" + guide + " is shown by " + doc)
                        .containsExactlyInAnyOrderElementsOf(linked);
            }
        }
    }
}
