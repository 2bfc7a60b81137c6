package org.cryowarden.rules.engine;

import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Objects;

/**
 * More alarms activated within the flood window than one operator can handle (EEMUA 191: more than 10 in
 * 10 minutes): notifiers page once for the flood, naming the first-out alarm, instead of once per alarm.
 *
 * @param count         alarm activations in the window when the flood was recognised
 * @param window        the flood window
 * @param firstOutAlarm the alarm that activated first among them, where to start looking
 * @param firstOutAt    when it activated
 * @param alarms        the alarms of those activations, oldest first (an alarm may appear more than once)
 */
public record FloodStarted(Instant instant, int count, Duration window, String firstOutAlarm, Instant firstOutAt,
        List<String> alarms, String cause) implements EngineEvent {

    public FloodStarted {
        Objects.requireNonNull(instant, "instant");
        Objects.requireNonNull(window, "window");
        Objects.requireNonNull(firstOutAlarm, "firstOutAlarm");
        Objects.requireNonNull(firstOutAt, "firstOutAt");
        alarms = List.copyOf(alarms);
        Objects.requireNonNull(cause, "cause");
    }
}
