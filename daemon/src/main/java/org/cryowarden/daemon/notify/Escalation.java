package org.cryowarden.daemon.notify;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.daemon.run.DaemonEvent;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.model.Priority;

/**
 * Decides who is told what and when, from the recorded event stream and the roster: a raised alarm tells the
 * first step's contacts at once, then each further step after its wait while nobody acknowledges, then reminders
 * to everyone told, then the fallback. An acknowledgement (or shelving, or out-of-service, by an operator) ends
 * it and tells everyone told who took it. During an alarm flood (EEMUA 191: more than 10 alarms in 10 minutes per
 * operator, recognised by the engine) one flood notice per contact replaces the first pages of the flood's alarms.
 *
 * <p>Non-critical notices wait out a contact's quiet hours (critical ones never wait). A contact receives at
 * most one message per {@link Roster#pacing()}; what comes in between is merged into one digest at its end, except
 * a flood notice, which goes at once and replaces the pages it covers.
 *
 * <p>All timers run on the monotonic side of the injected {@link TimeSource}; schedules and quiet hours read its
 * wall side in the roster's zone. Not thread-safe: the notify thread calls {@link #onEvent} and {@link #tick}.
 */
final class Escalation {

    private static final ObjectMapper JSON = new ObjectMapper();
    /** The prefix that keeps a watchdog stall's case apart from the alarm ids. */
    static final String WATCHDOG = "watchdog:";

    private final Roster roster;
    private final TimeSource time;
    private final String site;
    private final Map<String, Case> open = new LinkedHashMap<>();
    private final Map<String, Pace> paces = new LinkedHashMap<>();
    private final List<Held> held = new ArrayList<>();
    private final List<Message> out = new ArrayList<>();
    private boolean flooding;
    private long floodSeq;
    private final Set<String> floodTold = new LinkedHashSet<>();

    /** One alarm activation being escalated. */
    private static final class Case {
        final String alarm;
        final Priority priority;
        final String text;
        final long seq;
        final Roster.Policy policy;
        final Set<String> told = new LinkedHashSet<>();
        int stage;
        long dueAt;
        long raisedAtNanos;

        Case(String alarm, Priority priority, String text, long seq, Roster.Policy policy) {
            this.alarm = alarm;
            this.priority = priority;
            this.text = text;
            this.seq = seq;
            this.policy = policy;
        }
    }

    /** A notice about one thing, before pacing decides whether it goes alone or in a digest. */
    private record Item(String key, String kind, Optional<String> alarm, boolean critical, String line,
                        ObjectNode fields) {
    }

    private static final class Pace {
        long lastSent;
        boolean sentOnce;
        final List<Item> pending = new ArrayList<>();
    }

    private record Held(Roster.Contact contact, Item item, long releaseAt) {
    }

    Escalation(Roster roster, TimeSource time, String site) {
        this.roster = roster;
        this.time = time;
        this.site = site;
    }

    /** Takes one recorded event ({@code seq} from the journal) and returns the messages to send now. */
    List<Message> onEvent(DaemonEvent event, long seq) {
        String kind = event.kind();
        String subject = event.subject().orElse("");
        switch (kind) {
            case "alarm.raised" -> raise(subject, priority(event.payload()), event.payload().path("message")
                    .asText(subject), seq);
            case "watchdog.stalled" -> raise(WATCHDOG + subject, Priority.CRITICAL,
                    event.payload().path("cause").asText("the daemon stalled"), seq);
            case "alarm.acknowledged", "alarm.shelved", "alarm.out-of-service" -> event.operator()
                    .ifPresent(operator -> taken(subject, operator, verb(kind)));
            case "alarm.cleared" -> {
                if ("normal".equals(event.payload().path("to").asText())) {
                    open.remove(subject);
                }
            }
            case "watchdog.recovered" -> recovered(WATCHDOG + subject);
            case "flood.started" -> floodStarted(event, seq);
            case "flood.ended" -> floodEnded(event, seq);
            default -> {
            }
        }
        return drain();
    }

