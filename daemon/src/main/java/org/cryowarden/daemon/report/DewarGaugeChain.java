package org.cryowarden.daemon.report;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import java.util.Optional;
import java.util.function.Function;
import java.util.stream.Collectors;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.ChannelDef;
import org.cryowarden.rules.model.DerivedChannelDef;
import org.cryowarden.rules.model.SiteDef;
import org.cryowarden.rules.physics.DewarGauge;
import org.cryowarden.rules.physics.VerticalVessel;

/**
 * How a site says a dewar's contents follow from its level: a measured level channel in %, a
 * {@code probe_percent_height} channel on it and a {@code litres_*} channel on that. The report computes the
 * consumption from the level channel through the same geometry ({@link DewarGauge}).
 *
 * @param levelChannel  the measured level channel, in %
 * @param litresChannel the derived litres channel that names the vessel
 */
public record DewarGaugeChain(String levelChannel, String litresChannel, String description, DewarGauge gauge) {

    public DewarGaugeChain {
        Objects.requireNonNull(levelChannel, "levelChannel");
        Objects.requireNonNull(litresChannel, "litresChannel");
        Objects.requireNonNull(description, "description");
        Objects.requireNonNull(gauge, "gauge");
    }

    /** Every such chain of {@code site}, in the order of its litres channels. */
    public static List<DewarGaugeChain> of(SiteDef site) {
        Map<String, DerivedChannelDef> derived = site.derived().stream()
                .collect(Collectors.toMap(DerivedChannelDef::id, Function.identity()));
        Map<String, ChannelDef> measured = site.channels().stream()
                .collect(Collectors.toMap(ChannelDef::id, Function.identity()));
        List<DewarGaugeChain> chains = new ArrayList<>();
        for (DerivedChannelDef litres : site.derived()) {
            Optional<VerticalVessel> vessel = vessel(litres);
            if (vessel.isEmpty() || litres.inputs().size() != 1) {
                continue;
            }
            DerivedChannelDef height = derived.get(litres.inputs().get(0));
            if (height == null || !height.function().equals("probe_percent_height") || height.inputs().size() != 1) {
                continue;
            }
            ChannelDef level = measured.get(height.inputs().get(0));
            if (level == null || level.unit() != Unit.PERCENT) {
                continue;
            }
            DewarGauge gauge = new DewarGauge(metres(height, "active_length"), metres(height, "bottom_offset"),
                    vessel.get());
            chains.add(new DewarGaugeChain(level.id(), litres.id(),
                    litres.description().isBlank() ? level.description() : litres.description(), gauge));
        }
        return chains;
    }

    /** Litres when the probe reads 100 %. */
    public double fullLitres() {
        return gauge.litres(100);
    }

    private static Optional<VerticalVessel> vessel(DerivedChannelDef litres) {
        return switch (litres.function()) {
            case "litres_flat_bottom" -> Optional.of(VerticalVessel.flatBottom(metres(litres, "diameter"),
                    metres(litres, "straight_length")));
            case "litres_hemispherical_bottom" -> Optional.of(VerticalVessel.hemisphericalBottom(
                    metres(litres, "diameter"), metres(litres, "straight_length")));
            case "litres_asme_fd_bottom" -> Optional.of(VerticalVessel.asmeFlangedAndDishedBottom(
                    metres(litres, "diameter"), metres(litres, "straight_length")));
            case "litres_torispherical_bottom" -> Optional.of(VerticalVessel.torisphericalBottom(
                    metres(litres, "diameter"), metres(litres, "straight_length"), metres(litres, "crown_radius"),
                    metres(litres, "knuckle_radius")));
            default -> Optional.empty();
        };
    }

    private static double metres(DerivedChannelDef channel, String parameter) {
        Quantity value = channel.parameters().get(parameter);
        // The loader checked every parameter of a built-in function; a missing one here is a programming error.
        Objects.requireNonNull(value, () -> "derived channel " + channel.id() + " has no parameter " + parameter);
        return value.in(Unit.METRE);
    }
}
