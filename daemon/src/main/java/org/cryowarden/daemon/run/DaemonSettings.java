package org.cryowarden.daemon.run;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.daemon.history.HistorySettings;
import org.cryowarden.daemon.access.OperatorRoster;
import org.cryowarden.daemon.mqtt.LinkTls;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.SiteDef;

/**
 * The daemon's own sections of the site file ({@code mqtt}, {@code journal}, {@code api}), read with positions so
 * that a mistake there stops startup with {@code FILE:LINE:COLUMN} like any other:
 * <pre>
 * mqtt:    {broker: embedded | tcp://HOST:PORT | ssl://HOST:PORT, port: 1883, prefix: cryowarden/harbour-hall,
 *           client_id: ..., username: ..., password_file: FILE | password_env: VARIABLE,
 *           ca_file: PEM, client_cert: PEM, client_key: PEM, max_interval: 5min, deadbands: {CHANNEL: "0.05 %vol"}}
 * journal: {path: FILE, retention: 90d, history_flush: 10s, history_retention: 14d}
 * polling: {spread: true}
 * api:     {port: 8741}   (token_file is accepted but unused: see warnings())
 * </pre>
 * Relative paths are resolved against the site file's folder.
 *
 * @param broker       an external broker ({@code tcp://HOST:PORT}); empty for the embedded one
 * @param embeddedPort the embedded broker's port on 127.0.0.1
 * @param apiPort      the HTTP API's port on 127.0.0.1; 0 picks a free one, empty turns the API off
 * @param history      how raw history is flushed and kept
 * @param passwordEnv  an environment variable holding the MQTT password, instead of {@code passwordFile}
 * @param tls          certificates for an {@code ssl://} broker, checked (present, readable, PEM) when read
 * @param operators    who may give which command, from the {@code operators} section
 * @param spreadPolls  whether each bus's instruments are polled in phases spread over their period (default) or
 *                     all at once: spread gives an alarm's reading a free line and cores at the price of one
 *                     wake-up of the poller per instrument, which on a small server can matter more
 */
