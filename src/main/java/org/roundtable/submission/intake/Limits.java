package org.roundtable.submission.intake;

/**
 * The size limits of an upload (ASVS 5.0.0 5.1.1, 5.2.1, 5.2.3: documented maximum sizes, including unpacked size,
 * and archive checks before unpacking).
 *
 * <p>Defaults ({@link #defaults()}):
 * <ul>
 *   <li>file size: at most 2 MiB (2 097 152 bytes), for every format;</li>
 *   <li>data rows (CSV/XLSX rows after the header, JSON results): at most 5 000;</li>
 *   <li>CSV physical line: at most 4 096 characters;</li>
 *   <li>cell (or JSON string): at most 256 characters;</li>
 *   <li>columns of CSV/XLSX: at most 32;</li>
 *   <li>XLSX zip entries: at most 200;</li>
 *   <li>XLSX uncompressed total: at most 20 MiB (20 971 520 bytes), checked on the declared sizes of the central
 *       directory and again while inflating;</li>
 *   <li>XLSX inflate ratio: an entry larger than 100 KiB uncompressed must have compressed/uncompressed &ge; 0.01
 *       (the same value is given to POI's {@code ZipSecureFile.setMinInflateRatio}; it is never −1).</li>
 * </ul>
 *
 * @param maxFileBytes         largest accepted upload in bytes
 * @param maxDataRows          most result rows
 * @param maxLineChars         longest CSV line in characters
 * @param maxCellChars         longest cell in characters
 * @param maxColumns           most columns in a CSV/XLSX row
 * @param maxZipEntries        most entries in an XLSX zip
 * @param maxUncompressedBytes largest total uncompressed size of an XLSX
 * @param minInflateRatio      smallest compressed/uncompressed ratio of an XLSX entry above the grace size
 * @param inflateGraceBytes    entries up to this uncompressed size skip the ratio check
 */
public record Limits(long maxFileBytes, int maxDataRows, int maxLineChars, int maxCellChars, int maxColumns,
                     int maxZipEntries, long maxUncompressedBytes, double minInflateRatio, long inflateGraceBytes) {

    public static final long MEBIBYTE = 1024L * 1024L;

    public Limits {
        if (maxFileBytes <= 0 || maxDataRows <= 0 || maxLineChars <= 0 || maxCellChars <= 0 || maxColumns <= 0
                || maxZipEntries <= 0 || maxUncompressedBytes <= 0 || inflateGraceBytes < 0) {
            throw new IllegalArgumentException("limits must be positive");
        }
        if (!(minInflateRatio > 0 && minInflateRatio < 1)) {
            throw new IllegalArgumentException("minInflateRatio must lie in (0, 1); disabling the guard is not allowed");
        }
    }

    /** The documented defaults listed in the class comment. */
    public static Limits defaults() {
        return new Limits(2 * MEBIBYTE, 5_000, 4_096, 256, 32, 200, 20 * MEBIBYTE, 0.01, 100 * 1024L);
    }
}
