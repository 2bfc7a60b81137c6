package org.cryowarden.daemon.notify;

import java.nio.file.Path;
import java.time.DateTimeException;
import java.time.DayOfWeek;
import java.time.Duration;
import java.time.LocalTime;
import java.time.ZoneId;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.EnumSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.daemon.notify.builtin.MailNotifierFactory;
import org.cryowarden.drivers.settings.SettingsReader;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.NameMatch;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.config.YamlReader;
import org.cryowarden.rules.model.Priority;

/**
 * Reads an on-call roster file ({@code *-roster.yaml}, schema in {@code config-examples/README.md}) and checks it
 * against the senders of the site's {@code notifiers} section. Every problem carries {@code FILE:LINE:COLUMN};
 * all are reported together.
 */
public final class RosterLoader {

    static final Duration LONGEST_WAIT = Duration.ofDays(1);
    private static final Map<String, DayOfWeek> DAYS = Map.of("mon", DayOfWeek.MONDAY, "tue", DayOfWeek.TUESDAY,
            "wed", DayOfWeek.WEDNESDAY, "thu", DayOfWeek.THURSDAY, "fri", DayOfWeek.FRIDAY, "sat",
            DayOfWeek.SATURDAY, "sun", DayOfWeek.SUNDAY);
    private static final Map<String, Priority> PRIORITIES = Map.of("critical", Priority.CRITICAL, "high",
            Priority.HIGH, "medium", Priority.MEDIUM, "low", Priority.LOW);

    private final List<ConfigProblem> problems = new ArrayList<>();
    private final Map<String, String> senderKinds;
    private final Map<String, Roster.Contact> contacts = new LinkedHashMap<>();
    private final Map<String, List<String>> groups = new LinkedHashMap<>();
    /** Names written in lists, checked once contacts and groups are all known. */
    private final List<Name> names = new ArrayList<>();

    private record Name(String name, SourcePosition at, String where) {
    }

    private RosterLoader(Map<String, String> senderKinds) {
        this.senderKinds = Map.copyOf(senderKinds);
    }

    /**
     * Loads {@code file}.
     *
     * @param senderKinds the site's senders, id to kind ({@code email}, {@code webhook}, ...)
     * @throws ConfigException with every problem found
     */
    public static Roster load(Path file, Map<String, String> senderKinds) throws ConfigException {
        return read(YamlReader.read(file), senderKinds);
    }

    /** Loads roster text, for tests; {@code label} names it in positions. */
    public static Roster load(String text, String label, Map<String, String> senderKinds) throws ConfigException {
        return read(YamlReader.read(text, label), senderKinds);
    }

    private static Roster read(ConfigNode root, Map<String, String> senderKinds) throws ConfigException {
        RosterLoader loader = new RosterLoader(senderKinds);
        Roster roster = loader.roster(root);
        if (!loader.problems.isEmpty()) {
            loader.problems.sort(java.util.Comparator.comparingInt((ConfigProblem p) -> p.position().line())
                    .thenComparingInt(p -> p.position().column()));
            throw new ConfigException(loader.problems);
        }
        return roster;
    }

    private Roster roster(ConfigNode root) throws ConfigException {
        if (!(root instanceof ConfigNode.Mapping top)) {
            throw new ConfigException(List.of(new ConfigProblem(root.position(), "a roster file must be a mapping "
                    + "with time_zone, contacts, groups, schedule and escalation, found " + root.kind())));
        }
        SettingsReader file = reader(top, "the roster");
        file.allowOnly("time_zone", "contacts", "groups", "schedule", "escalation", "pacing");
        ZoneId zone = file.text("time_zone", true).flatMap(text -> {
            try {
                return Optional.of(ZoneId.of(text.strip()));
            } catch (DateTimeException e) {
                problems.add(new ConfigProblem(file.position("time_zone"), "time_zone must be a region such as "
                        + "Europe/Zurich, got '" + text + "'"));
                return Optional.empty();
            }
        }).orElse(ZoneId.of("UTC"));
        file.sequence("contacts", true).ifPresent(list -> list.items().forEach(this::contact));
        file.mapping("groups", false).ifPresent(this::groups);
        List<Roster.Shift> shifts = new ArrayList<>();
        List<String> otherwise = List.of();
        Optional<ConfigNode.Mapping> schedule = file.mapping("schedule", false);
        if (schedule.isPresent()) {
            SettingsReader s = reader(schedule.get(), "the schedule");
            s.allowOnly("shifts", "otherwise");
            s.sequence("shifts", false).ifPresent(list -> list.items().forEach(item -> shift(item)
                    .ifPresent(shifts::add)));
            otherwise = s.sequence("otherwise", false).map(seq -> names(seq, "the schedule's otherwise", false))
                    .orElse(List.of());
        }
        Map<Priority, Roster.Policy> policies = new EnumMap<>(Priority.class);
        List<String> flood = List.of();
        Optional<ConfigNode.Mapping> escalation = file.mapping("escalation", true);
        if (escalation.isPresent()) {
            for (ConfigNode.Entry entry : escalation.get().entries()) {
                if (entry.key().equals("flood")) {
                    flood = floodPolicy(entry.value());
                    continue;
                }
                Priority priority = PRIORITIES.get(entry.key());
                if (priority == null) {
                    List<String> keys = new ArrayList<>(List.of("critical", "high", "medium", "low", "flood"));
                    problems.add(new ConfigProblem(entry.keyPosition(), "unknown key '" + entry.key()
                            + "' in the escalation" + NameMatch.closest(entry.key(), keys)
                            .map(c -> "; did you mean '" + c + "'?").orElse("; expected one of " + String.join(", ",
                                    keys))));
                    continue;
                }
                policy(entry.value(), entry.key()).ifPresent(p -> policies.put(priority, p));
            }
            if (flood.isEmpty() && policies.containsKey(Priority.CRITICAL)) {
                flood = policies.get(Priority.CRITICAL).steps().get(0).recipients();
            }
        }
        Duration pacing = file.duration("pacing", Duration.ZERO, Duration.ofHours(1), false)
                .orElse(Duration.ofMinutes(1));
        problems.addAll(file.problems());
        checkNames();
        return new Roster(zone, contacts, groups, shifts, otherwise, policies, flood, pacing);
    }

