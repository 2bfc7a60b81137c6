package org.cryowarden.drivers.builtin;

import java.util.Optional;
import org.cryowarden.drivers.line.LinePattern;

/**
 * One validated point of a text instrument: the query that asks for it (absent in stream mode), the pattern that
 * finds the value (line driver only), and for SCPI outputs the command with a {@code {value}} placeholder.
 */
record TextPoint(String id, boolean output, Optional<String> query, Optional<LinePattern> pattern,
        Optional<String> command, Optional<String> readback) {
}
