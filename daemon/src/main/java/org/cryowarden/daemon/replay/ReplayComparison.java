package org.cryowarden.daemon.replay;

import java.time.Instant;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.TreeMap;

/**
 * Recorded against replayed alarms: which activations would be new, which would disappear, and which would start
 * at another instant. Activations of one alarm are paired when their active intervals overlap (an activation
 * still open counts as active to {@code until}), earliest first; what stays unpaired is new or gone. A pure
 * function; differences are ordered by the earlier of their starts, then alarm id, then kind.
 *
 * @param unchanged how many paired activations start at the same instant in both
 */
public record ReplayComparison(List<AlarmDifference> differences, int unchanged) {

    private static final Comparator<AlarmDifference> ORDER = Comparator.comparing(AlarmDifference::at)
            .thenComparing(AlarmDifference::alarmId).thenComparing(AlarmDifference::kind);

    public ReplayComparison {
        differences = List.copyOf(differences);
    }

    /** Compares the recorded alarm changes with those of the replay, both over the period ending at {@code until}. */
    public static ReplayComparison of(List<AlarmChange> recorded, List<AlarmChange> replayed, Instant until) {
        Map<String, List<AlarmActivation>> before = byAlarm(AlarmActivation.of(recorded));
        Map<String, List<AlarmActivation>> after = byAlarm(AlarmActivation.of(replayed));
        TreeMap<String, Boolean> ids = new TreeMap<>();
        before.keySet().forEach(id -> ids.put(id, true));
        after.keySet().forEach(id -> ids.put(id, true));
        List<AlarmDifference> differences = new ArrayList<>();
        int unchanged = 0;
        for (String id : ids.keySet()) {
            List<AlarmActivation> r = before.getOrDefault(id, List.of());
            List<AlarmActivation> p = after.getOrDefault(id, List.of());
            int i = 0;
            int j = 0;
            while (i < r.size() || j < p.size()) {
                if (j == p.size() || (i < r.size() && endsBefore(r.get(i), p.get(j), until))) {
                    differences.add(gone(r.get(i++)));
                } else if (i == r.size() || endsBefore(p.get(j), r.get(i), until)) {
                    differences.add(added(p.get(j++)));
                } else {
                    AlarmActivation was = r.get(i++);
                    AlarmActivation now = p.get(j++);
                    if (was.start().equals(now.start())) {
                        unchanged++;
                    } else {
                        differences.add(new AlarmDifference(AlarmDifference.Kind.MOVED, id, Optional.of(was.start()),
                                Optional.of(now.start())));
                    }
                }
            }
        }
        differences.sort(ORDER);
        return new ReplayComparison(differences, unchanged);
    }

    /** Whether the replay raised exactly what was recorded, at the same instants. */
    public boolean identical() {
        return differences.isEmpty();
    }

    /** Whether {@code a} is over before {@code b} starts, so they cannot be the same activation. */
    private static boolean endsBefore(AlarmActivation a, AlarmActivation b, Instant until) {
        Instant end = a.endOr(until);
        return end.isBefore(b.start()) || (end.equals(b.start()) && !a.start().equals(b.start()));
    }

    private static AlarmDifference gone(AlarmActivation activation) {
        return new AlarmDifference(AlarmDifference.Kind.GONE, activation.alarmId(), Optional.of(activation.start()),
                Optional.empty());
    }

    private static AlarmDifference added(AlarmActivation activation) {
        return new AlarmDifference(AlarmDifference.Kind.NEW, activation.alarmId(), Optional.empty(),
                Optional.of(activation.start()));
    }

    private static Map<String, List<AlarmActivation>> byAlarm(List<AlarmActivation> activations) {
        Map<String, List<AlarmActivation>> result = new TreeMap<>();
        for (AlarmActivation activation : activations) {
            result.computeIfAbsent(activation.alarmId(), id -> new ArrayList<>()).add(activation);
        }
        return result;
    }
}
