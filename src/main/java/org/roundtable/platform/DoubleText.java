package org.roundtable.platform;

import java.math.BigInteger;

/**
 * Fast text of doubles as ASCII bytes, with exactly the characters of the slow forms it replaces on hot paths:
 * {@link #appendJava} gives {@link Double#toString(double)} (which JSON writers use for full precision) and
 * {@link #appendPlain} gives {@link NumberFormats#plain(Double, int)} (the shortest decimal rounded half away from
 * zero, never an exponent).
 *
 * <p>The shortest decimal that reads back as the same double is found with the Schubfach algorithm (R. Giulietti,
 * "The Schubfach way to render doubles", 2020; the same algorithm as {@code Double.toString} from Java 19 on): the
 * double's rounding interval is scaled by a 126-bit approximation of a power of ten, which decides in a few
 * multiplications whether a decimal of one digit less or the two neighbours of the scaled value lie inside the
 * interval. Java 17's {@code Double.toString} (an older digit-by-digit algorithm) is known to give more digits than
 * the shortest for some integers of 2⁵³ and more; for those, and for powers of two (an asymmetric rounding interval)
 * and subnormals, where the two algorithms were not compared, this class asks {@code Double.toString} itself, so the
 * text is the same as before for every double ({@code DoubleTextTest} checks millions of random doubles and the
 * edge cases against it).
 *
 * <p>An instance holds the digits of the last double it took apart; use one per thread.
 */
public final class DoubleText {

    private static final int Q_MIN = -1074;
    private static final long C_MIN = 1L << 52;
    private static final long T_MASK = (1L << 52) - 1;
    private static final int K_MIN = -324;
    private static final int K_MAX = 292;
    private static final long MASK_63 = (1L << 63) - 1;
    /** 2⁵³: from here on integers may not be written with their shortest digits by Java 17. */
    private static final double EXACT_INTEGERS = 9007199254740992.0;
    private static final long[] POW10 = new long[19];
    private static final byte[] PAIRS = new byte[200];
    /** g(e) = floor(10^e · 2^(125 − floor(e·log2(10)))) + 1, split into its high and low 63 bits. */
    private static final long[] G1 = new long[K_MAX - K_MIN + 1];
    private static final long[] G0 = new long[K_MAX - K_MIN + 1];

    static {
        for (int i = 0; i < 100; i++) {
            PAIRS[2 * i] = (byte) ('0' + i / 10);
            PAIRS[2 * i + 1] = (byte) ('0' + i % 10);
        }
        POW10[0] = 1;
        for (int i = 1; i < POW10.length; i++) {
            POW10[i] = POW10[i - 1] * 10;
        }
        BigInteger mask63 = BigInteger.ONE.shiftLeft(63).subtract(BigInteger.ONE);
        for (int e = -K_MAX; e <= -K_MIN; e++) {
            int shift = 125 - flog2pow10(e);
            BigInteger g;
            if (e >= 0) {
                BigInteger p = BigInteger.TEN.pow(e);
                g = shift >= 0 ? p.shiftLeft(shift) : p.shiftRight(-shift);
            } else {
                g = BigInteger.ONE.shiftLeft(shift).divide(BigInteger.TEN.pow(-e));
            }
            g = g.add(BigInteger.ONE);
            G1[e + K_MAX] = g.shiftRight(63).longValueExact();
            G0[e + K_MAX] = g.and(mask63).longValueExact();
        }
    }

    /** Significant digits of the last double (no trailing zeros), {@code 0} for zero. */
    private long digits;
    /** Their count. */
    private int length;
    /** The decimal exponent: the value is 0.d₁d₂…dₙ × 10^point. */
    private int point;
    private boolean negative;
    private final byte[] scratch = new byte[32];

