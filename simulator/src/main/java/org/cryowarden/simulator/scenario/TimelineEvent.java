package org.cryowarden.simulator.scenario;

import java.time.Duration;
import java.util.Objects;
import org.cryowarden.rules.SourcePosition;

/**
 * One scripted moment of the night: at {@code at} after the start, {@code action} happens to {@code target}.
 * Entries marked {@code when: standalone} stand in for what a running daemon would do (an interlock starting the
 * exhaust fan) and are skipped when the simulator runs under a daemon.
 */
public record TimelineEvent(Duration at, String action, String target, boolean standaloneOnly,
        SourcePosition position, Effect effect) {

    /** What the event does, applied on the simulation thread. */
    @FunctionalInterface
    public interface Effect {
        void apply(ScenarioContext context) throws java.io.IOException;
    }

    public TimelineEvent {
        Objects.requireNonNull(at, "at");
        Objects.requireNonNull(action, "action");
        Objects.requireNonNull(effect, "effect");
    }

    /** "02:10:00 quench magnet-a" for logs. */
    public String describe() {
        long seconds = at.toSeconds();
        return String.format("%02d:%02d:%02d %s %s", seconds / 3600, seconds / 60 % 60, seconds % 60, action, target);
    }
}
