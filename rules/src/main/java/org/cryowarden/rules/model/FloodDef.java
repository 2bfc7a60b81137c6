package org.cryowarden.rules.model;

import java.time.Duration;
import java.util.Objects;

/**
 * When the alarms come too fast for one operator: a flood starts when more than {@code moreThan} alarms activate
 * within {@code within} and ends when fewer than {@code endsBelow} did in the last {@code within}. The defaults
 * are the EEMUA 191 benchmark (more than 10 alarms in 10 minutes per operator), with the end criterion of
 * ANSI/ISA-18.2-2016 guidance (fewer than 5 in 10 minutes).
 */
public record FloodDef(int moreThan, Duration within, int endsBelow) {

    /** EEMUA 191 / ANSI/ISA-18.2: more than 10 in 10 minutes starts a flood, fewer than 5 ends it. */
    public static final FloodDef DEFAULT = new FloodDef(10, Duration.ofMinutes(10), 5);

    public FloodDef {
        Objects.requireNonNull(within, "within");
        if (moreThan < 1) {
            throw new IllegalArgumentException("a flood needs more than at least 1 alarm, got " + moreThan);
        }
        if (within.isZero() || within.isNegative()) {
            throw new IllegalArgumentException("a flood window must be positive, got " + within);
        }
        if (endsBelow < 1 || endsBelow > moreThan) {
            throw new IllegalArgumentException("a flood must end below 1 to " + moreThan + " alarms, got " + endsBelow);
        }
    }
}
