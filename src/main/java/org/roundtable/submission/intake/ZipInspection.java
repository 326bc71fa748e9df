package org.roundtable.submission.intake;

import java.io.ByteArrayInputStream;
import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.util.HashMap;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.zip.ZipEntry;
import java.util.zip.ZipInputStream;

/**
 * Checks an XLSX zip before POI opens it (ASVS 5.0.0 5.2.3: archive size and file count before unpacking).
 *
 * <p>Pass 1 reads the central directory from the end of the file without inflating anything:
 * <ul>
 *   <li>no end-of-central-directory record, ZIP64, entries outside the file → {@code xlsx.corrupt};</li>
 *   <li>more than {@link Limits#maxZipEntries()} entries → {@code xlsx.too-many-entries};</li>
 *   <li>a name with {@code ..}, a leading {@code /}, a backslash, a colon or a NUL → {@code xlsx.unsafe-entry-name}
 *       (zip slip);</li>
 *   <li>a zip-encrypted entry → {@code xlsx.encrypted};</li>
 *   <li>{@code vbaProject.bin} or other VBA parts → {@code xlsx.macro-enabled}; {@code xl/activeX/},
 *       {@code xl/embeddings/} → {@code xlsx.active-content}; {@code xl/externalLinks/} → {@code xlsx.external-link};</li>
 *   <li>declared uncompressed total above {@link Limits#maxUncompressedBytes()}, or an entry above
 *       {@link Limits#inflateGraceBytes()} with compressed/uncompressed below {@link Limits#minInflateRatio()} →
 *       {@code xlsx.zip-bomb}.</li>
 * </ul>
 * Pass 2 inflates every entry with {@link ZipInputStream} into a counting sink, so sizes that lie are caught: an
 * entry larger than declared or a running total above the limit → {@code xlsx.zip-bomb}; a CRC or structure error,
 * a different entry count or a repeated name → {@code xlsx.corrupt}. It also reads {@code [Content_Types].xml}
 * (macro-enabled or external-link content types) and looks for {@code <!DOCTYPE} in every XML part →
 * {@code xlsx.xml-doctype} (OOXML never has one; it is how XXE and entity-expansion attacks start).
 */
final class ZipInspection {

    private static final int END_OF_CENTRAL_DIRECTORY = 0x06054b50;
    private static final int CENTRAL_DIRECTORY_ENTRY = 0x02014b50;
    private static final int END_RECORD_SIZE = 22;
    private static final byte[] DOCTYPE = "<!doctype".getBytes(StandardCharsets.US_ASCII);

    private ZipInspection() {
    }

    /** Runs both passes; returns the entry names. */
    static Set<String> inspect(byte[] zip, Limits limits) throws UploadRejectedException {
        Map<String, Long> declaredSizes = readCentralDirectory(zip, limits);
        inflateAll(zip, limits, declaredSizes);
        return Set.copyOf(declaredSizes.keySet());
    }

