package org.cryowarden.daemon.bench;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.SQLException;
import java.sql.Statement;
import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.UUID;
import org.cryowarden.daemon.run.Daemon;
import org.cryowarden.daemon.run.DaemonSettings;
import org.cryowarden.daemon.run.SiteSetup;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.config.Configuration;

/**
 * The whole daemon on a generated site: {@code channels} channels polled every {@code period} over Modbus RTU on
 * {@code buses} TCP buses, one {@link BenchDevice} each, one instrument (unit) per channel so that a poll hands over
 * each reading as soon as its reply is in (an instrument's readings reach the engine together at the end of its
 * poll); per channel a high limit at 80 % (deadband 1 %, no
 * on-delay, not latching) and a stale rule; the journal in a temporary folder; MQTT on the chosen broker under a
 * topic prefix of its own. Values read 20.0 % unless the bench raises one to 90.0 %.
 */
final class BenchPlant implements AutoCloseable {

    static final int NORMAL = 200;
    static final int HIGH = 900;
    /** Unit addresses 1-247 (Modbus over Serial Line V1.02, 2.2). */
    static final int MAX_UNITS = 247;

    private final Path folder;
    private final List<BenchDevice> devices;
    private final int perBus;
    private final Daemon daemon;
    private final String prefix;

    private BenchPlant(Path folder, List<BenchDevice> devices, int perBus, Daemon daemon, String prefix) {
        this.folder = folder;
        this.devices = devices;
        this.perBus = perBus;
        this.daemon = daemon;
        this.prefix = prefix;
    }

    static BenchPlant start(int channels, int buses, Duration period, String brokerUri, boolean together)
            throws IOException, ConfigException, Daemon.StartException {
        int perBus = (channels + buses - 1) / buses;
        if (perBus > MAX_UNITS) {
            throw new IllegalArgumentException("at most " + MAX_UNITS + " channels per bus, got " + perBus);
        }
        Path folder = Files.createTempDirectory("cryowarden-bench-plant-");
        List<BenchDevice> devices = new ArrayList<>();
        try {
            for (int b = 0; b < buses; b++) {
                devices.add(new BenchDevice(perBus, NORMAL));
            }
            String prefix = "cryowarden-bench/" + UUID.randomUUID().toString().substring(0, 8);
            Path site = Files.writeString(folder.resolve("bench-site.yaml"),
                    site(channels, perBus, devices, period, brokerUri, prefix, together));
            Path rules = Files.writeString(folder.resolve("bench-rules.yaml"), rules(channels, perBus));
            TimeSource time = TimeSource.system();
            DriverCatalog catalog = DriverCatalog.discover(BenchPlant.class.getClassLoader(), Optional.empty());
            Configuration configuration = SiteSetup.load(site, List.of(rules), catalog, time);
            DaemonSettings settings = DaemonSettings.read(configuration.site(), folder);
            Daemon daemon = Daemon.start(site, List.of(rules), configuration, settings, catalog, time,
                    Daemon.Options.defaults());
            return new BenchPlant(folder, devices, perBus, daemon, prefix);
        } catch (IOException | ConfigException | Daemon.StartException | RuntimeException e) {
            devices.forEach(BenchDevice::close);
            BenchFiles.deleteTree(folder);
            throw e;
        }
    }

    Daemon daemon() {
        return daemon;
    }

    String prefix() {
        return prefix;
    }

    List<BenchDevice> devices() {
        return devices;
    }

    BenchDevice deviceOf(int channel) {
        return devices.get(channel / perBus);
    }

    int registerOf(int channel) {
        return channel % perBus;
    }

    static String channelId(int channel) {
        return String.format("bench-%04d", channel);
    }

    static String highRuleId(int channel) {
        return channelId(channel) + "-high";
    }

