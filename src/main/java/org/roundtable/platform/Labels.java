package org.roundtable.platform;

import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.Locale;
import java.util.Map;
import java.util.Properties;
import java.util.TreeMap;

/**
 * The one place where states, methods, rules, roles and job kinds get their words: pages (through the template
 * extension), reports and e-mails ask here, so that {@code OPEN_FOR_RESULTS} is "Open for results" everywhere
 * and no constant name reaches a reader. The words live in {@code labels.properties} beside this class, keyed
 * {@code <enum simple name>.<constant>} ({@code RoundState.OPEN_FOR_RESULTS}); job kinds under
 * {@code JobKind.<kind>}. {@code docs/glossary.md} lists each label.
 *
 * <p>A name without a label (a constant added later and not yet worded) is shown in sentence case
 * ("Some new state") rather than as the constant itself; {@code LabelsTest} fails the build for every
 * constant of a domain enum that has no label, so this fallback is a safety net, not a way of labelling.
 */
public final class Labels {

    private static final Map<String, String> WORDS = load();

    private Labels() {
    }

    /** The label of an enum constant, keyed by its enum's simple name; empty text for null. */
    public static String of(Enum<?> constant) {
        if (constant == null) {
            return "";
        }
        return of(constant.getDeclaringClass().getSimpleName(), constant.name());
    }

    /**
     * The label of a constant given by name, for views that carry the name as text:
     * {@code of("RoundState", "OPEN_FOR_RESULTS")} is "Open for results". Empty text for null or blank names.
     */
    public static String of(String kind, String name) {
        if (name == null || name.isBlank()) {
            return "";
        }
        String words = WORDS.get(kind + "." + name);
        if (words == null) {
            // a constant carried in its slug form ("spark-oes" for SPARK_OES)
            words = WORDS.get(kind + "." + name.toUpperCase(Locale.ROOT).replace('-', '_'));
        }
        return words != null ? words : sentenceCase(name);
    }

    /** Whether {@code kind.name} has its own label (for the test that every domain constant is worded). */
    public static boolean has(String kind, String name) {
        return WORDS.containsKey(kind + "." + name);
    }

    /** Every key and its label, sorted by key (for the glossary check). */
    public static Map<String, String> all() {
        return new TreeMap<>(WORDS);
    }

    /** {@code SOME_NEW_STATE} → "Some new state"; {@code report-issue} → "Report issue". */
    static String sentenceCase(String name) {
        String text = name.toLowerCase(Locale.ROOT).replace('_', ' ').replace('-', ' ').strip();
        return text.isEmpty() ? text : Character.toUpperCase(text.charAt(0)) + text.substring(1);
    }

    private static Map<String, String> load() {
        Properties properties = new Properties();
        try (InputStream in = Labels.class.getResourceAsStream("labels.properties")) {
            if (in == null) {
                throw new IllegalStateException("labels.properties is missing beside " + Labels.class.getName());
            }
            properties.load(new InputStreamReader(in, StandardCharsets.UTF_8));
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        Map<String, String> words = new TreeMap<>();
        properties.forEach((k, v) -> words.put(k.toString(), v.toString()));
        return Map.copyOf(words);
    }
}
