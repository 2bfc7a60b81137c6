package org.cryowarden.daemon.run;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.CompletableFuture;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.rules.config.ConfigurationLoader;
import org.cryowarden.rules.config.DriverSettingsValidator;
import org.cryowarden.rules.engine.Engine;
import org.cryowarden.rules.engine.EngineConfig;
import org.cryowarden.rules.engine.OutputCommand;
import org.junit.jupiter.api.Test;

/**
 * The {@code reset} verb on the engine thread: it resets a fill controller locked out after a fill without level
 * rise, journals the reset with the fill's new state under {@code fill:<id>}, and refuses a second reset. The cold
 * trap (start below 30 %, at least 2 % rise in 5 min) is an invented example.
 */
class EngineLoopFillResetTest {

    private static final Instant START = Instant.parse("2025-01-15T18:00:00Z");

    @Test
    void resetVerbUnlocksALockedOutFillAndRecordsItsState() throws Exception {
        VirtualTimeSource clock = new VirtualTimeSource(START);
        List<EventBatch> batches = new ArrayList<>();
        List<OutputCommand> outputs = new ArrayList<>();
        EngineLoop loop = loop(clock, batches, outputs);

        read(loop, clock, 25);
        // The supply is empty: 0.2 %/min, less than the 2 % in 5 min asked for.
        for (int minute = 1; minute <= 5; minute++) {
            clock.advance(Duration.ofMinutes(1));
            read(loop, clock, 25 + 0.2 * minute);
        }
        assertThat(kinds(batches)).containsExactly("fill.started trap-fill", "output.command trap-valve",
                "fill.stopped trap-fill", "output.command trap-valve", "alarm.raised trap-fill");
        assertThat(lastState(batches, "fill:trap-fill").orElseThrow()).contains("\"locked_out\":true",
                "\"lockout\":\"fill stopped (no-rise): level rose 0.8 % in 5min");
        assertThat(outputs).extracting(OutputCommand::value).containsExactly(1.0, 0.0);
        batches.clear();

        CompletableFuture<Optional<String>> reset = loop.command(new OperatorCommand("reset", "trap-fill",
                "night operator", "", Optional.empty(), ""));
        loop.drain();

        assertThat(reset.get()).isEmpty();
        // The accepted command is journaled too, so that a replay can re-apply it.
        assertThat(kinds(batches)).containsExactly("fill.reset trap-fill", "alarm.cleared trap-fill",
                "command.accepted trap-fill");
        assertThat(batches.get(0).events().get(0).operator()).contains("night operator");
        assertThat(lastState(batches, "fill:trap-fill").orElseThrow()).contains("\"locked_out\":false");
        assertThat(batches.get(0).states()).containsKey("trap-fill");

        CompletableFuture<Optional<String>> again = loop.command(new OperatorCommand("reset", "trap-fill",
                "night operator", "", Optional.empty(), ""));
        loop.drain();
        assertThat(again.get()).contains("fill trap-fill is idle, not locked out: there is nothing to reset");
    }

    // ---- helpers ----

    private static EngineLoop loop(VirtualTimeSource clock, List<EventBatch> batches, List<OutputCommand> outputs)
            throws ConfigException {
        Configuration configuration = ConfigurationLoader.load(Path.of("src/test/resources/run/trap-site.yaml"),
                List.of(Path.of("src/test/resources/run/trap-rules.yaml")), DriverSettingsValidator.acceptAll());
        Engine engine = new Engine(EngineConfig.of(configuration.site(), configuration.rules()), clock);
        return new EngineLoop(engine, configuration.site(), clock, Duration.ofSeconds(1), new EngineLoop.Sinks() {
            @Override
            public void batch(EventBatch batch) {
                batches.add(batch);
            }

            @Override
            public void reading(Reading reading) {
            }

            @Override
            public void output(OutputCommand command) {
                outputs.add(command);
            }
        });
    }

    private static void read(EngineLoop loop, VirtualTimeSource clock, double percent) {
        loop.offer(Reading.good("trap-level", percent, Unit.PERCENT, clock.wallNow()));
        loop.drain();
    }

    private static List<String> kinds(List<EventBatch> batches) {
        return batches.stream().flatMap(b -> b.events().stream())
                .map(e -> e.kind() + " " + e.subject().orElse("")).toList();
    }

    private static Optional<String> lastState(List<EventBatch> batches, String key) {
        Optional<String> state = Optional.empty();
        for (EventBatch batch : batches) {
            if (batch.states().containsKey(key)) {
                state = Optional.of(batch.states().get(key));
            }
        }
        return state;
    }
}