    /** Appends {@code Double.toString(v)} to {@code out} from {@code at}; returns the end. */
    public int appendJava(double v, byte[] out, int at) {
        if (!Double.isFinite(v)) {
            return appendAscii(Double.toString(v), out, at);
        }
        split(v);
        int p = at;
        if (negative) {
            out[p++] = '-';
        }
        if (digits == 0) {
            out[p++] = '0';
            out[p++] = '.';
            out[p++] = '0';
            return p;
        }
        int n = writeDigits();
        if (point > -3 && point <= 7) {
            if (point <= 0) {
                out[p++] = '0';
                out[p++] = '.';
                for (int i = point; i < 0; i++) {
                    out[p++] = '0';
                }
                System.arraycopy(scratch, 0, out, p, n);
                p += n;
            } else if (n <= point) {
                System.arraycopy(scratch, 0, out, p, n);
                p += n;
                for (int i = n; i < point; i++) {
                    out[p++] = '0';
                }
                out[p++] = '.';
                out[p++] = '0';
            } else {
                System.arraycopy(scratch, 0, out, p, point);
                p += point;
                out[p++] = '.';
                System.arraycopy(scratch, point, out, p, n - point);
                p += n - point;
            }
            return p;
        }
        out[p++] = scratch[0];
        out[p++] = '.';
        if (n > 1) {
            System.arraycopy(scratch, 1, out, p, n - 1);
            p += n - 1;
        } else {
            out[p++] = '0';
        }
        out[p++] = 'E';
        int exponent = point - 1;
        if (exponent < 0) {
            out[p++] = '-';
            exponent = -exponent;
        }
        if (exponent >= 100) {
            out[p++] = (byte) ('0' + exponent / 100);
            exponent %= 100;
            out[p++] = (byte) ('0' + exponent / 10);
        } else if (exponent >= 10) {
            out[p++] = (byte) ('0' + exponent / 10);
        }
        out[p++] = (byte) ('0' + exponent % 10);
        return p;
    }

    /**
     * Appends {@link NumberFormats#plain(Double, int)} of {@code v} (nothing for a non-finite value) to {@code out}
     * from {@code at}; returns the end. At most {@code 330 + decimals} bytes.
     */
    public int appendPlain(double v, int decimals, byte[] out, int at) {
        if (!Double.isFinite(v)) {
            return at;
        }
        split(v);
        int n = digits == 0 ? 0 : writeDigits();
        // digits kept: those down to the 10^-decimals place
        int keep = point + decimals;
        int whole;
        if (n == 0 || keep < 0) {
            n = 0;
            whole = 0;
        } else if (keep >= n) {
            whole = point;
        } else {
            boolean up = scratch[keep] >= '5';
            n = keep;
            whole = point;
            if (up) {
                int i = n - 1;
                while (i >= 0 && scratch[i] == '9') {
                    scratch[i] = '0';
                    i--;
                }
                if (i >= 0) {
                    scratch[i]++;
                } else {
                    // 9…9 became 10…0: one digit more in front
                    System.arraycopy(scratch, 0, scratch, 1, n);
                    scratch[0] = '1';
                    n++;
                    whole++;
                }
            }
            while (n > 0 && scratch[n - 1] == '0') {
                n--;
            }
        }
        int p = at;
        if (n == 0) {
            out[p++] = '0';
        } else {
            if (negative) {
                out[p++] = '-';
            }
            if (whole <= 0) {
                out[p++] = '0';
            } else {
                for (int i = 0; i < whole; i++) {
                    out[p++] = i < n ? scratch[i] : (byte) '0';
                }
            }
        }
        if (decimals > 0) {
            out[p++] = '.';
            for (int place = 1; place <= decimals; place++) {
                int i = whole + place - 1;
                out[p++] = n > 0 && i >= 0 && i < n ? scratch[i] : (byte) '0';
            }
        }
        return p;
    }

    private static int appendAscii(String text, byte[] out, int at) {
        for (int i = 0; i < text.length(); i++) {
            out[at + i] = (byte) text.charAt(i);
        }
        return at + text.length();
    }

    /** Writes the digits into {@link #scratch}, two at a time; returns their count. */
    private int writeDigits() {
        long d = digits;
        int i = length;
        while (d >= 100_000_000L) {
            long q = d / 100_000_000L;
            int r = (int) (d - q * 100_000_000L);
            d = q;
            for (int j = 0; j < 4; j++) {
                int rq = r / 100;
                int pair = (r - rq * 100) << 1;
                scratch[--i] = PAIRS[pair + 1];
                scratch[--i] = PAIRS[pair];
                r = rq;
            }
        }
        int x = (int) d;
        while (x >= 100) {
            int q = x / 100;
            int pair = (x - q * 100) << 1;
            scratch[--i] = PAIRS[pair + 1];
            scratch[--i] = PAIRS[pair];
            x = q;
        }
        if (x >= 10) {
            scratch[--i] = PAIRS[(x << 1) + 1];
            scratch[--i] = PAIRS[x << 1];
        } else {
            scratch[--i] = (byte) ('0' + x);
        }
        return length;
    }