    /** Fires what is due at the clock's monotonic time. */
    List<Message> tick() {
        long now = time.monotonicNanos();
        for (Iterator<Held> it = held.iterator(); it.hasNext(); ) {
            Held h = it.next();
            if (now - h.releaseAt >= 0) {
                it.remove();
                if (h.item.alarm().isEmpty() || open.containsKey(h.item.alarm().get())) {
                    pace(h.contact, h.item);
                }
            }
        }
        for (Case c : List.copyOf(open.values())) {
            while (open.containsKey(c.alarm) && c.dueAt != Long.MAX_VALUE && now - c.dueAt >= 0) {
                fire(c);
            }
        }
        for (Map.Entry<String, Pace> entry : paces.entrySet()) {
            Pace pace = entry.getValue();
            if (!pace.pending.isEmpty() && now - (pace.lastSent + roster.pacing().toNanos()) >= 0) {
                flush(roster.contacts().get(entry.getKey()), pace, now);
            }
        }
        return drain();
    }

    /** The monotonic time at which {@link #tick} next has something to do; {@link Long#MAX_VALUE} when idle. */
    long nextDue() {
        long next = Long.MAX_VALUE;
        for (Held h : held) {
            next = Math.min(next, h.releaseAt);
        }
        for (Case c : open.values()) {
            next = Math.min(next, c.dueAt);
        }
        for (Pace pace : paces.values()) {
            if (!pace.pending.isEmpty()) {
                next = Math.min(next, pace.lastSent + roster.pacing().toNanos());
            }
        }
        return next;
    }

    /** Alarms being escalated, for status and tests. */
    Set<String> escalating() {
        return Set.copyOf(open.keySet());
    }

    // ---- cases ---------------------------------------------------------------------------------------------

    private void raise(String alarm, Priority priority, String text, long seq) {
        Roster.Policy policy = roster.policies().get(priority);
        if (policy == null || open.containsKey(alarm)) {
            return;
        }
        Case c = new Case(alarm, priority, text, seq, policy);
        open.put(alarm, c);
        c.stage = 0;
        long now = time.monotonicNanos();
        c.raisedAtNanos = now;
        List<Roster.Contact> first = roster.resolve(policy.steps().get(0).recipients(), time.wallNow());
        for (Roster.Contact contact : first) {
            c.told.add(contact.id());
            if (flooding && floodTold.contains(contact.id())) {
                continue; // the flood notice covers this page
            }
            emit(contact, alarmItem(c, contact, "alarm", 1, ""));
        }
        schedule(c, now);
    }

    private void fire(Case c) {
        long now = c.dueAt;
        int steps = c.policy.steps().size();
        Instant wall = time.wallNow();
        if (c.stage < steps) {
            Roster.Step step = c.policy.steps().get(c.stage);
            String why = "not acknowledged " + DurationSyntax.format(sinceRaise(c, now)) + " after it was raised";
            for (Roster.Contact contact : roster.resolve(step.recipients(), wall)) {
                if (c.told.add(contact.id())) {
                    emit(contact, alarmItem(c, contact, "alarm", c.stage + 1, why));
                }
            }
        } else if (c.stage < steps + c.policy.repeats()) {
            int n = c.stage - steps + 1;
            for (String id : c.told) {
                Roster.Contact contact = roster.contacts().get(id);
                emit(contact, alarmItem(c, contact, "reminder", c.stage + 1, "reminder " + n + " of "
                        + c.policy.repeats() + ": still not acknowledged after "
                        + DurationSyntax.format(sinceRaise(c, now))));
            }
        } else {
            for (Roster.Contact contact : roster.resolve(c.policy.fallback(), wall)) {
                if (c.told.add(contact.id())) {
                    emit(contact, alarmItem(c, contact, "alarm", c.stage + 1, "fallback: nobody acknowledged in "
                            + DurationSyntax.format(sinceRaise(c, now))));
                }
            }
        }
        schedule(c, now);
    }

    /** Moves {@code c} to its next stage and sets when it is due, {@code from} the stage that just ran. */
    private void schedule(Case c, long from) {
        int steps = c.policy.steps().size();
        c.stage++;
        Duration wait;
        if (c.stage < steps) {
            wait = c.policy.steps().get(c.stage).after();
        } else if (c.stage < steps + c.policy.repeats()) {
            wait = c.policy.repeatEvery();
        } else if (c.stage == steps + c.policy.repeats() && !c.policy.fallback().isEmpty()) {
            wait = c.policy.fallbackAfter();
        } else {
            c.dueAt = Long.MAX_VALUE;
            return;
        }
        c.dueAt = from + wait.toNanos();
    }

