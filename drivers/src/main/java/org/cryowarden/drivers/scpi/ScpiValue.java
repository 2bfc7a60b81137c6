package org.cryowarden.drivers.scpi;

import java.util.Objects;

/**
 * A numeric response as SCPI defines it: a number, the not-a-number value 9.91E37, the overflow values
 * +9.9E37 / -9.9E37 (SCPI 1999, Volume 1, §7.2.1.4-§7.2.1.5, from memory of the section numbers), or text that
 * is not a number at all.
 */
public sealed interface ScpiValue {

    record Number(double value) implements ScpiValue {
    }

    /** 9.91E37: the instrument has no value (SCPI NAN). */
    record NotANumber() implements ScpiValue {
    }

    /** +9.9E37 or -9.9E37: the measurement is above or below what the instrument can represent. */
    record Overflow(boolean positive) implements ScpiValue {
    }

    /** Not an NR1/NR2/NR3 number (IEEE 488.2, §8.7.2-§8.7.4). */
    record Malformed(String text) implements ScpiValue {
        public Malformed {
            Objects.requireNonNull(text, "text");
        }
    }
}
