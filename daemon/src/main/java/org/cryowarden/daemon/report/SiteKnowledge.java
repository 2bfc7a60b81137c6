package org.cryowarden.daemon.report;

import java.time.ZoneId;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.FloodDef;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.RuleDef;
import org.cryowarden.rules.model.VoteRule;

/**
 * What the site and rule files add to a journal: channel units, poll periods, limits, dewar geometry, the flood
 * criterion and the time zone. A report from a journal alone uses {@link #none()}.
 */
public record SiteKnowledge(Optional<String> siteName, Map<String, ChannelInfo> channels,
                            List<DewarGaugeChain> dewars, FloodDef flood, ZoneId zone) {

    public SiteKnowledge {
        channels = java.util.Collections.unmodifiableMap(new LinkedHashMap<>(channels));
        dewars = List.copyOf(dewars);
    }

    /** Nothing known beyond the journal: UTC, the default flood criterion (EEMUA 191). */
    public static SiteKnowledge none() {
        return new SiteKnowledge(Optional.empty(), Map.of(), List.of(), FloodDef.DEFAULT, ZoneOffset.UTC);
    }

    /** Everything the report uses from a loaded site and its rules. */
    public static SiteKnowledge of(Configuration configuration) {
        Map<String, List<ChannelLimit>> limits = new LinkedHashMap<>();
        Map<String, List<String>> alarms = new LinkedHashMap<>();
        Map<String, Unit> units = new LinkedHashMap<>();
        configuration.site().channels().forEach(c -> units.put(c.id(), c.unit()));
        configuration.site().derived().forEach(c -> units.put(c.id(), c.unit()));
        double ambient = configuration.site().ambientPressurePa();
        for (RuleDef rule : configuration.rules().rules()) {
            for (String input : rule.inputs()) {
                alarms.computeIfAbsent(input, k -> new ArrayList<>()).add(rule.id());
            }
            if (rule instanceof LimitRule limit && units.containsKey(limit.channel())) {
                limits.computeIfAbsent(limit.channel(), k -> new ArrayList<>()).add(limit(rule.id(),
                        limit.direction(), limit.setpoint(), units.get(limit.channel()), ambient));
            } else if (rule instanceof VoteRule vote) {
                for (String channel : vote.channels()) {
                    if (units.containsKey(channel)) {
                        limits.computeIfAbsent(channel, k -> new ArrayList<>()).add(limit(rule.id(), vote.direction(),
                                vote.setpoint(), units.get(channel), ambient));
                    }
                }
            }
        }
        Map<String, ChannelInfo> channels = new LinkedHashMap<>();
        for (ChannelDef c : configuration.site().channels()) {
            channels.put(c.id(), new ChannelInfo(c.id(), c.unit().symbol(), c.description(), Optional.of(c.period()),
                    limits.getOrDefault(c.id(), List.of()), alarms.getOrDefault(c.id(), List.of())));
        }
        for (DerivedChannelDef c : configuration.site().derived()) {
            channels.put(c.id(), new ChannelInfo(c.id(), c.unit().symbol(), c.description(), Optional.empty(),
                    limits.getOrDefault(c.id(), List.of()), alarms.getOrDefault(c.id(), List.of())));
        }
        return new SiteKnowledge(Optional.of(configuration.site().name()), channels,
                DewarGaugeChain.of(configuration.site()), configuration.rules().flood(),
                configuration.site().timeZone().orElse(ZoneOffset.UTC));
    }

    private static ChannelLimit limit(String alarmId, Direction direction, Quantity setpoint, Unit unit,
            double ambientPa) {
        double value = setpoint.in(unit, ambientPa);
        String words = direction == Direction.HIGH ? "above" : "below";
        return new ChannelLimit(alarmId, value, alarmId + " " + words + " " + Numbers.format(value)
                + (unit.symbol().equals("1") ? "" : " " + unit.symbol()));
    }
}
