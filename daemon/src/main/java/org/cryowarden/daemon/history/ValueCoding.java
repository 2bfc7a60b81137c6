package org.cryowarden.daemon.history;

/**
 * How a version-2 block codes its values: Gorilla's XOR, or a lattice. On a lattice every value is taken as the
 * nearest double to {@code K / 10^scale} (decimal) or {@code K * 2^-scale} (binary), with {@code K = origin + step * k}
 * for an integer k, plus a correction of a few units in the last place ({@code ulps}). That is what instruments and
 * drivers produce: a printed {@code 20.93}, a 16-bit register scaled through a 4-20 mA loop ({@code (r * 0.001 - 4)
 * / 16 * 25} is k/640 give or take one ulp of rounding), a float32 register scaled by a power of two. The stream then
 * holds small differences of k instead of XORs with many meaningful bits.
 *
 * @param kind   XOR, DECIMAL or BINARY
 * @param scale  decimal digits or binary places (0 for XOR)
 * @param step   the lattice step in units of K (at least 1)
 * @param origin K of the first value on the lattice
 * @param ulps   whether values carry an ulp correction (otherwise they are exactly the lattice doubles)
 */
record ValueCoding(Kind kind, int scale, long step, long origin, boolean ulps) {

    enum Kind {
        XOR(0), DECIMAL(1), BINARY(2);

        final int code;

        Kind(int code) {
            this.code = code;
        }

        static Kind ofCode(int code) {
            for (Kind kind : values()) {
                if (kind.code == code) {
                    return kind;
                }
            }
            return null;
        }
    }

    /** The largest ulp correction kept on the lattice; a value further off is stored raw. */
    static final int MAX_ULPS = 16;
    static final int MAX_DECIMAL_SCALE = 15;
    static final int MAX_BINARY_SCALE = 1074;
    static final long MAX_EXACT_INTEGER = 1L << 53;
    static final ValueCoding XOR = new ValueCoding(Kind.XOR, 0, 1, 0, false);

    /** K of {@code value} at {@code scale} of {@code kind}; meaningful only when {@link #onScale} holds. */
    static long integer(Kind kind, int scale, double value) {
        return kind == Kind.DECIMAL ? (long) Math.rint(value * BlockFormat.POWERS_OF_TEN[scale])
                : (long) Math.scalb(value, scale);
    }

    /** Whether {@code value} is finite and its K at this scale is within 2^53 (and, binary, whole). */
    static boolean onScale(Kind kind, int scale, double value) {
        if (!Double.isFinite(value)) {
            return false;
        }
        double scaled = kind == Kind.DECIMAL ? Math.rint(value * BlockFormat.POWERS_OF_TEN[scale])
                : Math.scalb(value, scale);
        return Math.abs(scaled) < MAX_EXACT_INTEGER && (kind == Kind.DECIMAL || scaled == Math.rint(scaled));
    }

    /** The double a lattice integer stands for, before the ulp correction. */
    static double base(Kind kind, int scale, long integer) {
        return kind == Kind.DECIMAL ? integer / BlockFormat.POWERS_OF_TEN[scale] : Math.scalb((double) integer, -scale);
    }

    /** The ulp correction of {@code value} against its lattice integer (a difference of raw bit patterns). */
    static long correction(Kind kind, int scale, double value, long integer) {
        return Double.doubleToRawLongBits(value) - Double.doubleToRawLongBits(base(kind, scale, integer));
    }