    private void contact(ConfigNode node) {
        Optional<SettingsReader> opened = mapping(node, "a contact");
        if (opened.isEmpty()) {
            return;
        }
        SettingsReader c = opened.get();
        Optional<String> id = c.text("id", true).map(String::strip);
        problems.addAll(c.problems());
        String what = id.map(i -> "contact '" + i + "'").orElse("a contact");
        c = reader(c.mapping(), what);
        c.allowOnly("id", "name", "reach", "quiet_hours");
        String name = c.text("name", false).orElse(id.orElse(""));
        List<Roster.Reach> reach = new ArrayList<>();
        Optional<ConfigNode.Sequence> list = c.sequence("reach", true);
        if (list.isPresent()) {
            for (ConfigNode item : list.get().items()) {
                reach(item, what, id.orElse("")).ifPresent(reach::add);
            }
            if (list.get().items().isEmpty()) {
                problems.add(new ConfigProblem(list.get().position(), "reach of " + what + " is empty; give at least "
                        + "one {sender: ID, to: ADDRESS}"));
            }
        }
        SettingsReader finalC = c;
        Optional<Roster.QuietHours> quiet = c.mapping("quiet_hours", false).flatMap(m -> {
            SettingsReader q = reader(m, "the quiet_hours of " + what);
            q.allowOnly("from", "to");
            Optional<LocalTime> from = time(q, "from", false);
            Optional<LocalTime> to = time(q, "to", false);
            problems.addAll(q.problems());
            return from.isPresent() && to.isPresent() ? Optional.of(new Roster.QuietHours(from.get(), to.get()))
                    : Optional.empty();
        });
        problems.addAll(finalC.problems());
        if (id.isPresent()) {
            if (id.get().equals(Roster.ON_CALL)) {
                problems.add(new ConfigProblem(c.position("id"), "'" + Roster.ON_CALL + "' is reserved for whoever "
                        + "the schedule names; choose another contact id"));
            } else if (contacts.containsKey(id.get())) {
                problems.add(new ConfigProblem(c.position("id"), "duplicate contact id '" + id.get() + "'"));
            } else {
                contacts.put(id.get(), new Roster.Contact(id.get(), name, reach, quiet));
            }
        }
    }

    private Optional<Roster.Reach> reach(ConfigNode node, String what, String contactId) {
        Optional<SettingsReader> opened = mapping(node, "a reach entry of " + what);
        if (opened.isEmpty()) {
            return Optional.empty();
        }
        SettingsReader r = reader(opened.get().mapping(), "a reach entry of " + what);
        r.allowOnly("sender", "to");
        Optional<String> sender = r.text("sender", true).map(String::strip);
        Optional<String> to = r.text("to", false).map(String::strip);
        Optional<Roster.Reach> result = Optional.empty();
        if (sender.isPresent()) {
            String kind = senderKinds.get(sender.get());
            if (kind == null) {
                r.problem(r.position("sender"), "sender '" + sender.get() + "' is not defined in the site's "
                        + "notifiers section" + hint(sender.get(), senderKinds.keySet()));
            } else if (kind.equals("email") && to.isEmpty()) {
                r.problem(r.mapping().position(), "sender '" + sender.get() + "' sends e-mail: give the address "
                        + "in 'to'");
            } else if (kind.equals("email") && MailNotifierFactory.addressProblem(to.get()).isPresent()) {
                r.problem(r.position("to"), "'" + to.get() + "' is not an e-mail address: "
                        + MailNotifierFactory.addressProblem(to.get()).get());
            } else {
                result = Optional.of(new Roster.Reach(sender.get(), to.orElse(contactId)));
            }
        }
        problems.addAll(r.problems());
        return r.problems().isEmpty() ? result : Optional.empty();
    }

