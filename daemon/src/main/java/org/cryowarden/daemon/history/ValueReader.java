package org.cryowarden.daemon.history;

/** Reads what {@link ValueWriter} wrote, in the same coding, mirroring its state. */
final class ValueReader {

    private final ValueCoding coding;
    private final BitReader in;
    private int count;
    private long valueBits;
    private int leading = -1;
    private int trailing;
    private long integer;
    private long sum = 4;
    private int seen = 1;
    private boolean haveEscape;
    private long escapeBits;

    ValueReader(ValueCoding coding, BitReader in) {
        this.coding = coding;
        this.in = in;
        this.integer = coding.origin();
    }

    /**
     * The next value.
     *
     * @throws Malformed when the bits cannot be what a writer wrote
     */
    double next() throws BitReader.EndOfBits, Malformed {
        double value = coding.kind() == ValueCoding.Kind.XOR ? nextXor() : nextOnLattice();
        count++;
        return value;
    }

    /** Bits that no writer produces. */
    static final class Malformed extends Exception {
        Malformed(String message) {
            super(message, null, false, false);
        }
    }

    private double nextOnLattice() throws BitReader.EndOfBits, Malformed {
        int r = ValueWriter.parameter(sum, seen);
        int ones = 0;
        while (ones < ValueWriter.ESCAPE_ONES && in.readBit()) {
            ones++;
        }
        long zigzag;
        if (ones < ValueWriter.ESCAPE_ONES) {
            zigzag = ((long) ones << r) | in.read(r);
        } else if (!in.readBit()) {
            zigzag = in.read(64);
        } else {
            if (in.readBit()) {
                escapeBits = in.read(64);
            } else if (!haveEscape) {
                throw new Malformed("repeats an escaped value before any");
            }
            haveEscape = true;
            return Double.longBitsToDouble(escapeBits);
        }
        sum += Math.min(zigzag, ValueWriter.MAX_COUNTED);
        if (++seen == ValueWriter.WINDOW) {
            sum >>= 1;
            seen >>= 1;
        }
        long k = (zigzag >>> 1) ^ -(zigzag & 1);
        integer += k * coding.step();
        if (Math.abs(integer) >= ValueCoding.MAX_EXACT_INTEGER) {
            throw new Malformed("leaves the lattice's exact range");
        }
        long base = Double.doubleToRawLongBits(ValueCoding.base(coding.kind(), coding.scale(), integer));
        if (!coding.ulps()) {
            return Double.longBitsToDouble(base);
        }
        long e;
        if (!in.readBit()) {
            e = 0;
        } else if (!in.readBit()) {
            e = 1;
        } else if (!in.readBit()) {
            e = -1;
        } else {
            long z = in.read(5) + 3;
            e = (z >>> 1) ^ -(z & 1);
        }
        return Double.longBitsToDouble(base + e);
    }

    private double nextXor() throws BitReader.EndOfBits, Malformed {
        if (count == 0) {
            valueBits = in.read(64);
        } else if (in.readBit()) {
            if (!in.readBit()) {
                if (leading < 0) {
                    throw new Malformed("reuses a bit window that was never set");
                }
                valueBits ^= in.read(64 - leading - trailing) << trailing;
            } else {
                leading = (int) in.read(5);
                int significant = (int) in.read(6);
                if (significant == 0) {
                    significant = 64;
                }
                trailing = 64 - leading - significant;
                if (trailing < 0) {
                    throw new Malformed("has a bit window wider than 64 bits");
                }
                valueBits ^= in.read(significant) << trailing;
            }
        }
        return Double.longBitsToDouble(valueBits);
    }
}
