package org.cryowarden.drivers.testing;

import java.time.Duration;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.OutputDef;
import org.cryowarden.rules.model.PointDef;

/**
 * Builders for the positioned site pieces drivers receive, so tests write settings as {@code "unit", "3"} pairs
 * instead of YAML. Each value gets a distinct invented position in "test-site.yaml" so messages can be asserted.
 */
public final class Sites {

    private static int line = 1;

    private Sites() {
    }

    /** A mapping from alternating keys and values; a value may be a String, a List of Strings or a Mapping. */
    public static ConfigNode.Mapping mapping(Object... keysAndValues) {
        SourcePosition here = next();
        List<ConfigNode.Entry> entries = new ArrayList<>();
        for (int i = 0; i < keysAndValues.length; i += 2) {
            SourcePosition keyPosition = next();
            entries.add(new ConfigNode.Entry((String) keysAndValues[i], keyPosition, node(keysAndValues[i + 1],
                    new SourcePosition(keyPosition.file(), keyPosition.line(), keyPosition.column() + 10))));
        }
        return new ConfigNode.Mapping(entries, here);
    }

    public static ChannelDef channel(String id, Unit unit, Duration period) {
        return new ChannelDef(id, unit, "test channel " + id, period, period.multipliedBy(3), Optional.empty(), next());
    }

    public static OutputDef output(String id) {
        return new OutputDef(id, "test output " + id, 0, next());
    }

    public static PointDef point(String channel, ConfigNode.Mapping settings) {
        return new PointDef(channel, false, settings, next());
    }

    public static PointDef outputPoint(String output, ConfigNode.Mapping settings) {
        return new PointDef(output, true, settings, next());
    }

    public static InstrumentDef instrument(String id, String driver, ConfigNode.Mapping settings, PointDef... points) {
        return new InstrumentDef(id, driver, settings, List.of(points), next());
    }

    public static DriverContext context(TimeSource time, List<ChannelDef> channels, List<OutputDef> outputs) {
        Map<String, ChannelDef> byId = new java.util.LinkedHashMap<>();
        channels.forEach(c -> byId.put(c.id(), c));
        Map<String, OutputDef> outputsById = new java.util.LinkedHashMap<>();
        outputs.forEach(o -> outputsById.put(o.id(), o));
        return new DriverContext(byId, outputsById, time);
    }

    private static ConfigNode node(Object value, SourcePosition position) {
        if (value instanceof ConfigNode node) {
            return node;
        }
        if (value instanceof List<?> list) {
            List<ConfigNode> items = new ArrayList<>();
            for (Object item : list) {
                items.add(node(item, next()));
            }
            return new ConfigNode.Sequence(items, position);
        }
        return new ConfigNode.Scalar(String.valueOf(value), false, position);
    }

    private static synchronized SourcePosition next() {
        return new SourcePosition("test-site.yaml", line++, 3);
    }
}
