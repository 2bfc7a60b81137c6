package org.cryowarden.drivers.text;

import java.util.Optional;

/**
 * How a text message ends on the wire. IEEE 488.2 (§7.5, §8.5) ends messages with LF on serial and socket
 * links; CR LF is common on serial devices. Readers accept both: a line ends at LF and a CR before it is dropped.
 */
public enum Terminator {
    LF("\n"), CRLF("\r\n");

    private final String text;

    Terminator(String text) {
        this.text = text;
    }

    public String text() {
        return text;
    }

    public String configName() {
        return this == LF ? "lf" : "crlf";
    }

    public static Optional<Terminator> fromConfig(String name) {
        return switch (name) {
            case "lf" -> Optional.of(LF);
            case "crlf" -> Optional.of(CRLF);
            default -> Optional.empty();
        };
    }
}