    /**
     * The bytes the journal's data takes: its pages in use ({@code page_count - freelist_count}) as the newest
     * snapshot sees them, the write-ahead log's frames counted where they belong. The files on disk
     * ({@link #journalFileBytes}) also hold the log itself, which SQLite reuses in place and keeps at up to some
     * 4 MB between checkpoints: the wrong measure of growth.
     */
    long journalStoredBytes() throws SQLException {
        try (Connection connection = DriverManager.getConnection("jdbc:sqlite:" + daemon.journalFile());
             Statement statement = connection.createStatement();
             ResultSet pages = statement.executeQuery(
                     "SELECT page_count, freelist_count, page_size FROM pragma_page_count, pragma_freelist_count,"
                             + " pragma_page_size")) {
            pages.next();
            return (pages.getLong(1) - pages.getLong(2)) * pages.getLong(3);
        }
    }

    /** The journal's bytes on disk, write-ahead log and shared-memory index included. */
    long journalFileBytes() throws IOException {
        long bytes = 0;
        Path journal = daemon.journalFile();
        for (String suffix : List.of("", "-wal", "-shm")) {
            Path file = journal.resolveSibling(journal.getFileName() + suffix);
            if (Files.exists(file)) {
                bytes += Files.size(file);
            }
        }
        return bytes;
    }

    private static String site(int channels, int perBus, List<BenchDevice> devices, Duration period,
            String brokerUri, String prefix, boolean together) {
        StringBuilder yaml = new StringBuilder();
        yaml.append("# Generated by cryowarden bench: an invented site of bench channels.\n")
                .append("site:\n  name: bench site\n  ambient_pressure: 101.325 kPa\n")
                .append("mqtt: {broker: '").append(brokerUri).append("', prefix: ").append(prefix)
                .append(", client_id: ").append(prefix.replace('/', '-')).append("}\n")
                .append("journal: {path: bench-journal.db}\n")
                .append("api: {enabled: false}\n")
                .append(together ? "polling: {spread: false}\n" : "")
                .append("buses:\n");
        String every = period.toMillis() + "ms";
        for (int b = 0; b < devices.size(); b++) {
            yaml.append("  - id: bench-bus-").append(b).append('\n')
                    .append("    transport: {kind: tcp, host: 127.0.0.1, port: ").append(devices.get(b).port())
                    .append(", connect_timeout: 2s}\n")
                    .append("    instruments:\n");
            for (int c = b * perBus; c < Math.min(channels, (b + 1) * perBus); c++) {
                yaml.append("      - id: bench-instrument-").append(c).append('\n')
                        .append("        driver: modbus-rtu\n        settings: {unit: ").append(1 + c % perBus)
                        .append(", timeout: 300ms}\n        channels:\n")
                        .append("          - {id: ").append(channelId(c)).append(", unit: '%', period: ").append(every)
                        .append(", stale_after: 5s, point: {table: input, address: ").append(c % perBus)
                        .append(", type: uint16, scale: 0.1}}\n");
            }
        }
        return yaml.toString();
    }

    private static String rules(int channels, int perBus) {
        StringBuilder yaml = new StringBuilder("# Generated by cryowarden bench.\nrules:\n");
        for (int c = 0; c < channels; c++) {
            String id = channelId(c);
            yaml.append("  - id: ").append(highRuleId(c)).append('\n')
                    .append("    limit: {channel: ").append(id).append(", above: 80 %, deadband: 1 %}\n")
                    .append("    priority: high\n    message: bench channel ").append(id).append(" above 80 %\n")
                    .append("  - id: ").append(id).append("-stale\n")
                    .append("    stale: {channel: ").append(id).append(", timeout: 10s}\n")
                    .append("    priority: medium\n    message: no reading from bench channel ").append(id)
                    .append(" for 10 s\n");
        }
        return yaml.toString();
    }

    @Override
    public void close() {
        daemon.close();
        devices.forEach(BenchDevice::close);
        BenchFiles.deleteTree(folder);
    }
}
