package org.cryowarden.rules.model;

/** The range in which a channel's value is physically plausible, in the channel's unit; outside is BAD. */
public record ValueRange(double min, double max) {

    public ValueRange {
        if (!(min < max)) {
            throw new IllegalArgumentException("a valid range needs min < max, got [" + min + ", " + max + "]");
        }
    }

    public boolean contains(double value) {
        return value >= min && value <= max;
    }
}
