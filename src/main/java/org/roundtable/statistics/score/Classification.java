package org.roundtable.statistics.score;

/**
 * Performance classification of a score.
 *
 * <p>ISO/IEC 17043:2010 Annex B words: satisfactory / questionable / unsatisfactory; ISO 13528
 * calls the same bands acceptable / warning signal / action signal.
 */
public enum Classification {
    SATISFACTORY("satisfactory"),
    QUESTIONABLE("questionable"),
    UNSATISFACTORY("unsatisfactory");

    private final String word;

    Classification(String word) {
        this.word = word;
    }

    /** Lower-case word used in JSON and reports. */
    public String word() {
        return word;
    }
}
