package org.roundtable.submission.intake;

/**
 * What the intake found out about the file, reported back to the laboratory with the result of the upload.
 *
 * @param format           the channel that read the upload
 * @param encoding         {@code "UTF-8"} for CSV and JSON; {@code "OOXML"} for a workbook; {@code null} when the
 *                         upload was rejected before the encoding was known
 * @param byteOrderMark    whether a UTF-8 byte order mark was found (and skipped)
 * @param delimiter        CSV only: {@code ','} or {@code ';'} as detected from the header line, else {@code null}
 * @param decimalSeparator {@code '.'} or {@code ','} as found in the numbers; {@code null} when no number was read
 */
public record Detection(UploadFormat format, String encoding, boolean byteOrderMark, Character delimiter,
                        Character decimalSeparator) {

    static Detection of(UploadFormat format) {
        return new Detection(format, null, false, null, null);
    }

    Detection withEncoding(String newEncoding, boolean newByteOrderMark) {
        return new Detection(format, newEncoding, newByteOrderMark, delimiter, decimalSeparator);
    }

    Detection withDelimiter(Character newDelimiter) {
        return new Detection(format, encoding, byteOrderMark, newDelimiter, decimalSeparator);
    }

    Detection withDecimalSeparator(Character newDecimalSeparator) {
        return new Detection(format, encoding, byteOrderMark, delimiter, newDecimalSeparator);
    }
}
