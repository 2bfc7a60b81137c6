package org.cryowarden.daemon.cli;

import java.io.PrintWriter;
import java.time.Duration;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.cryowarden.daemon.bench.Bench;
import org.cryowarden.daemon.bench.BenchResult;
import org.cryowarden.daemon.bench.BenchSettings;
import org.cryowarden.daemon.run.Payloads;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * {@code cryowarden bench SUITE}: measures one part of the program against a reference taken in the same run and
 * prints the figures with their ratio; {@code --json} prints one object instead. The exit code says whether the
 * suite ran, not whether its target was met (that depends on the machine).
 */
@Command(name = "bench", mixinStandardHelpOptions = true,
        description = {"Measure a part of cryowarden against a baseline or physical limit in the same run.",
            "Suites: engine, bus, latency, publish, footprint, simulate."})
final class BenchCommand implements Callable<Integer> {

    static final int BAD_INPUT = 2;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "SUITE", description = "engine, bus, latency, publish, footprint or simulate")
    String suite;

    @Option(names = "--json", description = "print one JSON object: suite, figures, reference, ratio, target,"
            + " meets_target")
    boolean json;

    @Option(names = "--seconds", paramLabel = "N",
            description = "measure each phase for N seconds instead of the suite's full length (a smoke run)")
    Integer seconds;

    @Option(names = "--broker", paramLabel = "URI", defaultValue = "tcp://127.0.0.1:1883",
            description = "MQTT broker for latency, publish and footprint (default ${DEFAULT-VALUE}; the embedded"
                    + " broker when none answers there)")
    String broker;

    @Option(names = "--stages", description = "latency: also time each hand-off on the alarm path (a Flight"
            + " Recorder stream in the process, which costs some CPU of its own)")
    boolean stages;

    @Option(names = "--together", description = "latency, footprint: poll each bus's instruments together (the"
            + " site setting polling: {spread: false}), not spread over their period")
    boolean together;

    @Override
    public Integer call() throws Exception {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        if (!Bench.SUITES.contains(suite)) {
            err.println("bench: unknown suite '" + suite + "'; expected one of " + String.join(", ", Bench.SUITES));
            err.flush();
            return BAD_INPUT;
        }
        if (seconds != null && seconds < 1) {
            err.println("bench: --seconds must be at least 1, got " + seconds);
            err.flush();
            return BAD_INPUT;
        }
        if (!broker.matches("tcp://[^:/]+:\\d{1,5}")) {
            err.println("bench: --broker must look like tcp://HOST:PORT, got '" + broker + "'");
            err.flush();
            return BAD_INPUT;
        }
        BenchSettings settings = new BenchSettings(Optional.ofNullable(seconds).map(Duration::ofSeconds), broker, stages,
                together, err);
        BenchResult result = Bench.run(suite, settings);
        out.println(json ? Payloads.text(result.json()) : result.text());
        out.flush();
        return 0;
    }
}