    private void groups(ConfigNode.Mapping mapping) {
        for (ConfigNode.Entry entry : mapping.entries()) {
            if (contacts.containsKey(entry.key()) || entry.key().equals(Roster.ON_CALL)) {
                problems.add(new ConfigProblem(entry.keyPosition(), "group '" + entry.key() + "' has the name of "
                        + (entry.key().equals(Roster.ON_CALL) ? "the schedule's on-call" : "a contact")
                        + "; choose another group id"));
                continue;
            }
            if (!(entry.value() instanceof ConfigNode.Sequence list)) {
                problems.add(new ConfigProblem(entry.value().position(), "group '" + entry.key() + "' must be a "
                        + "list of contact or group ids, got " + entry.value().kind()));
                continue;
            }
            groups.put(entry.key(), names(list, "group '" + entry.key() + "'", false));
        }
    }

    private Optional<Roster.Shift> shift(ConfigNode node) {
        Optional<SettingsReader> opened = mapping(node, "a shift");
        if (opened.isEmpty()) {
            return Optional.empty();
        }
        SettingsReader s = reader(opened.get().mapping(), "a shift");
        s.allowOnly("days", "from", "to", "on_call");
        Set<DayOfWeek> days = EnumSet.noneOf(DayOfWeek.class);
        s.sequence("days", true).ifPresent(list -> {
            for (ConfigNode item : list.items()) {
                String text = item instanceof ConfigNode.Scalar sc ? sc.text().strip() : "";
                DayOfWeek day = DAYS.get(text);
                if (day == null) {
                    s.problem(item.position(), "days of a shift are mon, tue, wed, thu, fri, sat, sun; got '" + text
                            + "'" + hint(text, DAYS.keySet()));
                } else {
                    days.add(day);
                }
            }
        });
        Optional<LocalTime> from = time(s, "from", false);
        Optional<LocalTime> to = time(s, "to", true);
        List<String> onCall = s.sequence("on_call", true).map(list -> names(list, "a shift's on_call", true))
                .orElse(List.of());
        problems.addAll(s.problems());
        if (!s.problems().isEmpty() || from.isEmpty() || to.isEmpty()) {
            return Optional.empty();
        }
        Duration length = Duration.between(from.get(), to.get());
        if (s.text("to", true).map(String::strip).orElse("").equals("24:00")) {
            length = Duration.between(from.get(), LocalTime.MAX).plusNanos(1);
        } else if ((length.isZero() || length.isNegative())) {
            length = length.plusDays(1);
        }
        return Optional.of(new Roster.Shift(days, from.get(), length, onCall));
    }

