package org.cryowarden.daemon.notify;

import java.time.DayOfWeek;
import java.time.Duration;
import java.time.Instant;
import java.time.LocalTime;
import java.time.ZoneId;
import java.time.ZonedDateTime;
import java.util.ArrayList;
import java.util.EnumMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.rules.model.Priority;

/**
 * The on-call roster ({@code *-roster.yaml}, read by {@link RosterLoader}): who can be reached and how, groups,
 * the weekly on-call schedule in the roster's time zone, and per priority the escalation policy. Names in a
 * {@code notify} list are contact ids, group ids or {@value #ON_CALL} (whoever the schedule names at that moment).
 */
public record Roster(ZoneId zone, Map<String, Contact> contacts, Map<String, List<String>> groups,
                     List<Shift> shifts, List<String> otherwise, Map<Priority, Policy> policies,
                     List<String> flood, Duration pacing) {

    public static final String ON_CALL = "on-call";

    public Roster {
        contacts = Map.copyOf(contacts);
        groups = Map.copyOf(groups);
        shifts = List.copyOf(shifts);
        otherwise = List.copyOf(otherwise);
        policies = new EnumMap<>(policies);
        flood = List.copyOf(flood);
    }

    /** One way to reach a contact: a sender of the site's {@code notifiers} section and the address there. */
    public record Reach(String sender, String address) {
    }

    /** Local times during which a contact gets only critical notices; the others wait for the end. */
    public record QuietHours(LocalTime from, LocalTime to) {
        boolean covers(LocalTime time) {
            return from.isBefore(to) ? !time.isBefore(from) && time.isBefore(to)
                    : !time.isBefore(from) || time.isBefore(to);
        }
    }

    public record Contact(String id, String name, List<Reach> reach, Optional<QuietHours> quiet) {
        public Contact {
            reach = List.copyOf(reach);
        }
    }

    /** On {@code days}, from {@code from} (local) for {@code length}; a shift past midnight belongs to its first day. */
    public record Shift(Set<DayOfWeek> days, LocalTime from, Duration length, List<String> onCall) {
        public Shift {
            days = Set.copyOf(days);
            onCall = List.copyOf(onCall);
        }

        boolean covers(ZonedDateTime local) {
            for (int back = 0; back <= 7; back++) {
                ZonedDateTime day = local.minusDays(back);
                if (!days.contains(day.getDayOfWeek())) {
                    continue;
                }
                ZonedDateTime start = day.toLocalDate().atTime(from).atZone(local.getZone());
                if (!local.isBefore(start) && local.isBefore(start.plus(length))) {
                    return true;
                }
            }
            return false;
        }
    }

    /** One escalation step: {@code after} the previous step (zero for the first), tell {@code recipients}. */
    public record Step(Duration after, List<String> recipients) {
        public Step {
            recipients = List.copyOf(recipients);
        }
    }

    /**
     * What happens to an unacknowledged alarm of one priority: the steps, then {@code repeats} reminders to
     * everyone told, {@code repeatEvery} apart, then the fallback {@code fallbackAfter} the last of those.
     */
    public record Policy(List<Step> steps, Duration repeatEvery, int repeats, Duration fallbackAfter,
                         List<String> fallback) {
        public Policy {
            steps = List.copyOf(steps);
            fallback = List.copyOf(fallback);
        }
    }

    /** The contacts that {@code names} stand for at {@code at}, in order, each once. */
    public List<Contact> resolve(List<String> names, Instant at) {
        Set<String> ids = new LinkedHashSet<>();
        expand(names, at, ids, 0);
        List<Contact> result = new ArrayList<>();
        ids.forEach(id -> result.add(contacts.get(id)));
        return result;
    }

    /** The ids the schedule puts on call at {@code at}. */
    public List<String> onCall(Instant at) {
        ZonedDateTime local = at.atZone(zone);
        for (Shift shift : shifts) {
            if (shift.covers(local)) {
                return shift.onCall();
            }
        }
        return otherwise;
    }

    /** When {@code contact} may next be told a non-critical notice, if now is in their quiet hours. */
    public Optional<Instant> quietUntil(Contact contact, Instant at) {
        if (contact.quiet().isEmpty()) {
            return Optional.empty();
        }
        QuietHours quiet = contact.quiet().get();
        ZonedDateTime local = at.atZone(zone);
        if (!quiet.covers(local.toLocalTime())) {
            return Optional.empty();
        }
        ZonedDateTime end = local.toLocalDate().atTime(quiet.to()).atZone(zone);
        if (!end.isAfter(local)) {
            end = end.plusDays(1);
        }
        return Optional.of(end.toInstant());
    }

    private void expand(List<String> names, Instant at, Set<String> into, int depth) {
        for (String name : names) {
            if (name.equals(ON_CALL)) {
                if (depth == 0) {
                    expand(onCall(at), at, into, depth + 1);
                }
            } else if (contacts.containsKey(name)) {
                into.add(name);
            } else if (groups.containsKey(name) && depth < 4) {
                expand(groups.get(name), at, into, depth + 1);
            }
        }
    }
}
