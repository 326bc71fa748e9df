package org.roundtable.testing;

import com.deque.html.axecore.results.CheckedNode;
import com.deque.html.axecore.results.Results;
import com.deque.html.axecore.results.Rule;
import com.deque.html.axecore.selenium.AxeBuilder;
import org.openqa.selenium.JavascriptExecutor;
import org.openqa.selenium.WebDriver;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;

/**
 * What every page a browser test visits must satisfy, checked by {@link Browser} on each new page:
 * <ul>
 *   <li>no constant name of a domain enum in the visible text ({@code OPEN_FOR_RESULTS}, {@code FIXED}) —
 *       pages speak through {@code platform.Labels}. Text inside {@code <code>}, {@code <textarea>} and
 *       {@code <pre>} is machine text (a plan's JSON, a participant code) and is not read;</li>
 *   <li>no accessibility violation of impact "serious" or "critical" found by axe-core (WCAG 2.1 A and AA
 *       rules).</li>
 * </ul>
 */
public final class PageChecks {

    /** Short constants that are also the trade's own words or abbreviations (file formats, techniques, symbols). */
    private static final Set<String> TRADE_WORDS = Set.of("CSV", "XLSX", "JSON", "XRF", "EN", "Z", "ON", "OFF",
            "FORM", "ROUND", "FINAL", "ITEM", "VALUE", "UNIT", "METHOD", "OTHER", "PERCENT", "ZETA",
            "SCHEME", "ACCEPT", "REFUSE", "CLOSE", "AMEND", "ARCHIVE", "CANCEL", "ENROL", "ADMIN", "AUDITOR",
            "CONSISTENT", "INCONSISTENT", "OUTLIER", "ACCEPTED", "STRAGGLER", "QUEUED", "RUNNING", "FAILED");
    private static final Pattern UPPER_WORD = Pattern.compile("\\b[A-Z][A-Z0-9_]*[A-Z0-9]\\b");
    private static final Set<String> DOMAIN_CONSTANTS = domainConstants();
    private static final String VISIBLE_TEXT = """
            const skip = new Set(['CODE', 'TEXTAREA', 'PRE', 'SCRIPT', 'STYLE', 'NOSCRIPT']);
            const parts = [];
            const walk = (node) => {
              if (node.nodeType === Node.TEXT_NODE) { parts.push(node.textContent); return; }
              if (node.nodeType !== Node.ELEMENT_NODE || skip.has(node.tagName)) { return; }
              if (node.tagName === 'OPTION' || node.tagName === 'INPUT') { parts.push(node.label || ''); }
              const style = window.getComputedStyle(node);
              if (style.display === 'none' || style.visibility === 'hidden') { return; }
              for (const child of node.childNodes) { walk(child); }
            };
            walk(document.body);
            parts.push(document.title);
            return parts.join(' ');
            """;

    private PageChecks() {
    }

    /** The problems of the page now shown (empty when it passes); never throws for a page that went away. */
    public static List<String> problemsOf(WebDriver driver) {
        List<String> problems = new ArrayList<>();
        String url = driver.getCurrentUrl();
        String text = String.valueOf(((JavascriptExecutor) driver).executeScript(VISIBLE_TEXT));
        for (String constant : constantNamesIn(text)) {
            problems.add(url + ": shows the constant name " + constant + " (use platform.Labels)");
        }
        Results results = new AxeBuilder().withTags(List.of("wcag2a", "wcag2aa", "wcag21a", "wcag21aa")).analyze(driver);
        if (results.getViolations() != null) {
            for (Rule rule : results.getViolations()) {
                if ("serious".equals(rule.getImpact()) || "critical".equals(rule.getImpact())) {
                    List<String> where = new ArrayList<>();
                    for (CheckedNode node : rule.getNodes()) {
                        where.add(String.valueOf(node.getTarget()));
                    }
                    problems.add(url + ": accessibility (" + rule.getImpact() + ") " + rule.getId() + " — "
                            + rule.getHelp() + " at " + where);
                }
            }
        }
        return problems;
    }

    /** The domain enum constant names that occur as words in {@code text}. */
    public static Set<String> constantNamesIn(String text) {
        Set<String> found = new TreeSet<>();
        Matcher m = UPPER_WORD.matcher(text);
        while (m.find()) {
            String word = m.group();
            if (DOMAIN_CONSTANTS.contains(word) && (word.contains("_") || !TRADE_WORDS.contains(word))) {
                found.add(word);
            }
        }
        return found;
    }

    /** Every constant name of every enum in org.roundtable (the domain's and the platform's). */
    public static Set<String> domainConstants() {
        Set<String> names = new TreeSet<>();
        for (Class<?> c : domainEnums()) {
            for (Object constant : c.getEnumConstants()) {
                String name = ((Enum<?>) constant).name();
                if (name.length() > 1) {
                    names.add(name);
                }
            }
        }
        return names;
    }

    /** The enums of the compiled main code (target/classes), loaded without initialising them. */
    public static List<Class<?>> domainEnums() {
        Path root = Path.of("target", "classes");
        List<Class<?>> enums = new ArrayList<>();
        ClassLoader loader = Thread.currentThread().getContextClassLoader();
        try (Stream<Path> files = Files.walk(root.resolve("org").resolve("roundtable"))) {
            for (Path file : (Iterable<Path>) files.filter(f -> f.toString().endsWith(".class"))::iterator) {
                String name = root.relativize(file).toString().replace(java.io.File.separatorChar, '.')
                        .replaceAll("\\.class$", "");
                try {
                    Class<?> c = Class.forName(name, false, loader);
                    if (c.isEnum()) {
                        enums.add(c);
                    }
                } catch (ClassNotFoundException | LinkageError skipped) {
                    // generated or build-time-only classes
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return enums;
    }
}