    /** Whether {@code value} sits on this lattice, so it can be written without an escape. */
    boolean fits(double value) {
        if (kind == Kind.XOR || !onScale(kind, scale, value)) {
            return kind == Kind.XOR;
        }
        long integer = integer(kind, scale, value);
        long e = correction(kind, scale, value, integer);
        if (e != 0 && (!ulps || e < -MAX_ULPS || e > MAX_ULPS)) {
            return false;
        }
        return Math.floorMod(integer - origin, step) == 0;
    }
    /**
     * The coding that stores {@code values[0..n)} in the fewest bits: XOR, the coarsest decimal lattice that holds
     * them (give or take {@link #MAX_ULPS}), or the coarsest binary one, each tried on the values themselves.
     */
    static ValueCoding cheapest(double[] values, int n) {
        ValueCoding best = XOR;
        long bestBits = cost(XOR, values, n);
        for (ValueCoding candidate : new ValueCoding[] {decimal(values, n), binary(values, n)}) {
            if (candidate != null) {
                long bits = cost(candidate, values, n);
                if (bits < bestBits) {
                    best = candidate;
                    bestBits = bits;
                }
            }
        }
        return best;
    }

    static long cost(ValueCoding coding, double[] values, int n) {
        BitWriter bits = new BitWriter(Math.max(64, n));
        ValueWriter writer = new ValueWriter(coding, bits);
        for (int i = 0; i < n; i++) {
            writer.write(values[i]);
        }
        return bits.bitLength();
    }

    private static boolean near(Kind kind, int scale, double value) {
        if (!onScale(kind, scale, value)) {
            return false;
        }
        long e = correction(kind, scale, value, integer(kind, scale, value));
        return e >= -MAX_ULPS && e <= MAX_ULPS;
    }

    private static ValueCoding decimal(double[] values, int n) {
        int finite = 0;
        for (int i = 0; i < n; i++) {
            if (Double.isFinite(values[i])) {
                finite++;
            }
        }
        if (finite == 0) {
            return null;
        }
        int bestScale = -1;
        int bestFits = 0;
        for (int d = 0; d <= MAX_DECIMAL_SCALE && bestFits < finite; d++) {
            int fits = 0;
            for (int i = 0; i < n; i++) {
                if (near(Kind.DECIMAL, d, values[i])) {
                    fits++;
                }
            }
            if (fits > bestFits) {
                bestFits = fits;
                bestScale = d;
            }
        }
        return bestScale < 0 ? null : lattice(Kind.DECIMAL, bestScale, values, n);
    }

    private static ValueCoding binary(double[] values, int n) {
        int scale = -1;
        for (int i = 0; i < n; i++) {
            int needed = binaryPlaces(values[i]);
            if (needed <= MAX_BINARY_SCALE) {
                scale = Math.max(scale, needed);
            }
        }
        return scale < 0 ? null : lattice(Kind.BINARY, scale, values, n);
    }

    /** Binary places that make {@code value} whole; above {@link #MAX_BINARY_SCALE} when none (not finite). */
    private static int binaryPlaces(double value) {
        if (!Double.isFinite(value)) {
            return MAX_BINARY_SCALE + 1;
        }
        if (value == 0) {
            return 0;
        }
        long raw = Double.doubleToRawLongBits(value);
        int biased = (int) ((raw >>> 52) & 0x7FF);
        long mantissa = (raw & ((1L << 52) - 1)) | (biased == 0 ? 0 : 1L << 52);
        int exponent = (biased == 0 ? 1 : biased) - 1075;
        return Math.max(0, -(exponent + Long.numberOfTrailingZeros(mantissa)));
    }

    private static ValueCoding lattice(Kind kind, int scale, double[] values, int n) {
        boolean first = true;
        long origin = 0;
        long step = 0;
        boolean ulps = false;
        for (int i = 0; i < n; i++) {
            if (!near(kind, scale, values[i])) {
                continue;
            }
            long integer = integer(kind, scale, values[i]);
            if (first) {
                origin = integer;
                first = false;
            }
            step = gcd(step, Math.abs(integer - origin));
            ulps |= correction(kind, scale, values[i], integer) != 0;
        }
        return first ? null : new ValueCoding(kind, scale, Math.max(1, step), origin, ulps);
    }

    private static long gcd(long a, long b) {
        while (b != 0) {
            long t = a % b;
            a = b;
            b = t;
        }
        return a;
    }
}
