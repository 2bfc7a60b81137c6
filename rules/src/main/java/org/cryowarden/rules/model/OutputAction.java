package org.cryowarden.rules.model;

import java.util.Objects;

/** One write an interlock performs when it trips: set {@code output} to {@code value}. */
public record OutputAction(String output, double value) {

    public OutputAction {
        Objects.requireNonNull(output, "output");
    }
}