    /** Takes {@code v} apart into {@link #digits}, {@link #length}, {@link #point} and {@link #negative}. */
    private void split(double v) {
        long bits = Double.doubleToRawLongBits(v);
        negative = bits < 0;
        double magnitude = Math.abs(v);
        if (magnitude == 0) {
            digits = 0;
            length = 0;
            point = 0;
            return;
        }
        int bq = (int) (bits >>> 52) & 0x7FF;
        long t = bits & T_MASK;
        if (bq == 0 || t == 0 || magnitude >= EXACT_INTEGERS) {
            // subnormals, powers of two and large integers: Java 17's own digits
            fromJava(Double.toString(magnitude));
            return;
        }
        int mq = -Q_MIN + 1 - bq;
        long c = C_MIN | t;
        if (0 < mq && mq < 53) {
            long f = c >> mq;
            if (f << mq == c) {
                set(f, 0);
                return;
            }
        }
        shortest(-mq, c);
    }

    /** Schubfach for c·2^q, c not a power of two (so the rounding interval is symmetric). */
    private void shortest(int q, long c) {
        int out = (int) c & 1;
        long cb = c << 2;
        long cbr = cb + 2;
        long cbl = cb - 2;
        int k = flog10pow2(q);
        int h = q + flog2pow10(-k) + 2;
        long g1 = G1[-k + K_MAX];
        long g0 = G0[-k + K_MAX];
        long vb = rop(g1, g0, cb << h);
        long vbl = rop(g1, g0, cbl << h);
        long vbr = rop(g1, g0, cbr << h);
        long s = vb >> 2;
        if (s >= 100) {
            long sp10 = 10 * Math.multiplyHigh(s, 115_292_150_460_684_698L << 4);
            long tp10 = sp10 + 10;
            boolean upin = vbl + out <= sp10 << 2;
            boolean wpin = (tp10 << 2) + out <= vbr;
            if (upin != wpin) {
                set(upin ? sp10 : tp10, k);
                return;
            }
        }
        long tt = s + 1;
        boolean uin = vbl + out <= s << 2;
        boolean win = (tt << 2) + out <= vbr;
        if (uin != win) {
            set(uin ? s : tt, k);
            return;
        }
        long cmp = vb - (s + tt << 1);
        set(cmp < 0 || cmp == 0 && (s & 1) == 0 ? s : tt, k);
    }

    /** floor(g·cp / 2^127), odd when not exact (round to odd). */
    private static long rop(long g1, long g0, long cp) {
        long x1 = Math.multiplyHigh(g0, cp);
        long y0 = g1 * cp;
        long y1 = Math.multiplyHigh(g1, cp);
        long z = (y0 >>> 1) + x1;
        long vbp = y1 + (z >>> 63);
        return vbp | (z & MASK_63) + MASK_63 >>> 63;
    }

    /** f·10^e (f &gt; 0), trailing zeros of f removed. */
    private void set(long f, int e) {
        while (f % 100_000_000L == 0) {
            f /= 100_000_000L;
            e += 8;
        }
        if (f % 10_000 == 0) {
            f /= 10_000;
            e += 4;
        }
        if (f % 100 == 0) {
            f /= 100;
            e += 2;
        }
        if (f % 10 == 0) {
            f /= 10;
            e++;
        }
        int n = flog10pow2(64 - Long.numberOfLeadingZeros(f));
        if (n < POW10.length && f >= POW10[n]) {
            n++;
        }
        digits = f;
        length = n;
        point = e + n;
    }

    /** Digits and exponent of {@code Double.toString} of a positive finite double. */
    private void fromJava(String text) {
        long f = 0;
        int n = 0;
        int dot = -1;
        int exponent = 0;
        int leading = 0;
        boolean started = false;
        for (int i = 0; i < text.length(); i++) {
            char ch = text.charAt(i);
            if (ch == '.') {
                dot = n + leading;
            } else if (ch == 'E') {
                exponent = Integer.parseInt(text.substring(i + 1));
                break;
            } else {
                int d = ch - '0';
                if (!started && d == 0) {
                    leading++;
                    continue;
                }
                started = true;
                f = f * 10 + d;
                n++;
            }
        }
        if (dot < 0) {
            dot = n + leading;
        }
        // value = f · 10^(dot − leading − n + exponent) when the leading zeros stood before the point
        set(f, dot - leading - n + exponent);
    }

    private static int flog10pow2(int e) {
        return (int) (e * 661_971_961_083L >> 41);
    }

    private static int flog2pow10(int e) {
        return (int) (e * 913_124_641_741L >> 38);
    }
}
