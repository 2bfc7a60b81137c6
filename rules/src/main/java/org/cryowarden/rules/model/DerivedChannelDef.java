package org.cryowarden.rules.model;

import java.util.List;
import java.util.Map;
import java.util.Objects;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.Unit;

/**
 * A channel computed from other channels by one named built-in function (min, max, mean, difference, and
 * the physics functions such as helium-4 saturation temperature). There is deliberately no expression language.
 *
 * @param function   name of a built-in function
 * @param inputs     channel ids, in the order the function expects
 * @param unit       unit of the result
 * @param parameters named constants the function needs (a probe length, a dewar diameter), with units
 */
public record DerivedChannelDef(
        String id,
        String function,
        List<String> inputs,
        Unit unit,
        Map<String, Quantity> parameters,
        String description,
        SourcePosition position) {

    public DerivedChannelDef {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(function, "function");
        inputs = List.copyOf(inputs);
        Objects.requireNonNull(unit, "unit");
        parameters = Map.copyOf(parameters);
        Objects.requireNonNull(description, "description");
        Objects.requireNonNull(position, "position");
    }
}
