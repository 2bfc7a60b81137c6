package org.cryowarden.daemon.replay;

import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;

/**
 * The nuisance-alarm analysis of one period: per alarm its activations, time active, chattering and fleeting
 * activations; the alarm rate per interval; and the flood periods. The measures are those of alarm-management
 * practice (ANSI/ISA-18.2-2016 and its technical report on monitoring, EEMUA 191): chattering as several
 * activations of one alarm within a short window, an alarm flood as more than 10 alarms in 10 minutes. A pure
 * function of its inputs.
 *
 * @param alarms per alarm, most activations first, then by alarm id
 */
public record AlarmAnalysis(
        Instant from, Instant until, AnalysisSettings settings, List<AlarmStatistics> alarms,
        List<RateInterval> rate, List<FloodPeriod> floods) {

    private static final Comparator<AlarmStatistics> BAD_ACTORS_FIRST =
            Comparator.comparingInt(AlarmStatistics::activationCount).reversed()
                    .thenComparing(AlarmStatistics::alarmId);

    public AlarmAnalysis {
        Objects.requireNonNull(from, "from");
        Objects.requireNonNull(until, "until");
        Objects.requireNonNull(settings, "settings");
        alarms = List.copyOf(alarms);
        rate = List.copyOf(rate);
        floods = List.copyOf(floods);
    }

    /**
     * Analyses the alarm changes of the period {@code [from, until)}; activations starting outside it are left out.
     *
     * @throws IllegalArgumentException when {@code until} is not after {@code from}
     */
    public static AlarmAnalysis of(List<AlarmChange> changes, Instant from, Instant until, AnalysisSettings settings) {
        if (!until.isAfter(from)) {
            throw new IllegalArgumentException("the analysed period must end after it starts, got " + from + " to "
                    + until);
        }
        List<AlarmActivation> activations = new ArrayList<>();
        for (AlarmActivation activation : AlarmActivation.of(changes)) {
            if (!activation.start().isBefore(from) && activation.start().isBefore(until)) {
                activations.add(activation);
            }
        }
        return new AlarmAnalysis(from, until, settings, perAlarm(activations, until, settings),
                rate(activations, from, until, settings.rateInterval()), floods(activations, settings));
    }

    /** Whether any alarm chattered. */
    public boolean anyChattering() {
        return alarms.stream().anyMatch(AlarmStatistics::chattering);
    }

    /** The statistics of one alarm, if it was active in the period. */
    public java.util.Optional<AlarmStatistics> alarm(String alarmId) {
        return alarms.stream().filter(a -> a.alarmId().equals(alarmId)).findFirst();
    }

    private static List<AlarmStatistics> perAlarm(List<AlarmActivation> activations, Instant until,
            AnalysisSettings settings) {
        Map<String, List<AlarmActivation>> byAlarm = new LinkedHashMap<>();
        for (AlarmActivation activation : activations) {
            byAlarm.computeIfAbsent(activation.alarmId(), id -> new ArrayList<>()).add(activation);
        }
        List<AlarmStatistics> result = new ArrayList<>();
        for (List<AlarmActivation> list : byAlarm.values()) {
            Duration total = Duration.ZERO;
            int fleeting = 0;
            for (AlarmActivation activation : list) {
                Duration active = activation.duration(until);
                total = total.plus(active);
                if (activation.end().isPresent() && active.compareTo(settings.fleetingBelow()) < 0) {
                    fleeting++;
                }
            }
            boolean chattering = false;
            int n = settings.chatterCount();
            for (int i = 0; i + n - 1 < list.size() && !chattering; i++) {
                Duration span = Duration.between(list.get(i).start(), list.get(i + n - 1).start());
                chattering = span.compareTo(settings.chatterWindow()) < 0;
            }
            AlarmActivation first = list.get(0);
            result.add(new AlarmStatistics(first.alarmId(), list.get(list.size() - 1).priority(), list, total,
                    chattering, fleeting));
        }
        result.sort(BAD_ACTORS_FIRST);
        return result;
    }

    private static List<RateInterval> rate(List<AlarmActivation> activations, Instant from, Instant until,
            Duration interval) {
        List<RateInterval> result = new ArrayList<>();
        int next = 0;
        for (Instant start = from; start.isBefore(until); start = start.plus(interval)) {
            Instant end = start.plus(interval);
            if (end.isAfter(until)) {
                end = until;
            }
            int count = 0;
            while (next < activations.size() && activations.get(next).start().isBefore(end)) {
                count++;
                next++;
            }
            result.add(new RateInterval(start, end, count));
        }
        return result;
    }

    private static List<FloodPeriod> floods(List<AlarmActivation> activations, AnalysisSettings settings) {
        List<FloodPeriod> result = new ArrayList<>();
        int above = settings.floodAbove();
        int runFirst = -1;
        int runLast = -1;
        for (int i = 0; i + above < activations.size(); i++) {
            Duration span = Duration.between(activations.get(i).start(), activations.get(i + above).start());
            if (span.compareTo(settings.rateInterval()) >= 0) {
                continue;
            }
            if (runFirst >= 0 && i <= runLast) {
                runLast = i + above;
            } else {
                if (runFirst >= 0) {
                    result.add(flood(activations, runFirst, runLast));
                }
                runFirst = i;
                runLast = i + above;
            }
        }
        if (runFirst >= 0) {
            result.add(flood(activations, runFirst, runLast));
        }
        return result;
    }

    private static FloodPeriod flood(List<AlarmActivation> activations, int first, int last) {
        return new FloodPeriod(activations.get(first).start(), activations.get(last).start(), last - first + 1);
    }
}
