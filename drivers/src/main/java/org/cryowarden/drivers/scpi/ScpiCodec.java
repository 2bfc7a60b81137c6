package org.cryowarden.drivers.scpi;

import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import org.cryowarden.drivers.text.Terminator;

/**
 * SCPI text framing for both sides, without I/O: the controller's query bytes and the instrument's parsing of a
 * received program message (units separated by {@code ;}, header and parameters separated by white space,
 * parameters by {@code ,}), after IEEE 488.2-1992, §7 (program messages) and §8 (response messages).
 */
public final class ScpiCodec {

    /** The query an instrument identifies itself with (IEEE 488.2, §10.14). */
    public static final String IDENTIFY = "*IDN?";
    /** Reads one entry of the error queue (SCPI 1999, Volume 2, SYSTem:ERRor). */
    public static final String NEXT_ERROR = "SYST:ERR?";

    private ScpiCodec() {
    }

    /** The bytes of a program message with its terminator. */
    public static byte[] encode(String message, Terminator terminator) {
        if (message.indexOf('\n') >= 0 || message.indexOf('\r') >= 0) {
            throw new IllegalArgumentException("a SCPI message must not contain a line break: " + message);
        }
        return (message + terminator.text()).getBytes(StandardCharsets.ISO_8859_1);
    }

    /**
     * The program message units of one received line, or empty when the line is not well formed (an empty header,
     * an unterminated string). A trailing {@code ;} is allowed.
     */
    public static Optional<List<ScpiCommand>> parseProgramMessage(String line) {
        Optional<List<String>> units = splitOutsideQuotes(line.strip(), ';');
        if (units.isEmpty()) {
            return Optional.empty();
        }
        List<ScpiCommand> commands = new ArrayList<>();
        for (String unit : units.get()) {
            String trimmed = unit.strip();
            if (trimmed.isEmpty()) {
                continue;
            }
            int space = indexOfWhitespace(trimmed);
            String header = space < 0 ? trimmed : trimmed.substring(0, space);
            String rest = space < 0 ? "" : trimmed.substring(space).strip();
            boolean query = header.endsWith("?");
            String name = query ? header.substring(0, header.length() - 1) : header;
            if (name.isEmpty() || name.equals(":") || !name.matches("[*:]?[A-Za-z][A-Za-z0-9]*+(?::[A-Za-z][A-Za-z0-9]*+)*+")) {
                return Optional.empty();
            }
            List<String> parameters = new ArrayList<>();
            if (!rest.isEmpty()) {
                // The header holds no quote (checked above) and every quote of the line closes, so these do too.
                for (String parameter : splitOutsideQuotes(rest, ',').orElseThrow()) {
                    parameters.add(parameter.strip());
                }
            }
            commands.add(new ScpiCommand(name, query, parameters));
        }
        return Optional.of(commands);
    }

    /** The parts of {@code text} between separators outside quotes, or empty when a quote is left open. */
    private static Optional<List<String>> splitOutsideQuotes(String text, char separator) {
        List<String> parts = new ArrayList<>();
        StringBuilder current = new StringBuilder();
        char quote = 0;
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            if (quote != 0) {
                if (c == quote) {
                    quote = 0;
                }
            } else if (c == '"' || c == '\'') {
                quote = c;
            } else if (c == separator) {
                parts.add(current.toString());
                current.setLength(0);
                continue;
            }
            current.append(c);
        }
        parts.add(current.toString());
        return quote == 0 ? Optional.of(parts) : Optional.empty();
    }

    private static int indexOfWhitespace(String text) {
        for (int i = 0; i < text.length(); i++) {
            if (Character.isWhitespace(text.charAt(i))) {
                return i;
            }
        }
        return -1;
    }
}