    private Optional<Roster.Policy> policy(ConfigNode node, String priority) {
        String what = "the " + priority + " escalation";
        Optional<SettingsReader> opened = mapping(node, what);
        if (opened.isEmpty()) {
            return Optional.empty();
        }
        SettingsReader p = reader(opened.get().mapping(), what);
        p.allowOnly("steps", "repeat", "fallback");
        List<Roster.Step> steps = new ArrayList<>();
        p.sequence("steps", true).ifPresent(list -> {
            if (list.items().isEmpty()) {
                p.problem(list.position(), "steps of " + what + " is empty; the first step says who is told at once");
            }
            for (int i = 0; i < list.items().size(); i++) {
                Optional<SettingsReader> stepNode = mapping(list.items().get(i), "a step of " + what);
                if (stepNode.isEmpty()) {
                    continue;
                }
                SettingsReader s = reader(stepNode.get().mapping(), "step " + (i + 1) + " of " + what);
                s.allowOnly("after", "notify");
                Duration after = s.duration("after", Duration.ZERO, LONGEST_WAIT, i > 0).orElse(Duration.ZERO);
                if (i == 0 && !(after.isZero() || after.isNegative())) {
                    s.problem(s.position("after"), "the first step of " + what + " is sent at once; remove its "
                            + "'after' (a wait belongs to the steps that follow)");
                }
                List<String> notify = s.sequence("notify", true)
                        .map(seq -> names(seq, "step " + (steps.size() + 1) + " of " + what, true)).orElse(List.of());
                problems.addAll(s.problems());
                steps.add(new Roster.Step(after, notify));
            }
        });
        Duration every = Duration.ZERO;
        int times = 0;
        Optional<ConfigNode.Mapping> repeat = p.mapping("repeat", false);
        if (repeat.isPresent()) {
            SettingsReader r = reader(repeat.get(), "the repeat of " + what);
            r.allowOnly("every", "times");
            every = r.duration("every", Duration.ofMinutes(1), LONGEST_WAIT, true).orElse(Duration.ZERO);
            times = r.integer("times", 1, 100, true).orElse(0);
            problems.addAll(r.problems());
        }
        Duration fallbackAfter = Duration.ZERO;
        List<String> fallback = List.of();
        Optional<ConfigNode.Mapping> fb = p.mapping("fallback", false);
        if (fb.isPresent()) {
            SettingsReader f = reader(fb.get(), "the fallback of " + what);
            f.allowOnly("after", "notify");
            fallbackAfter = f.duration("after", Duration.ofMinutes(1), LONGEST_WAIT, true).orElse(Duration.ZERO);
            fallback = f.sequence("notify", true).map(seq -> names(seq, "the fallback of " + what, true))
                    .orElse(List.of());
            problems.addAll(f.problems());
        }
        problems.addAll(p.problems());
        return steps.isEmpty() ? Optional.empty()
                : Optional.of(new Roster.Policy(steps, every, times, fallbackAfter, fallback));
    }

    private List<String> floodPolicy(ConfigNode node) {
        Optional<SettingsReader> opened = mapping(node, "the flood escalation");
        if (opened.isEmpty()) {
            return List.of();
        }
        SettingsReader f = reader(opened.get().mapping(), "the flood escalation");
        f.allowOnly("notify");
        List<String> notify = f.sequence("notify", true).map(seq -> names(seq, "the flood escalation", true))
                .orElse(List.of());
        problems.addAll(f.problems());
        return notify;
    }

    private List<String> names(ConfigNode.Sequence list, String where, boolean onCallAllowed) {
        List<String> result = new ArrayList<>();
        for (ConfigNode item : list.items()) {
            if (!(item instanceof ConfigNode.Scalar scalar) || scalar.isNull()) {
                problems.add(new ConfigProblem(item.position(), where + " must list contact or group ids, got "
                        + item.kind()));
                continue;
            }
            String name = scalar.text().strip();
            if (name.equals(Roster.ON_CALL) && !onCallAllowed) {
                problems.add(new ConfigProblem(item.position(), "'" + Roster.ON_CALL + "' cannot be used in " + where
                        + ": the schedule itself decides who is on call"));
                continue;
            }
            names.add(new Name(name, item.position(), where));
            result.add(name);
        }
        return result;
    }

    private void checkNames() {
        List<String> known = new ArrayList<>(contacts.keySet());
        known.addAll(groups.keySet());
        for (Name name : names) {
            if (!name.name().equals(Roster.ON_CALL) && !contacts.containsKey(name.name())
                    && !groups.containsKey(name.name())) {
                problems.add(new ConfigProblem(name.at(), where(name) + " names '" + name.name() + "', which is no "
                        + "contact or group of the roster" + hint(name.name(), known)));
            }
        }
    }

    private static String where(Name name) {
        return Character.toUpperCase(name.where().charAt(0)) + name.where().substring(1);
    }

    private Optional<LocalTime> time(SettingsReader reader, String key, boolean allowMidnightEnd) {
        Optional<String> text = reader.text(key, true).map(String::strip);
        if (text.isEmpty()) {
            return Optional.empty();
        }
        if (allowMidnightEnd && text.get().equals("24:00")) {
            return Optional.of(LocalTime.MAX);
        }
        if (!text.get().matches("([01]\\d|2[0-3]):[0-5]\\d")) {
            reader.problem(reader.position(key), key + " must be a local time HH:MM (24-hour), got '" + text.get()
                    + "'");
            return Optional.empty();
        }
        return Optional.of(LocalTime.parse(text.get()));
    }

    private Optional<SettingsReader> mapping(ConfigNode node, String what) {
        if (node instanceof ConfigNode.Mapping m) {
            return Optional.of(reader(m, what));
        }
        problems.add(new ConfigProblem(node.position(), what + " must be a mapping, got " + node.kind()));
        return Optional.empty();
    }

    private SettingsReader reader(ConfigNode.Mapping mapping, String what) {
        return new SettingsReader(mapping, what);
    }

    private static String hint(String word, java.util.Collection<String> candidates) {
        return NameMatch.closest(word, candidates).map(c -> "; did you mean '" + c + "'?").orElse("");
    }
}