    private Duration sinceRaise(Case c, long now) {
        return Duration.ofNanos(now - c.raisedAtNanos);
    }

    private void taken(String alarm, String operator, String verb) {
        Case c = open.remove(alarm);
        if (c == null) {
            return;
        }
        for (String id : c.told) {
            Roster.Contact contact = roster.contacts().get(id);
            if (isOperator(contact, operator)) {
                continue;
            }
            ObjectNode fields = fields("taken", c.alarm, c.priority);
            fields.put("operator", operator);
            fields.put("action", verb);
            emit(contact, new Item("a" + c.seq + ".taken." + id, "taken", Optional.empty(), false,
                    c.alarm + " " + verb + " by " + operator, fields));
        }
    }

    private void recovered(String alarm) {
        Case c = open.remove(alarm);
        if (c == null) {
            return;
        }
        for (String id : c.told) {
            Roster.Contact contact = roster.contacts().get(id);
            emit(contact, new Item("a" + c.seq + ".recovered." + id, "recovered", Optional.empty(), false,
                    c.alarm + " recovered", fields("recovered", c.alarm, c.priority)));
        }
    }

    private void floodStarted(DaemonEvent event, long seq) {
        flooding = true;
        floodSeq = seq;
        floodTold.clear();
        ObjectNode p = event.payload();
        for (Roster.Contact contact : roster.resolve(roster.flood(), time.wallNow())) {
            floodTold.add(contact.id());
            ObjectNode fields = fields("flood", p.path("first_out").asText(), Priority.CRITICAL);
            fields.put("count", p.path("count").asInt());
            fields.put("window", p.path("window").asText());
            fields.put("first_out", p.path("first_out").asText());
            fields.put("first_out_at", p.path("first_out_at").asText());
            emit(contact, new Item("f" + seq + "." + contact.id(), "flood", Optional.empty(), true,
                    "ALARM FLOOD: " + p.path("count").asInt() + " alarms within " + window(p) + "; first out: "
                            + p.path("first_out").asText() + " at " + p.path("first_out_at").asText(), fields));
        }
    }

    private void floodEnded(DaemonEvent event, long seq) {
        flooding = false;
        ObjectNode p = event.payload();
        for (String id : floodTold) {
            Roster.Contact contact = roster.contacts().get(id);
            ObjectNode fields = fields("flood-ended", p.path("first_out").asText(), Priority.CRITICAL);
            fields.put("activations", p.path("activations").asInt());
            fields.put("first_out", p.path("first_out").asText());
            emit(contact, new Item("f" + floodSeq + ".ended." + id, "flood-ended", Optional.empty(), false,
                    "alarm flood over: " + p.path("activations").asInt() + " activations since "
                            + p.path("started").asText(), fields));
        }
        floodTold.clear();
    }

    // ---- delivery shaping ----------------------------------------------------------------------------------

    private void emit(Roster.Contact contact, Item item) {
        if (!item.critical()) {
            Optional<Instant> until = roster.quietUntil(contact, time.wallNow());
            if (until.isPresent()) {
                long wait = Duration.between(time.wallNow(), until.get()).toNanos();
                held.add(new Held(contact, item, time.monotonicNanos() + wait));
                return;
            }
        }
        pace(contact, item);
    }

    private void pace(Roster.Contact contact, Item item) {
        long now = time.monotonicNanos();
        Pace pace = paces.computeIfAbsent(contact.id(), k -> new Pace());
        if (item.kind().equals("flood")) {
            pace.pending.removeIf(i -> i.kind().equals("alarm") || i.kind().equals("reminder"));
            send(contact, List.of(item), pace, now);
            return;
        }
        if (!pace.sentOnce || now - (pace.lastSent + roster.pacing().toNanos()) >= 0) {
            send(contact, List.of(item), pace, now);
        } else {
            pace.pending.add(item);
        }
    }

