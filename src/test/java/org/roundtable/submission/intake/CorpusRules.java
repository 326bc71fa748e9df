package org.roundtable.submission.intake;

/** Gives the corpus test (in a subpackage) the fixed low-alloy steel test round. */
public final class CorpusRules {

    private CorpusRules() {
    }

    /** The single-item low-alloy steel round of {@link LowAlloySteelRound}. */
    public static UploadRules lowAlloySteel() {
        return LowAlloySteelRound.singleItem();
    }
}