public record DaemonSettings(
        Optional<String> broker,
        int embeddedPort,
        String prefix,
        String clientId,
        Optional<String> username,
        Optional<Path> passwordFile,
        Duration maxInterval,
        Map<String, Double> deadbands,
        Path journalPath,
        Duration retention,
        Optional<Integer> apiPort,
        Optional<Path> tokenFile,
        HistorySettings history,
        Optional<String> passwordEnv,
        LinkTls tls,
        OperatorRoster operators,
        boolean spreadPolls) {

    public static final int DEFAULT_MQTT_PORT = 1883;
    public static final int DEFAULT_API_PORT = 8741;

    public DaemonSettings {
        deadbands = Map.copyOf(deadbands);
    }

    /**
     * What the site file leaves unsafe or unused, for the startup log and {@code check}: no operators section (every
     * command refused), an {@code api.token_file} (no longer read: HTTP commands need an operator's token).
     */
    public List<String> warnings() {
        List<String> warnings = new ArrayList<>();
        if (!operators.configured()) {
            warnings.add(OperatorRoster.NO_OPERATORS);
        }
        tokenFile.ifPresent(file -> warnings.add("api.token_file (" + file + ") is not used: an HTTP command needs"
                + " the token of the operator it names (operators section); remove the key"));
        return warnings;
    }

    /** A lower-case topic segment from a site name: "Harbour Hall lab" gives "harbour-hall-lab". */
    public static String slug(String name) {
        String slug = name.toLowerCase(java.util.Locale.ROOT).replaceAll("[^a-z0-9]+", "-").replaceAll("^-+|-+$", "");
        return slug.isEmpty() ? "site" : slug;
    }

    /**
     * Reads the sections of {@code site}.
     *
     * @param siteFolder the folder relative paths are resolved against
     * @throws ConfigException with every problem of the three sections
     */
    public static DaemonSettings read(SiteDef site, Path siteFolder) throws ConfigException {
        List<ConfigProblem> problems = new ArrayList<>();
        Section mqtt = new Section("mqtt", site.sections().get("mqtt"), problems);
        mqtt.allowOnly("broker", "port", "prefix", "client_id", "username", "password_file", "password_env",
                "ca_file", "client_cert", "client_key", "max_interval", "deadbands");
        Optional<String> broker = mqtt.text("broker").filter(b -> !b.equals("embedded"));
        broker.ifPresent(uri -> {
            if (!uri.matches("(tcp|ssl|mqtts)://[^:/]+:\\d{1,5}")) {
                problems.add(new ConfigProblem(mqtt.position("broker"), "mqtt broker must be 'embedded',"
                        + " tcp://HOST:PORT, or ssl://HOST:PORT (or mqtts://) for TLS, got '" + uri + "'"));
            }
        });
        int port = mqtt.integer("port", 1, 65535).orElse(DEFAULT_MQTT_PORT);
        String slug = slug(site.name());
        String prefix = mqtt.text("prefix").orElse("cryowarden/" + slug);
        if (prefix.isBlank() || prefix.contains("#") || prefix.contains("+") || prefix.endsWith("/")
                || prefix.startsWith("/")) {
            problems.add(new ConfigProblem(mqtt.position("prefix"), "mqtt prefix must be a topic without wildcards"
                    + " and without a leading or trailing '/', got '" + prefix + "'"));
        }
        String clientId = mqtt.text("client_id").orElse("cryowarden-" + slug);
        Optional<String> username = mqtt.text("username");
        Optional<Path> passwordFile = mqtt.text("password_file").map(p -> siteFolder.resolve(p));
        Optional<String> passwordEnv = mqtt.text("password_env");
        passwordFile.ifPresent(file -> {
            if (!Files.isRegularFile(file) || !Files.isReadable(file)) {
                problems.add(new ConfigProblem(mqtt.position("password_file"), "mqtt password_file " + file
                        + " is missing or unreadable"));
            }
        });
        if (passwordFile.isPresent() && passwordEnv.isPresent()) {
            problems.add(new ConfigProblem(mqtt.position("password_env"), "mqtt takes password_file or"
                    + " password_env, not both"));
        }
        if ((passwordFile.isPresent() || passwordEnv.isPresent()) && username.isEmpty()) {
            problems.add(new ConfigProblem(mqtt.position(passwordFile.isPresent() ? "password_file" : "password_env"),
                    "mqtt password needs a username"));
        }
        LinkTls tls = tls(mqtt, siteFolder, broker, problems);
        Duration maxInterval = mqtt.duration("max_interval").orElse(Duration.ofMinutes(5));
        Map<String, Double> deadbands = new LinkedHashMap<>();
        mqtt.mapping("deadbands").ifPresent(map -> {
            for (ConfigNode.Entry entry : map.entries()) {
                Optional<DeadbandTarget> target = channelUnit(site, entry.key());
                if (target.isEmpty()) {
                    problems.add(new ConfigProblem(entry.keyPosition(), "mqtt deadband names channel '"
                            + entry.key() + "', which the site does not define"));
                    continue;
                }
                if (!(entry.value() instanceof ConfigNode.Scalar scalar)) {
                    problems.add(new ConfigProblem(entry.value().position(), "mqtt deadband of " + entry.key()
                            + " must be a quantity such as \"0.05 %vol\", got " + entry.value().kind()));
                    continue;
                }
                try {
                    Quantity quantity = Quantity.parse(scalar.text());
                    if (!quantity.unit().isCompatibleWith(target.get().unit)) {
                        throw new IllegalArgumentException("unit " + quantity.unit() + " does not fit channel unit "
                                + target.get().unit);
                    }
                    double value = quantity.unit().differenceTo(target.get().unit, quantity.value());
                    if (!(value >= 0)) {
                        throw new IllegalArgumentException("a deadband cannot be negative");
                    }
                    deadbands.put(entry.key(), value);
                } catch (IllegalArgumentException e) {
                    problems.add(new ConfigProblem(scalar.position(), "mqtt deadband of " + entry.key() + ": "
                            + e.getMessage()));
                }
            }
        });

        Section journal = new Section("journal", site.sections().get("journal"), problems);
        journal.allowOnly("path", "retention", "history_flush", "history_retention");
        Path journalPath = journal.text("path").map(p -> siteFolder.resolve(p))
                .orElse(siteFolder.resolve(slug + "-journal.db"));
        Duration retention = journal.duration("retention").orElse(Duration.ofDays(90));
        HistorySettings history = HistorySettings.defaults();
        history = history.withFlushEvery(journal.duration("history_flush").orElse(history.flushEvery()));
        history = history.withRetention(journal.duration("history_retention").orElse(history.retention()));

        Section api = new Section("api", site.sections().get("api"), problems);
        api.allowOnly("port", "token_file", "enabled");
        Optional<Integer> apiPort = api.bool("enabled").orElse(true)
                ? Optional.of(api.integer("port", 0, 65535).orElse(DEFAULT_API_PORT)) : Optional.empty();
        Optional<Path> tokenFile = api.text("token_file").map(p -> siteFolder.resolve(p));
        Section polling = new Section("polling", site.sections().get("polling"), problems);
        polling.allowOnly("spread");
        boolean spreadPolls = polling.bool("spread").orElse(true);
        OperatorRoster operators = OperatorRoster.none();
        try {
            operators = OperatorRoster.read(site);
        } catch (ConfigException e) {
            problems.addAll(e.problems());
        }
        if (!problems.isEmpty()) {
            throw new ConfigException(problems);
        }
        return new DaemonSettings(broker, port, prefix, clientId, username, passwordFile, maxInterval, deadbands,
                journalPath, retention, apiPort, tokenFile, history, passwordEnv, tls, operators, spreadPolls);
    }

    /**
     * The MQTT password from {@code password_file} (first line, trimmed) or {@code password_env}; empty when
     * neither is set. Never logged.
     *
     * @throws IllegalArgumentException when the file cannot be read or the variable is unset
     */
    public String mqttPassword() {
        if (passwordEnv.isPresent()) {
            String value = System.getenv(passwordEnv.get());
            if (value == null) {
                throw new IllegalArgumentException("the MQTT password variable " + passwordEnv.get() + " is not set");
            }
            return value.strip();
        }
        if (passwordFile.isEmpty()) {
            return "";
        }
        try {
            return Files.readString(passwordFile.get()).strip();
        } catch (IOException e) {
            throw new IllegalArgumentException("cannot read the MQTT password file " + passwordFile.get() + ": "
                    + e.getMessage());
        }
    }

    /** The TLS keys, each file checked now so that {@code check} names a bad one with its position. */
    private static LinkTls tls(Section mqtt, Path siteFolder, Optional<String> broker, List<ConfigProblem> problems) {
        Optional<Path> ca = pemFile(mqtt, "ca_file", siteFolder, problems, LinkTls::certificates);
        Optional<Path> cert = pemFile(mqtt, "client_cert", siteFolder, problems, LinkTls::certificates);
        Optional<Path> key = pemFile(mqtt, "client_key", siteFolder, problems, LinkTls::privateKey);
        boolean secure = broker.filter(b -> !b.startsWith("tcp:")).isPresent();
        for (String name : List.of("ca_file", "client_cert", "client_key")) {
            if (!secure && mqtt.has(name)) {
                problems.add(new ConfigProblem(mqtt.position(name), "mqtt " + name + " needs a TLS broker"
                        + " (ssl://HOST:PORT)"));
            }
        }
        if (mqtt.has("client_cert") != mqtt.has("client_key")) {
            problems.add(new ConfigProblem(mqtt.position(mqtt.has("client_cert") ? "client_cert" : "client_key"),
                    "mqtt client_cert and client_key go together"));
            return LinkTls.defaults();
        }
        return cert.isPresent() && key.isPresent() ? new LinkTls(ca, cert, key)
                : new LinkTls(ca, Optional.empty(), Optional.empty());
    }

    private static Optional<Path> pemFile(Section mqtt, String key, Path siteFolder, List<ConfigProblem> problems,
            java.util.function.Function<Path, ?> parse) {
        Optional<Path> file = mqtt.text(key).map(siteFolder::resolve);
        if (file.isPresent()) {
            try {
                parse.apply(file.get());
            } catch (IllegalArgumentException e) {
                problems.add(new ConfigProblem(mqtt.position(key), "mqtt " + key + ": " + e.getMessage()));
                return Optional.empty();
            }
        }
        return file;
    }

    public DaemonSettings withBroker(Optional<String> uri, int port) {
        return new DaemonSettings(uri, port, prefix, clientId, username, passwordFile, maxInterval, deadbands,
                journalPath, retention, apiPort, tokenFile, history, passwordEnv, tls, operators, spreadPolls);
    }

    public DaemonSettings withJournal(Path path) {
        return new DaemonSettings(broker, embeddedPort, prefix, clientId, username, passwordFile, maxInterval,
                deadbands, path, retention, apiPort, tokenFile, history, passwordEnv, tls, operators, spreadPolls);
    }

    public DaemonSettings withPrefix(String topicPrefix, String client) {
        return new DaemonSettings(broker, embeddedPort, topicPrefix, client, username, passwordFile, maxInterval,
                deadbands, journalPath, retention, apiPort, tokenFile, history, passwordEnv, tls, operators, spreadPolls);
    }

    public DaemonSettings withApi(Optional<Integer> port, Optional<Path> token) {
        return new DaemonSettings(broker, embeddedPort, prefix, clientId, username, passwordFile, maxInterval,
                deadbands, journalPath, retention, port, token, history, passwordEnv, tls, operators, spreadPolls);
    }

    public DaemonSettings withOperators(OperatorRoster roster) {
        return new DaemonSettings(broker, embeddedPort, prefix, clientId, username, passwordFile, maxInterval,
                deadbands, journalPath, retention, apiPort, tokenFile, history, passwordEnv, tls, roster, spreadPolls);
    }

    public DaemonSettings withMaxInterval(Duration interval) {
        return new DaemonSettings(broker, embeddedPort, prefix, clientId, username, passwordFile, interval,
                deadbands, journalPath, retention, apiPort, tokenFile, history, passwordEnv, tls, operators, spreadPolls);
    }

    public DaemonSettings withHistory(HistorySettings settings) {
        return new DaemonSettings(broker, embeddedPort, prefix, clientId, username, passwordFile, maxInterval,
                deadbands, journalPath, retention, apiPort, tokenFile, settings, passwordEnv, tls, operators, spreadPolls);
    }

    private record DeadbandTarget(org.cryowarden.rules.Unit unit) {
    }

    private static Optional<DeadbandTarget> channelUnit(SiteDef site, String id) {
        for (ChannelDef channel : site.channels()) {
            if (channel.id().equals(id)) {
                return Optional.of(new DeadbandTarget(channel.unit()));
            }
        }
        for (DerivedChannelDef channel : site.derived()) {
            if (channel.id().equals(id)) {
                return Optional.of(new DeadbandTarget(channel.unit()));
            }
        }
        return Optional.empty();
    }

    /** Reads one optional section, collecting positioned problems. */
    private static final class Section {
        private final String name;
        private final ConfigNode.Mapping node;
        private final List<ConfigProblem> problems;

        Section(String name, ConfigNode.Mapping node, List<ConfigProblem> problems) {
            this.name = name;
            this.node = node;
            this.problems = problems;
        }

        void allowOnly(String... keys) {
            if (node == null) {
                return;
            }
            List<String> allowed = List.of(keys);
            for (ConfigNode.Entry entry : node.entries()) {
                if (!allowed.contains(entry.key())) {
                    problems.add(new ConfigProblem(entry.keyPosition(), "unknown key '" + entry.key() + "' in "
                            + name + "; expected one of " + String.join(", ", allowed)));
                }
            }
        }

        boolean has(String key) {
            return node != null && node.get(key).isPresent();
        }

        org.cryowarden.rules.SourcePosition position(String key) {
            return node.get(key).map(ConfigNode::position).orElse(node.position());
        }

        Optional<String> text(String key) {
            if (node == null) {
                return Optional.empty();
            }
            Optional<ConfigNode> value = node.get(key);
            if (value.isEmpty()) {
                return Optional.empty();
            }
            if (value.get() instanceof ConfigNode.Scalar scalar && !scalar.isNull()) {
                return Optional.of(scalar.text());
            }
            problems.add(new ConfigProblem(value.get().position(), key + " in " + name + " must be a value, got "
                    + value.get().kind()));
            return Optional.empty();
        }

        Optional<ConfigNode.Mapping> mapping(String key) {
            if (node == null) {
                return Optional.empty();
            }
            Optional<ConfigNode> value = node.get(key);
            if (value.isEmpty()) {
                return Optional.empty();
            }
            if (value.get() instanceof ConfigNode.Mapping map) {
                return Optional.of(map);
            }
            problems.add(new ConfigProblem(value.get().position(), key + " in " + name + " must be a mapping, got "
                    + value.get().kind()));
            return Optional.empty();
        }

        Optional<Integer> integer(String key, int min, int max) {
            return text(key).flatMap(text -> {
                try {
                    int value = Integer.parseInt(text.strip());
                    if (value >= min && value <= max) {
                        return Optional.of(value);
                    }
                } catch (NumberFormatException e) {
                    // reported below
                }
                problems.add(new ConfigProblem(position(key), key + " in " + name + " must be a whole number from "
                        + min + " to " + max + ", got '" + text + "'"));
                return Optional.empty();
            });
        }

        Optional<Boolean> bool(String key) {
            return text(key).flatMap(text -> {
                if (text.equals("true") || text.equals("false")) {
                    return Optional.of(Boolean.parseBoolean(text));
                }
                problems.add(new ConfigProblem(position(key), key + " in " + name + " must be true or false, got '"
                        + text + "'"));
                return Optional.empty();
            });
        }

        Optional<Duration> duration(String key) {
            return text(key).flatMap(text -> {
                try {
                    Duration value = DurationSyntax.parse(text);
                    if (!value.isNegative() && !value.isZero()) {
                        return Optional.of(value);
                    }
                } catch (IllegalArgumentException e) {
                    problems.add(new ConfigProblem(position(key), key + " in " + name + ": " + e.getMessage()));
                    return Optional.empty();
                }
                problems.add(new ConfigProblem(position(key), key + " in " + name + " must be a positive duration"
                        + " such as 5min, got '" + text + "'"));
                return Optional.empty();
            });
        }
    }
}
