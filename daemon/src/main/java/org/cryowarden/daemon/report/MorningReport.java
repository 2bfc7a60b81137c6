package org.cryowarden.daemon.report;

import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.Set;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.journal.MinuteAggregate;
import org.cryowarden.daemon.replay.AlarmAnalysis;
import org.cryowarden.daemon.replay.AnalysisSettings;
import org.cryowarden.rules.model.FloodDef;

/**
 * The figures of one morning report, computed from a journal's record of the period and what the site files
 * say. A pure function of its inputs; {@link ReportPage} draws it.
 *
 * @param channels         every channel plotted, in site order, then the others the journal holds
 * @param alarmLinks       per channel, the alarms whose periods shade its plot
 * @param acknowledgements every wait for acknowledgement, by start
 * @param floodEvents      the flood starts and ends the engine recorded
 */
public record MorningReport(NightRecord night, SiteKnowledge site, List<ChannelInfo> channels,
                            Map<String, Set<String>> alarmLinks, AlarmAnalysis analysis,
                            List<AcknowledgementTime> acknowledgements, Optional<Duration> medianAcknowledgement,
                            List<InterlockTrip> trips, List<ChannelCompleteness> completeness,
                            List<DewarConsumption> consumption, List<JournalEvent> floodEvents) {

    public MorningReport {
        Objects.requireNonNull(night, "night");
        Objects.requireNonNull(site, "site");
        channels = List.copyOf(channels);
        alarmLinks = Map.copyOf(alarmLinks);
        Objects.requireNonNull(analysis, "analysis");
        acknowledgements = List.copyOf(acknowledgements);
        Objects.requireNonNull(medianAcknowledgement, "medianAcknowledgement");
        trips = List.copyOf(trips);
        completeness = List.copyOf(completeness);
        consumption = List.copyOf(consumption);
        floodEvents = List.copyOf(floodEvents);
    }

    /** Computes every figure of the report. */
    public static MorningReport of(NightRecord night, SiteKnowledge site) {
        List<JournalAlarms.Transition> transitions = JournalAlarms.transitions(night.events());
        FloodDef flood = site.flood();
        AnalysisSettings defaults = AnalysisSettings.defaults();
        AnalysisSettings settings = new AnalysisSettings(defaults.fleetingBelow(), defaults.chatterCount(),
                defaults.chatterWindow(), flood.within(), flood.moreThan());
        AlarmAnalysis analysis = AlarmAnalysis.of(JournalAlarms.changes(transitions), night.window().from(),
                night.window().until().plusMillis(1), settings);

        List<ChannelInfo> channels = new ArrayList<>();
        for (String id : night.aggregates().keySet()) {
            channels.add(site.channels().getOrDefault(id, ChannelInfo.bare(id)));
        }
        Map<String, Set<String>> links = new LinkedHashMap<>();
        for (ChannelInfo channel : channels) {
            links.put(channel.id(), new LinkedHashSet<>(channel.alarms()));
        }
        for (JournalAlarms.Transition t : transitions) {
            t.readingChannel().ifPresent(c -> links.computeIfAbsent(c, k -> new LinkedHashSet<>()).add(t.alarmId()));
        }
        Map<String, Set<String>> frozen = new LinkedHashMap<>();
        links.forEach((k, v) -> frozen.put(k, Set.copyOf(v)));

        List<AcknowledgementTime> acks = AcknowledgementTime.of(transitions);
        List<ChannelCompleteness> completeness = new ArrayList<>();
        for (ChannelInfo channel : channels) {
            completeness.add(ChannelCompleteness.of(channel.id(), night.aggregates().get(channel.id()),
                    night.window(), channel.period()));
        }
        List<DewarConsumption> consumption = new ArrayList<>();
        for (DewarGaugeChain dewar : site.dewars()) {
            List<MinuteAggregate> minutes = night.aggregates().getOrDefault(dewar.levelChannel(), List.of());
            consumption.add(DewarConsumption.of(dewar, minutes));
        }
        List<JournalEvent> floods = night.events().stream()
                .filter(e -> e.kind().equals("flood.started") || e.kind().equals("flood.ended")).toList();
        return new MorningReport(night, site, channels, frozen, analysis, acks, AcknowledgementTime.median(acks),
                InterlockTrip.of(night.events()), completeness, consumption, floods);
    }

    /** How many alarms were annunciated in the period. */
    public int alarmCount() {
        return analysis.alarms().stream().mapToInt(a -> a.activationCount()).sum();
    }
}
