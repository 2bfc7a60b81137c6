package org.cryowarden.daemon.demo;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.cryowarden.simulator.Endpoint;

/**
 * The built runnable jar started as a process of its own, its output in a file, and the example site rewritten
 * to reach the simulator's TCP ports and a given broker. The jar comes from the {@code cryowarden.jar} system
 * property (set by the integration-test execution).
 */
final class JarProcess implements AutoCloseable {

    static final Path JAR = Path.of(System.getProperty("cryowarden.jar", "target/cryowarden.jar"));

    final Process process;
    final Path log;

    private JarProcess(Process process, Path log) {
        this.process = process;
        this.log = log;
    }

    static JarProcess start(Path log, String... arguments) throws IOException {
        List<String> command = new ArrayList<>(List.of(Path.of(System.getProperty("java.home"), "bin", "java")
                .toString(), "-Xmx256m", "-jar", JAR.toString()));
        command.addAll(List.of(arguments));
        Process process = new ProcessBuilder(command).redirectErrorStream(true)
                .redirectOutput(ProcessBuilder.Redirect.appendTo(log.toFile())).start();
        return new JarProcess(process, log);
    }

    String output() throws IOException {
        return Files.readString(log);
    }

    /** Waits for the process to end; false when it did not within {@code bound}. */
    boolean awaitExit(Duration bound) throws InterruptedException {
        return process.waitFor(bound.toMillis(), TimeUnit.MILLISECONDS);
    }

    @Override
    public void close() throws InterruptedException {
        if (process.isAlive()) {
            process.destroyForcibly().waitFor(10, TimeUnit.SECONDS);
        }
    }

    /**
     * The example site with each bus's transport pointing at the emulator of the same id, the given broker and
     * topic prefix, and the HTTP API off.
     */
    static Path site(Path folder, List<Endpoint> endpoints, String broker, String prefix, String clientId)
            throws IOException {
        String text = Files.readString(Path.of("..", "config-examples", DemoFiles.SITE));
        Map<String, Endpoint> byId = new java.util.LinkedHashMap<>();
        endpoints.forEach(e -> byId.put(e.portId(), e));
        Matcher bus = Pattern.compile("(?m)^  - id: (\\S+)\\n    transport: \\{[^}]*\\}").matcher(text);
        StringBuilder out = new StringBuilder();
        while (bus.find()) {
            Endpoint endpoint = byId.get(bus.group(1));
            bus.appendReplacement(out, Matcher.quoteReplacement("  - id: " + bus.group(1)
                    + "\n    transport: {kind: tcp, host: " + endpoint.host() + ", port: " + endpoint.tcpPort()
                    + ", connect_timeout: 2s}"));
        }
        bus.appendTail(out);
        String site = out.toString();
        // The example's operators come along: without them every command is refused.
        Matcher operators = Pattern.compile("(?m)^operators:\\n(?:  .*\\n?)+").matcher(site);
        String roster = operators.find() ? operators.group() : "";
        site = site.substring(0, site.indexOf("\nmqtt:\n")) + "\nmqtt: {broker: \"" + broker + "\", prefix: " + prefix
                + ", client_id: " + clientId + "}\napi: {enabled: false}\n" + roster;
        Path file = folder.resolve(DemoFiles.SITE);
        Files.writeString(file, site);
        Files.copy(Path.of("..", "config-examples", DemoFiles.RULES), folder.resolve(DemoFiles.RULES));
        return file;
    }
}
