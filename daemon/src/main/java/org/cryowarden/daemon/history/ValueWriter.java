package org.cryowarden.daemon.history;

/**
 * Writes the values of a block into its value stream in one {@link ValueCoding}. XOR is Gorilla's value coding
 * (Pelkonen et al., VLDB 2015, section 4.1.2) as in version 1. On a lattice each value is the zigzagged difference of
 * its k from the previous value's, in a Golomb-Rice code whose parameter adapts to the recent mean as in LOCO-I /
 * JPEG-LS (Weinberger, Seroussi, Sapiro, IEEE Trans. Image Processing 9(8), 2000), then its ulp correction; values
 * off the lattice (NaN with its payload, infinities, -0.0, noise) escape to their raw 64 bits, a repeat of the
 * previous escape costing a few bits. {@link ValueReader} mirrors every state change.
 */
final class ValueWriter {

    /** Rice quotients from this many ones on are an escape. */
    static final int ESCAPE_ONES = 20;
    /** The adaptive parameter's window: the sums halve every this many values. */
    static final int WINDOW = 32;
    static final long MAX_COUNTED = 1L << 40;

    private final ValueCoding coding;
    private final BitWriter bits;
    private int count;
    // XOR state
    private long prevValueBits;
    private int prevLeading = -1;
    private int prevTrailing;
    // lattice state
    private long prevInteger;
    private long sum = 4;
    private int seen = 1;
    private boolean haveEscape;
    private long prevEscapeBits;
    private int escapes;

    ValueWriter(ValueCoding coding, BitWriter bits) {
        this.coding = coding;
        this.bits = bits;
        this.prevInteger = coding.origin();
    }

    ValueCoding coding() {
        return coding;
    }

    /** Values written raw because they were off the lattice. */
    int escapes() {
        return escapes;
    }

    void write(double value) {
        if (coding.kind() == ValueCoding.Kind.XOR) {
            writeXor(Double.doubleToRawLongBits(value));
        } else if (coding.fits(value)) {
            long integer = ValueCoding.integer(coding.kind(), coding.scale(), value);
            long k = (integer - prevInteger) / coding.step();
            prevInteger = integer;
            writeDifference((k << 1) ^ (k >> 63));
            if (coding.ulps()) {
                writeCorrection(ValueCoding.correction(coding.kind(), coding.scale(), value, integer));
            }
        } else {
            writeEscape(Double.doubleToRawLongBits(value));
        }
        count++;
    }

    /** The Rice parameter for the next difference: the smallest r with seen * 2^r >= sum. */
    static int parameter(long sum, int seen) {
        int r = 0;
        while (((long) seen << r) < sum && r < 62) {
            r++;
        }
        return r;
    }

    private void writeDifference(long zigzag) {
        int r = parameter(sum, seen);
        long quotient = zigzag >>> r;
        if (quotient < ESCAPE_ONES) {
            for (long i = 0; i < quotient; i++) {
                bits.writeBit(true);
            }
            bits.writeBit(false);
            bits.write(zigzag, r);
        } else {
            bits.write(-1L, ESCAPE_ONES);
            bits.writeBit(false);
            bits.write(zigzag, 64);
        }
        sum += Math.min(zigzag, MAX_COUNTED);
        if (++seen == WINDOW) {
            sum >>= 1;
            seen >>= 1;
        }
    }

    private void writeCorrection(long e) {
        if (e == 0) {
            bits.writeBit(false);
        } else if (e == 1) {
            bits.write(0b10, 2);
        } else if (e == -1) {
            bits.write(0b110, 3);
        } else {
            bits.write(0b111, 3);
            bits.write(((e << 1) ^ (e >> 63)) - 3, 5);
        }
    }

    private void writeEscape(long raw) {
        bits.write(-1L, ESCAPE_ONES);
        bits.writeBit(true);
        if (haveEscape && raw == prevEscapeBits) {
            bits.writeBit(false);
        } else {
            bits.writeBit(true);
            bits.write(raw, 64);
        }
        haveEscape = true;
        prevEscapeBits = raw;
        escapes++;
    }

    private void writeXor(long valueBits) {
        if (count == 0) {
            bits.write(valueBits, 64);
            prevValueBits = valueBits;
            return;
        }
        long xor = valueBits ^ prevValueBits;
        prevValueBits = valueBits;
        if (xor == 0) {
            bits.writeBit(false);
            return;
        }
        int leading = Math.min(31, Long.numberOfLeadingZeros(xor));
        int trailing = Long.numberOfTrailingZeros(xor);
        if (prevLeading >= 0 && leading >= prevLeading && trailing >= prevTrailing) {
            bits.write(0b10, 2);
            bits.write(xor >>> prevTrailing, 64 - prevLeading - prevTrailing);
        } else {
            int significant = 64 - leading - trailing;
            bits.write(0b11, 2);
            bits.write(leading, 5);
            bits.write(significant & 63, 6);
            bits.write(xor >>> trailing, significant);
            prevLeading = leading;
            prevTrailing = trailing;
        }
    }
}
