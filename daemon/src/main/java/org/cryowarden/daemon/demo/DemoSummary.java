package org.cryowarden.daemon.demo;

import java.time.Duration;
import java.util.OptionalDouble;

/**
 * What an accelerated night amounted to.
 *
 * @param lowestOxygenSeen the lowest GOOD reading of the magnet hall's lowest-oxygen channel, %vol
 * @param lowestOxygenTrue the simulator's true lowest oxygen fraction in the magnet hall, %vol
 */
public record DemoSummary(Duration simulated, Duration real, long alarmsRaised, long acknowledged, long trips,
                          long resets, long events, OptionalDouble lowestOxygenSeen, OptionalDouble lowestOxygenTrue) {

    /** The closing lines of the demo. */
    String text() {
        return String.format(java.util.Locale.ROOT, """
                Night summary (%s simulated in %.0f s):
                  alarms raised        %d
                  acknowledged         %d
                  interlock trips      %d
                  interlock resets     %d
                  events journaled     %d
                  lowest oxygen seen   %s (true lowest in the room %s)""",
                org.cryowarden.rules.DurationSyntax.format(simulated), real.toMillis() / 1000.0, alarmsRaised,
                acknowledged, trips, resets, events, percent(lowestOxygenSeen), percent(lowestOxygenTrue));
    }

    private static String percent(OptionalDouble value) {
        return value.isPresent() ? String.format(java.util.Locale.ROOT, "%.1f %%vol", value.getAsDouble()) : "none";
    }
}
