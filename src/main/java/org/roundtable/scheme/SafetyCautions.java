package org.roundtable.scheme;

import java.util.List;

/**
 * The cautions block shown with every round's instructions. It reminds, and does not instruct: the
 * laboratory's own rules, its risk assessment and the instrument maker's manual govern the work.
 */
public final class SafetyCautions {

    public static final String HEADING = "Safety cautions for spark-stand work and dusty alloys";

    public static final List<String> POINTS = List.of(
            "The spark source works at high voltage: keep the stand's interlocks in place and never bypass them.",
            "Argon can displace the air in small or poorly ventilated rooms and cause asphyxiation: ventilate, "
                    + "and secure gas cylinders.",
            "Samples are hot after sparking, cutting or grinding: let them cool or handle them with tongs.",
            "Condensate from the spark stand can be toxic or flammable: wear gloves and eye protection, use "
                    + "extraction when cleaning, and dispose of it as hazardous waste.",
            "Grinding or milling beryllium-bearing alloys (some aluminium and copper alloys) and leaded alloys "
                    + "(brasses, free-machining steels) releases harmful dust: use extraction and respect "
                    + "exposure limits.");

    public static final String DEFERENCE = "These notes are reminders only. Local rules, the laboratory's own "
            + "risk assessment and the instrument maker's manual take precedence.";

    private SafetyCautions() {
    }
}
