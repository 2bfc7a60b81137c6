package org.cryowarden.daemon.report;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import org.cryowarden.rules.model.Priority;

/**
 * How long one annunciation waited for an operator: from the moment the alarm began to await acknowledgement
 * (entered active-unacknowledged from a state that did not) to the operator's acknowledgement. Time to
 * acknowledge is the alarm-system performance measure of ANSI/ISA-18.2-2016 (IEC 62682) monitoring.
 *
 * @param acknowledgedAt empty while still unacknowledged at the end of the period, or when the wait ended
 *                       another way (shelved, out of service)
 * @param operator       who acknowledged
 */
public record AcknowledgementTime(String alarmId, Priority priority, Instant raisedAt, Optional<Instant> acknowledgedAt,
                                  Optional<String> operator) {

    public AcknowledgementTime {
        Objects.requireNonNull(alarmId, "alarmId");
        Objects.requireNonNull(priority, "priority");
        Objects.requireNonNull(raisedAt, "raisedAt");
        Objects.requireNonNull(acknowledgedAt, "acknowledgedAt");
        Objects.requireNonNull(operator, "operator");
    }

    public Optional<Duration> timeToAcknowledge() {
        return acknowledgedAt.map(at -> Duration.between(raisedAt, at));
    }

    /** Every wait among {@code transitions}, by when it began. */
    static List<AcknowledgementTime> of(List<JournalAlarms.Transition> transitions) {
        Map<String, JournalAlarms.Transition> waiting = new HashMap<>();
        List<AcknowledgementTime> result = new ArrayList<>();
        for (JournalAlarms.Transition t : transitions) {
            boolean awaited = t.from().awaitsAcknowledgement();
            boolean awaits = t.to().awaitsAcknowledgement();
            if (!awaited && awaits) {
                waiting.put(t.alarmId(), t);
            } else if (awaited && !awaits) {
                JournalAlarms.Transition start = waiting.remove(t.alarmId());
                if (start != null) {
                    boolean acknowledged = t.event().kind().equals("alarm.acknowledged");
                    result.add(new AcknowledgementTime(t.alarmId(), start.priority(), start.event().at(),
                            acknowledged ? Optional.of(t.event().at()) : Optional.empty(),
                            acknowledged ? t.event().operator() : Optional.empty()));
                }
            }
        }
        for (JournalAlarms.Transition start : waiting.values()) {
            result.add(new AcknowledgementTime(start.alarmId(), start.priority(), start.event().at(), Optional.empty(),
                    Optional.empty()));
        }
        result.sort(java.util.Comparator.comparing(AcknowledgementTime::raisedAt)
                .thenComparing(AcknowledgementTime::alarmId));
        return result;
    }

    /** The median wait of the acknowledged ones (the mean of the middle two for an even count). */
    static Optional<Duration> median(List<AcknowledgementTime> times) {
        List<Duration> waits = times.stream().flatMap(t -> t.timeToAcknowledge().stream()).sorted().toList();
        if (waits.isEmpty()) {
            return Optional.empty();
        }
        int n = waits.size();
        if (n % 2 == 1) {
            return Optional.of(waits.get(n / 2));
        }
        return Optional.of(waits.get(n / 2 - 1).plus(waits.get(n / 2)).dividedBy(2));
    }
}
