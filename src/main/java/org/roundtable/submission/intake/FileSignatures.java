package org.roundtable.submission.intake;

/**
 * Magic bytes of file types that must never pass as a text or workbook upload (ASVS 5.0.0 5.2.2: the content must
 * match the declared type).
 */
final class FileSignatures {

    private static final byte[] ZIP = {'P', 'K', 3, 4};
    private static final byte[] EMPTY_ZIP = {'P', 'K', 5, 6};
    private static final byte[] OLE2 = {(byte) 0xD0, (byte) 0xCF, 0x11, (byte) 0xE0, (byte) 0xA1, (byte) 0xB1, 0x1A,
        (byte) 0xE1};
    private static final byte[] ENCRYPTION_INFO_UTF16 = utf16le("EncryptionInfo");

    private FileSignatures() {
    }

    static boolean isZip(byte[] content) {
        return startsWith(content, ZIP) || startsWith(content, EMPTY_ZIP);
    }

    static boolean isOle2(byte[] content) {
        return startsWith(content, OLE2);
    }

    /** An OLE2 compound file holding an encrypted OOXML package has a stream named {@code EncryptionInfo}. */
    static boolean isEncryptedOoxml(byte[] content) {
        return isOle2(content) && indexOf(content, ENCRYPTION_INFO_UTF16) >= 0;
    }

    /**
     * The name of a binary type recognised by its first bytes, or {@code null} if none: executables, PDF, images,
     * archives. Used to refuse such files uploaded as CSV or JSON, and as XLSX when they are no zip.
     */
    static String binaryTypeName(byte[] content) {
        if (startsWith(content, new byte[] {'M', 'Z'})) {
            return "a Windows executable";
        }
        if (startsWith(content, new byte[] {0x7f, 'E', 'L', 'F'})) {
            return "an ELF executable";
        }
        if (startsWith(content, new byte[] {'%', 'P', 'D', 'F'})) {
            return "a PDF document";
        }
        if (isZip(content)) {
            return "a zip archive (perhaps a workbook)";
        }
        if (isOle2(content)) {
            return "an OLE2 compound file (legacy Office or encrypted workbook)";
        }
        if (startsWith(content, new byte[] {(byte) 0x89, 'P', 'N', 'G'})) {
            return "a PNG image";
        }
        if (startsWith(content, new byte[] {(byte) 0xFF, (byte) 0xD8, (byte) 0xFF})) {
            return "a JPEG image";
        }
        if (startsWith(content, new byte[] {0x1f, (byte) 0x8b})) {
            return "a gzip archive";
        }
        if (startsWith(content, new byte[] {'R', 'a', 'r', '!'})) {
            return "a RAR archive";
        }
        if (startsWith(content, new byte[] {'7', 'z', (byte) 0xBC, (byte) 0xAF})) {
            return "a 7z archive";
        }
        if (startsWith(content, new byte[] {(byte) 0xCA, (byte) 0xFE, (byte) 0xBA, (byte) 0xBE})) {
            return "a Java class file";
        }
        return null;
    }

    static boolean startsWith(byte[] content, byte[] prefix) {
        if (content.length < prefix.length) {
            return false;
        }
        for (int i = 0; i < prefix.length; i++) {
            if (content[i] != prefix[i]) {
                return false;
            }
        }
        return true;
    }

    static int indexOf(byte[] content, byte[] needle) {
        outer:
        for (int i = 0; i <= content.length - needle.length; i++) {
            for (int j = 0; j < needle.length; j++) {
                if (content[i + j] != needle[j]) {
                    continue outer;
                }
            }
            return i;
        }
        return -1;
    }

    private static byte[] utf16le(String text) {
        byte[] bytes = new byte[text.length() * 2];
        for (int i = 0; i < text.length(); i++) {
            bytes[2 * i] = (byte) text.charAt(i);
        }
        return bytes;
    }
}
