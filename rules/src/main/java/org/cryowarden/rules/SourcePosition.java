package org.cryowarden.rules;

import java.util.Objects;

/**
 * Where something was written in a configuration file, 1-based for people, printed {@code file:line:column}.
 */
public record SourcePosition(String file, int line, int column) {

    /** For values that were not read from a file (defaults, values built in code or tests). */
    public static final SourcePosition NONE = new SourcePosition("<built-in>", 0, 0);

    public SourcePosition {
        Objects.requireNonNull(file, "file");
    }

    @Override
    public String toString() {
        return line <= 0 ? file : file + ":" + line + ":" + column;
    }
}
