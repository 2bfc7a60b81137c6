package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;

import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.read.ListAppender;
import java.time.Duration;
import java.time.Instant;
import java.util.List;
import java.util.Map;
import java.util.concurrent.atomic.AtomicInteger;
import org.cryowarden.rules.engine.OutputCommand;
import org.junit.jupiter.api.Test;
import org.slf4j.LoggerFactory;

/**
 * A failed output write is logged with what asked for it: an interlock, a fill controller or the common-alarm
 * contact, each by its own name (the writer serves all three).
 */
class OutputWriterLogTest {

    private static final Instant AT = Instant.parse("2025-11-14T22:00:00Z");

    @Test
    void failedWriteNamesTheInterlockTheFillOrTheCommonAlarmContactThatAskedForIt() throws Exception {
        ListAppender<ILoggingEvent> logged = new ListAppender<>();
        Logger logger = (Logger) LoggerFactory.getLogger(OutputWriter.class);
        logged.start();
        logger.addAppender(logged);
        AtomicInteger results = new AtomicInteger();
        // No bus owns any output, so every write fails at once and is logged.
        OutputWriter writer = new OutputWriter(Map.of(), Duration.ofSeconds(1), (output, disagreement) ->
                results.incrementAndGet());
        try {
            writer.start();
            writer.offer(new OutputCommand(AT, "exhaust-fan", 1, "magnet-hall-ventilation",
                    "interlock magnet-hall-ventilation tripped by o2-magnet-hall-low"));
            writer.offer(new OutputCommand(AT, "ln2-fill-valve", 1, "ln2-dewar-fill",
                    "fill ln2-dewar-fill opened: 18 % below 20 %"));
            writer.offer(new OutputCommand(AT, "common-alarm", 1, CommonAlarmContact.SOURCE, "all well"));
            long deadline = System.nanoTime() + Duration.ofSeconds(10).toNanos();
            while (results.get() < 3 && System.nanoTime() < deadline) {
                Thread.sleep(10); // the writer's own thread; a bounded wait for its real effect
            }
        } finally {
            writer.close();
            logger.detachAppender(logged);
        }
        List<String> lines = logged.list.stream().map(ILoggingEvent::getFormattedMessage).toList();
        assertThat(lines).containsExactly(
                "output exhaust-fan := 1.0 for interlock magnet-hall-ventilation tripped by o2-magnet-hall-low: "
                        + "no bus drives output 'exhaust-fan'",
                "output ln2-fill-valve := 1.0 for fill ln2-dewar-fill opened: 18 % below 20 %: "
                        + "no bus drives output 'ln2-fill-valve'",
                "output common-alarm := 1.0 for the common-alarm contact (all well): "
                        + "no bus drives output 'common-alarm'");
        assertThat(lines).noneMatch(line -> line.contains("for interlock common-alarm")
                || line.contains("for interlock ln2-dewar-fill"));
    }
}
