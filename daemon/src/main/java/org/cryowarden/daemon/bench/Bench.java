package org.cryowarden.daemon.bench;

import java.util.List;

/**
 * The bench suites, by name. Each runs in this process and measures its figure against a reference taken in the
 * same run (a bare baseline loop or a physical limit), so the ratio holds on a noisy machine even when the
 * absolute figure does not.
 */
public final class Bench {

    public static final List<String> SUITES = List.of("engine", "bus", "latency", "publish", "footprint", "simulate");

    private Bench() {
    }

    /**
     * Runs one suite.
     *
     * @throws IllegalArgumentException for a suite name not in {@link #SUITES}
     * @throws Exception when the suite's set-up failed (broker, ports, files)
     */
    public static BenchResult run(String suite, BenchSettings settings) throws Exception {
        return switch (suite) {
            case "engine" -> new EngineSuite().run(settings);
            case "bus" -> new BusSuite().run(settings);
            case "latency" -> new LatencySuite().run(settings);
            case "publish" -> new PublishSuite().run(settings);
            case "footprint" -> new FootprintSuite().run(settings);
            case "simulate" -> new SimulateSuite().run(settings);
            default -> throw new IllegalArgumentException("unknown suite '" + suite + "'; expected one of "
                    + String.join(", ", SUITES));
        };
    }
}
