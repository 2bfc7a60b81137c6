package org.cryowarden.rules.model;

import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.SourcePosition;

/**
 * A named set of output actions that rules trip (via {@link AlarmOptions#trips()}). A trip stays latched until
 * its cause is clear and an operator resets it; on reset the outputs return to their safe values.
 */
public record InterlockDef(String id, String description, List<OutputAction> actions, SourcePosition position) {

    public InterlockDef {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(description, "description");
        actions = List.copyOf(actions);
        Objects.requireNonNull(position, "position");
        if (actions.isEmpty()) {
            throw new IllegalArgumentException("interlock " + id + " has no actions");
        }
    }
}
