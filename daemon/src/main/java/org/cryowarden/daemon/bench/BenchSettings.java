package org.cryowarden.daemon.bench;

import java.io.PrintWriter;
import java.time.Duration;
import java.util.Optional;

/**
 * How one suite runs.
 *
 * @param seconds  the measuring time per measured phase; empty for the suite's own default (the full run)
 * @param broker   the MQTT broker to measure against (tcp://HOST:PORT)
 * @param stages   whether the latency suite also times each hand-off on the alarm path
 * @param together whether the latency and footprint plants poll each bus's instruments together (site
 *                 {@code polling: {spread: false}}) instead of spread over the period
 * @param progress where to say what is happening while it runs (stderr of the command)
 */
public record BenchSettings(Optional<Duration> seconds, String broker, boolean stages, boolean together,
        PrintWriter progress) {

    /** The measuring time: the one asked for, or {@code fullRun}. */
    Duration measure(Duration fullRun) {
        return seconds.orElse(fullRun);
    }

    /** A warm-up before measuring: a quarter of the measuring time, at most 5 s. */
    Duration warmUp(Duration fullRun) {
        Duration measure = measure(fullRun);
        Duration quarter = measure.dividedBy(4);
        return quarter.compareTo(Duration.ofSeconds(5)) > 0 ? Duration.ofSeconds(5) : quarter;
    }

    void say(String line) {
        progress.println("bench: " + line);
        progress.flush();
    }
}
