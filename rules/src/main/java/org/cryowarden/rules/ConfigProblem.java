package org.cryowarden.rules;

import java.util.Objects;

/**
 * One error found in a configuration file, printed as {@code FILE:LINE:COLUMN: message} so that editors can
 * jump to it. The message says what was found, what was expected and, where a close name exists, a
 * "did you mean".
 */
public record ConfigProblem(SourcePosition position, String message) {

    public ConfigProblem {
        Objects.requireNonNull(position, "position");
        Objects.requireNonNull(message, "message");
    }

    @Override
    public String toString() {
        return position + ": " + message;
    }
}