    private static Map<String, Long> readCentralDirectory(byte[] zip, Limits limits) throws UploadRejectedException {
        int end = -1;
        for (int i = zip.length - END_RECORD_SIZE; i >= 0 && i >= zip.length - END_RECORD_SIZE - 65_535; i--) {
            if (int32(zip, i) == END_OF_CENTRAL_DIRECTORY) {
                end = i;
                break;
            }
        }
        if (end < 0) {
            throw reject(IntakeKey.XLSX_CORRUPT, "The workbook is truncated or damaged (no zip directory found).");
        }
        int totalEntries = int16(zip, end + 10);
        long directoryOffset = uint32(zip, end + 16);
        if (totalEntries == 0xFFFF || directoryOffset == 0xFFFFFFFFL) {
            throw reject(IntakeKey.XLSX_CORRUPT, "ZIP64 archives are not accepted as workbooks.");
        }
        if (totalEntries > limits.maxZipEntries()) {
            throw reject(IntakeKey.XLSX_TOO_MANY_ENTRIES, "The workbook has " + totalEntries + " parts; at most "
                    + limits.maxZipEntries() + " are accepted.");
        }
        Map<String, Long> declaredSizes = new HashMap<>();
        long totalUncompressed = 0;
        int position = (int) Math.min(directoryOffset, Integer.MAX_VALUE);
        for (int entry = 0; entry < totalEntries; entry++) {
            if (position < 0 || position + 46 > zip.length || int32(zip, position) != CENTRAL_DIRECTORY_ENTRY) {
                throw reject(IntakeKey.XLSX_CORRUPT, "The zip directory of the workbook is damaged.");
            }
            int flags = int16(zip, position + 8);
            long compressed = uint32(zip, position + 20);
            long uncompressed = uint32(zip, position + 24);
            int nameLength = int16(zip, position + 28);
            int extraLength = int16(zip, position + 30);
            int commentLength = int16(zip, position + 32);
            if (position + 46 + nameLength > zip.length) {
                throw reject(IntakeKey.XLSX_CORRUPT, "The zip directory of the workbook is damaged.");
            }
            String name = new String(zip, position + 46, nameLength, StandardCharsets.UTF_8);
            checkName(name);
            if ((flags & 1) != 0) {
                throw reject(IntakeKey.XLSX_ENCRYPTED, "The workbook is encrypted; remove the password and upload "
                        + "it again.");
            }
            if (declaredSizes.put(name, uncompressed) != null) {
                throw reject(IntakeKey.XLSX_CORRUPT, "The workbook contains the part '" + Texts.shown(name)
                        + "' twice.");
            }
            totalUncompressed += uncompressed;
            if (totalUncompressed > limits.maxUncompressedBytes()) {
                throw reject(IntakeKey.XLSX_ZIP_BOMB, "The workbook unpacks to more than "
                        + limits.maxUncompressedBytes() + " bytes.");
            }
            if (uncompressed > limits.inflateGraceBytes()
                    && (double) compressed / uncompressed < limits.minInflateRatio()) {
                throw reject(IntakeKey.XLSX_ZIP_BOMB, "The part '" + Texts.shown(name) + "' is compressed more than "
                        + Math.round(1 / limits.minInflateRatio()) + " to 1, which real workbooks never are.");
            }
            position += 46 + nameLength + extraLength + commentLength;
        }
        return declaredSizes;
    }

    private static void checkName(String name) throws UploadRejectedException {
        String lower = name.toLowerCase(Locale.ROOT);
        if (name.contains("..") || name.startsWith("/") || name.contains("\\") || name.contains(":")
                || name.indexOf('\0') >= 0) {
            throw reject(IntakeKey.XLSX_UNSAFE_ENTRY_NAME, "The workbook contains a part with the unsafe path '"
                    + Texts.shown(name) + "'.");
        }
        if (lower.endsWith("vbaproject.bin") || lower.contains("vbadata") || lower.endsWith(".bin")
                && lower.contains("vba")) {
            throw reject(IntakeKey.XLSX_MACRO_ENABLED, "The workbook contains macros (VBA). Save it as a plain "
                    + ".xlsx workbook without macros.");
        }
        if (lower.startsWith("xl/activex/") || lower.startsWith("xl/embeddings/")) {
            throw reject(IntakeKey.XLSX_ACTIVE_CONTENT, "The workbook contains ActiveX controls or embedded objects.");
        }
        if (lower.startsWith("xl/externallinks/")) {
            throw reject(IntakeKey.XLSX_EXTERNAL_LINK, "The workbook links to other workbooks; paste the values "
                    + "instead of the links.");
        }
    }

