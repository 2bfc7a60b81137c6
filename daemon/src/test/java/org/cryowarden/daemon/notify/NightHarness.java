package org.cryowarden.daemon.notify;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.OptionalLong;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.daemon.journal.NewEvent;
import org.cryowarden.daemon.notify.builtin.MailNotifierFactory;
import org.cryowarden.daemon.notify.builtin.WebhookNotifierFactory;
import org.cryowarden.daemon.notify.spi.Notifier;
import org.cryowarden.daemon.run.DaemonEvent;
import org.cryowarden.drivers.settings.SettingsReader;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.config.YamlReader;

/** Builds a notify service on a virtual clock, a real journal and real senders, and scripts events into it. */
final class NightHarness implements AutoCloseable {

    static final ObjectMapper JSON = new ObjectMapper();
    static final String SECRET = "night-shift-shared-secret";

    final VirtualTimeSource time = new VirtualTimeSource(Instant.parse("2025-11-14T22:00:00Z"));
    final Journal journal;
    final Roster roster;
    private final Map<String, Notifier> notifiers = new LinkedHashMap<>();
    private final Path folder;
    NotifyService service;
    private long seq = 100;
    private boolean journaled;

    NightHarness(Path folder, String rosterYaml, String webhookUrl, Optional<Integer> smtpPort) throws Exception {
        this.folder = folder;
        Files.writeString(folder.resolve("hook-secret"), SECRET + "\n");
        journal = Journal.open(folder.resolve("journal.db"), JournalSettings.defaults());
        notifiers.put("pager-hook", new WebhookNotifierFactory().create("pager-hook",
                settings("{url: '" + webhookUrl + "', secret_file: hook-secret, timeout: 2s}"), folder));
        Map<String, String> kinds = new LinkedHashMap<>();
        kinds.put("pager-hook", "webhook");
        if (smtpPort.isPresent()) {
            notifiers.put("lab-mail", new MailNotifierFactory().create("lab-mail", settings("{host: 127.0.0.1, port: "
                    + smtpPort.get() + ", security: none, from: cryowarden@harbour-hall.example, timeout: 5s}"),
                    folder));
            kinds.put("lab-mail", "email");
        }
        String text = smtpPort.isPresent() ? rosterYaml : rosterYaml.lines()
                .filter(line -> !line.contains("sender: lab-mail")).collect(java.util.stream.Collectors.joining("\n"));
        roster = RosterLoader.load(text, "<roster>", kinds);
        service = new NotifyService(roster, notifiers, journal, time, "harbour-hall");
    }

    /** From now on, scripted events are recorded in the journal first and carry its sequence numbers. */
    void recordEvents() {
        journaled = true;
    }

    /** A fresh service on the same journal and senders, as after a daemon restart (which resumes first). */
    void restart() throws Exception {
        service = new NotifyService(roster, notifiers, journal, time, "harbour-hall");
        service.resume();
    }

    /** An {@code alarm.raised} as the daemon's event mapping writes it. */
    void raise(String alarm, String priority, String message) {
        ObjectNode payload = JSON.createObjectNode();
        payload.put("cause", "limit crossed");
        payload.put("from", "normal");
        payload.put("to", "active-unacknowledged");
        payload.put("priority", priority);
        payload.put("message", message);
        send(new DaemonEvent("alarm.raised", time.wallNow(), Optional.of(alarm), Optional.empty(), payload));
    }

    void acknowledge(String alarm, String priority, String operator) {
        ObjectNode payload = JSON.createObjectNode();
        payload.put("cause", "acknowledged by " + operator);
        payload.put("from", "active-unacknowledged");
        payload.put("to", "active-acknowledged");
        payload.put("priority", priority);
        send(new DaemonEvent("alarm.acknowledged", time.wallNow(), Optional.of(alarm), Optional.of(operator),
                payload));
    }

    /** A {@code watchdog.stalled} as the daemon's watchdog journals it. */
    void stalled(String part, String cause) {
        ObjectNode payload = JSON.createObjectNode();
        payload.put("cause", cause);
        send(new DaemonEvent("watchdog.stalled", time.wallNow(), Optional.of(part), Optional.empty(), payload));
    }

    void floodStarted(int count, String firstOut, Instant firstOutAt) {
        ObjectNode payload = JSON.createObjectNode();
        payload.put("cause", "more than 10 alarms within 10 minutes");
        payload.put("count", count);
        payload.put("window", Duration.ofMinutes(10).toString());
        payload.put("first_out", firstOut);
        payload.put("first_out_at", firstOutAt.toString());
        send(new DaemonEvent("flood.started", time.wallNow(), Optional.of(firstOut), Optional.empty(), payload));
    }

    void floodEnded(int activations, String firstOut, Instant started) {
        ObjectNode payload = JSON.createObjectNode();
        payload.put("cause", "alarm rate back below the flood threshold");
        payload.put("started", started.toString());
        payload.put("activations", activations);
        payload.put("first_out", firstOut);
        send(new DaemonEvent("flood.ended", time.wallNow(), Optional.of(firstOut), Optional.empty(), payload));
    }

    /** Lets {@code span} of virtual time pass in steps of {@code step}, running the service after each. */
    void pass(Duration span, Duration step) {
        for (Duration done = Duration.ZERO; done.compareTo(span) < 0; done = done.plus(step)) {
            time.advance(step);
            service.runDue();
        }
    }

    /** "sender notice" of every notify.sent event, in journal order. */
    List<String> sent() throws Exception {
        return journal.eventsAfter(0, 10_000).stream().filter(e -> e.kind().equals("notify.sent")).map(e -> {
            try {
                var node = JSON.readTree(e.payloadJson());
                return node.path("sender").asText() + " " + node.path("notice").asText();
            } catch (java.io.IOException ex) {
                throw new AssertionError(ex);
            }
        }).toList();
    }

    List<String> journalKinds() throws Exception {
        return journal.eventsAfter(0, 10_000).stream().map(e -> e.kind()).toList();
    }

    private void send(DaemonEvent event) {
        long number = seq++;
        if (journaled) {
            try {
                number = journal.append(new NewEvent(event.kind(), event.at(), event.subject(), event.operator(),
                        JSON.writeValueAsString(event.payload())));
            } catch (Exception e) {
                throw new AssertionError(e);
            }
        }
        service.accept(List.of(event), List.of(OptionalLong.of(number)));
        service.runDue();
    }

    private static SettingsReader settings(String yaml) throws Exception {
        return new SettingsReader((ConfigNode.Mapping) YamlReader.read(yaml, "<sender>"), "a test sender");
    }

    @Override
    public void close() throws Exception {
        service.close();
        journal.close();
    }
}
