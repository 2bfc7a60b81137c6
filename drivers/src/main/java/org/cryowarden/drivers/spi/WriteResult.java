package org.cryowarden.drivers.spi;

import java.util.Objects;
import java.util.OptionalDouble;

/**
 * The outcome of one output write.
 *
 * @param output    the output id
 * @param requested the value asked for
 * @param readback  the value read back from the device after the write, when the device allows it
 * @param ok        true when the device confirmed the write (and the readback, if any, matches)
 * @param reason    why not, for the journal and the operator; empty when {@code ok}
 */
public record WriteResult(String output, double requested, OptionalDouble readback, boolean ok, String reason) {

    public WriteResult {
        Objects.requireNonNull(output, "output");
        Objects.requireNonNull(readback, "readback");
        Objects.requireNonNull(reason, "reason");
    }

    public static WriteResult confirmed(String output, double requested, OptionalDouble readback) {
        return new WriteResult(output, requested, readback, true, "");
    }

    public static WriteResult failed(String output, double requested, String reason) {
        return new WriteResult(output, requested, OptionalDouble.empty(), false, reason);
    }
}
