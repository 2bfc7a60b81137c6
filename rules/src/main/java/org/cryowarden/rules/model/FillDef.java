package org.cryowarden.rules.model;

import java.time.Duration;
import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;

/**
 * An automatic fill of a nitrogen dewar or cold trap, the one closed loop cryowarden runs: open {@code valve}
 * (write {@code openValue}) when {@code channel} is below {@code startBelow}, close it (write the output's safe
 * value) at {@code stopAbove}. A fill that is open longer than {@code maxOpen}, or whose level rises less than
 * {@code minRise} in any {@code riseWindow} while open (supply empty, valve stuck), is closed and locked out
 * until an operator resets it, and its fault alarm (id = this fill's id, with {@code alarm}'s priority and
 * message) raises. No fill starts, and a running one stops, while any alarm of {@code blockedBy} is active.
 */
public record FillDef(
        String id,
        String channel,
        String valve,
        Quantity startBelow,
        Quantity stopAbove,
        double openValue,
        Duration maxOpen,
        Quantity minRise,
        Duration riseWindow,
        List<String> blockedBy,
        AlarmOptions alarm,
        SourcePosition position) {

    public FillDef {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(valve, "valve");
        Objects.requireNonNull(startBelow, "startBelow");
        Objects.requireNonNull(stopAbove, "stopAbove");
        Objects.requireNonNull(maxOpen, "maxOpen");
        Objects.requireNonNull(minRise, "minRise");
        Objects.requireNonNull(riseWindow, "riseWindow");
        blockedBy = List.copyOf(blockedBy);
        Objects.requireNonNull(alarm, "alarm");
        Objects.requireNonNull(position, "position");
        if (maxOpen.isZero() || maxOpen.isNegative() || riseWindow.isZero() || riseWindow.isNegative()) {
            throw new IllegalArgumentException("fill " + id + " needs a positive maximum open time and rise window");
        }
        if (riseWindow.compareTo(maxOpen) > 0) {
            throw new IllegalArgumentException("fill " + id + ": the rise window " + riseWindow
                    + " is longer than the maximum open time " + maxOpen);
        }
        if (!(minRise.value() > 0)) {
            throw new IllegalArgumentException("fill " + id + " needs a positive minimum rise, got " + minRise);
        }
    }
}