    private static void inflateAll(byte[] zip, Limits limits, Map<String, Long> declaredSizes)
            throws UploadRejectedException {
        long total = 0;
        int entries = 0;
        byte[] buffer = new byte[16 * 1024];
        try (ZipInputStream in = new ZipInputStream(new ByteArrayInputStream(zip), StandardCharsets.UTF_8)) {
            ZipEntry entry;
            while ((entry = in.getNextEntry()) != null) {
                entries++;
                String name = entry.getName();
                Long declared = declaredSizes.get(name);
                if (declared == null || entries > declaredSizes.size()) {
                    throw reject(IntakeKey.XLSX_CORRUPT, "The parts of the workbook do not match its zip directory.");
                }
                boolean xml = name.endsWith(".xml") || name.endsWith(".rels") || name.endsWith(".vml");
                boolean contentTypes = name.equals("[Content_Types].xml");
                StringBuilder contentTypesText = new StringBuilder();
                DoctypeScanner doctype = new DoctypeScanner();
                long entrySize = 0;
                int read;
                while ((read = in.read(buffer)) > 0) {
                    entrySize += read;
                    total += read;
                    if (entrySize > declared || total > limits.maxUncompressedBytes()) {
                        throw reject(IntakeKey.XLSX_ZIP_BOMB, "The part '" + Texts.shown(name) + "' unpacks to "
                                + "more data than the workbook declares.");
                    }
                    if (xml && doctype.found(buffer, read)) {
                        throw reject(IntakeKey.XLSX_XML_DOCTYPE, "The part '" + Texts.shown(name) + "' contains a "
                                + "document type declaration, which workbooks never have.");
                    }
                    if (contentTypes && contentTypesText.length() < 1_048_576) {
                        contentTypesText.append(new String(buffer, 0, read, StandardCharsets.ISO_8859_1));
                    }
                }
                if (contentTypes) {
                    checkContentTypes(contentTypesText.toString().toLowerCase(Locale.ROOT));
                }
            }
        } catch (IOException e) {
            throw reject(IntakeKey.XLSX_CORRUPT, "The workbook is damaged: its zip data cannot be unpacked.");
        } catch (IllegalArgumentException e) {
            throw reject(IntakeKey.XLSX_CORRUPT, "The workbook is damaged: a part name cannot be read.");
        }
        if (entries != declaredSizes.size()) {
            throw reject(IntakeKey.XLSX_CORRUPT, "The parts of the workbook do not match its zip directory.");
        }
    }

    private static void checkContentTypes(String contentTypes) throws UploadRejectedException {
        if (contentTypes.contains("macroenabled") || contentTypes.contains("vbaproject")) {
            throw reject(IntakeKey.XLSX_MACRO_ENABLED, "The workbook is macro-enabled (.xlsm or similar). Save it as "
                    + "a plain .xlsx workbook without macros.");
        }
        if (contentTypes.contains("externallink")) {
            throw reject(IntakeKey.XLSX_EXTERNAL_LINK, "The workbook links to other workbooks; paste the values "
                    + "instead of the links.");
        }
    }

    /** Finds {@code <!DOCTYPE} (any case) across buffer boundaries. */
    private static final class DoctypeScanner {
        private int matched;

        boolean found(byte[] buffer, int length) {
            for (int i = 0; i < length; i++) {
                byte b = buffer[i];
                byte lower = (b >= 'A' && b <= 'Z') ? (byte) (b + 32) : b;
                if (lower == DOCTYPE[matched]) {
                    matched++;
                    if (matched == DOCTYPE.length) {
                        return true;
                    }
                } else {
                    matched = lower == DOCTYPE[0] ? 1 : 0;
                }
            }
            return false;
        }
    }

    private static int int16(byte[] bytes, int offset) {
        if (offset < 0 || offset + 2 > bytes.length) {
            return -1;
        }
        return (bytes[offset] & 0xff) | (bytes[offset + 1] & 0xff) << 8;
    }

    private static int int32(byte[] bytes, int offset) {
        if (offset < 0 || offset + 4 > bytes.length) {
            return 0;
        }
        return (bytes[offset] & 0xff) | (bytes[offset + 1] & 0xff) << 8 | (bytes[offset + 2] & 0xff) << 16
                | (bytes[offset + 3] & 0xff) << 24;
    }

    private static long uint32(byte[] bytes, int offset) {
        return int32(bytes, offset) & 0xFFFFFFFFL;
    }

    private static UploadRejectedException reject(IntakeKey key, String message) {
        return new UploadRejectedException(IntakeProblem.ofFile(key, message));
    }
}