    private void flush(Roster.Contact contact, Pace pace, long now) {
        List<Item> items = List.copyOf(pace.pending);
        pace.pending.clear();
        send(contact, items, pace, now);
    }

    private void send(Roster.Contact contact, List<Item> items, Pace pace, long now) {
        pace.lastSent = now;
        pace.sentOnce = true;
        if (items.size() == 1) {
            Item item = items.get(0);
            out.add(message(contact, item.key(), item.kind(), item.line(), item.fields()));
            return;
        }
        ObjectNode fields = JSON.createObjectNode();
        fields.put("kind", "digest");
        fields.put("site", site);
        fields.put("time", time.wallNow().toString());
        fields.put("count", items.size());
        ArrayNode list = fields.putArray("items");
        StringBuilder lines = new StringBuilder();
        for (Item item : items) {
            ObjectNode one = item.fields().deepCopy();
            one.put("id", item.key());
            list.add(one);
            lines.append("- ").append(item.line()).append('\n');
        }
        out.add(message(contact, items.get(0).key() + ".digest", "digest", items.size() + " notices: "
                + items.get(0).line() + (items.size() > 1 ? " (+" + (items.size() - 1) + " more)" : ""), fields,
                lines.toString()));
    }

    private Message message(Roster.Contact contact, String id, String kind, String line, ObjectNode fields) {
        return message(contact, id, kind, line, fields, line + "\n");
    }

    private Message message(Roster.Contact contact, String id, String kind, String line, ObjectNode fields,
            String body) {
        ObjectNode json = JSON.createObjectNode();
        json.put("id", id);
        json.put("contact", contact.id());
        json.setAll(fields);
        String subject = "[cryowarden " + site + "] " + line;
        String text = body + "\nSite: " + site + "\nTime: " + time.wallNow() + "\nNotice: " + id + "\n\n"
                + "Acknowledge in cryowarden (command topic, HTTP API or 'cryowarden ack') so the escalation stops.\n"
                + "cryowarden is a supervisory alerting layer; it does not replace hardwired oxygen monitoring,\n"
                + "relief devices or the procedures your local codes require.\n";
        return new Message(id, contact, kind, subject, text, json);
    }

    private Item alarmItem(Case c, Roster.Contact contact, String kind, int step, String why) {
        ObjectNode fields = fields(kind, c.alarm, c.priority);
        fields.put("message", c.text);
        fields.put("step", step);
        if (!why.isEmpty()) {
            fields.put("reason", why);
        }
        String line = c.priority.name() + " " + c.alarm + ": " + c.text + (why.isEmpty() ? "" : " (" + why + ")");
        return new Item("a" + c.seq + ".s" + step + "." + contact.id(), kind, Optional.of(c.alarm),
                c.priority == Priority.CRITICAL, line, fields);
    }

    private ObjectNode fields(String kind, String alarm, Priority priority) {
        ObjectNode fields = JSON.createObjectNode();
        fields.put("kind", kind);
        fields.put("site", site);
        fields.put("time", time.wallNow().toString());
        fields.put("alarm", alarm);
        fields.put("priority", priority.word());
        return fields;
    }

    private List<Message> drain() {
        List<Message> result = List.copyOf(out);
        out.clear();
        return result;
    }

    private static Priority priority(JsonNode payload) {
        try {
            return Priority.valueOf(payload.path("priority").asText("high").toUpperCase(Locale.ROOT));
        } catch (IllegalArgumentException e) {
            return Priority.HIGH;
        }
    }

    private static String verb(String kind) {
        return switch (kind) {
            case "alarm.acknowledged" -> "acknowledged";
            case "alarm.shelved" -> "shelved";
            default -> "taken out of service";
        };
    }

    private static boolean isOperator(Roster.Contact contact, String operator) {
        return contact.id().equalsIgnoreCase(operator) || contact.name().equalsIgnoreCase(operator);
    }

    private static String window(JsonNode payload) {
        try {
            return DurationSyntax.format(Duration.parse(payload.path("window").asText()));
        } catch (RuntimeException e) {
            return payload.path("window").asText();
        }
    }
}
