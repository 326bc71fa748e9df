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
 * repository.
 */
class DocumentedSignInsTest {

    static final Pattern SIGN_IN = Pattern.compile("`([a-z]+\\.(?:manager|analyst)|coordinator|admin|auditor)`");
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
}
