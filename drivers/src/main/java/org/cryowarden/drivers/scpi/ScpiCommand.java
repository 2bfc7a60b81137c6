package org.cryowarden.drivers.scpi;

import java.util.List;
import java.util.Objects;

/**
 * One program message unit as an instrument receives it: a header ({@code MEAS:TEMP}, {@code *IDN}), whether it
 * is a query (ends with {@code ?}), and its parameters as written (quoted strings keep their quotes).
 */
public record ScpiCommand(String header, boolean query, List<String> parameters) {

    public ScpiCommand {
        Objects.requireNonNull(header, "header");
        parameters = List.copyOf(parameters);
    }

    /**
     * True when this command's header is one of the forms {@code pattern} allows: the pattern is written the SCPI
     * way, upper case for the short form and lower case for the rest ("MEASure:TEMPerature"), and each node of the
     * header must be either the short or the long form, in any case. Common commands ("*IDN") match exactly.
     */
    public boolean matches(String pattern) {
        return ScpiHeaders.matches(pattern, header);
    }
}
