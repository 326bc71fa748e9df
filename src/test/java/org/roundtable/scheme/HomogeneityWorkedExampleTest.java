package org.roundtable.scheme;

import java.io.IOException;
import java.io.InputStream;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;

/** Placeholder; replaced below. */
class HomogeneityWorkedExampleTest {

    /** The §14.8 duplicates as the homogeneity upload (see the resource's header note). */
    static String csv() {
        try (InputStream in = HomogeneityWorkedExampleTest.class.getResourceAsStream("/scheme/homogeneity-cr-stainless.csv")) {
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }
}
