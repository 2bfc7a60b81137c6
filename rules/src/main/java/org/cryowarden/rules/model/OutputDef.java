package org.cryowarden.rules.model;

import java.util.Objects;
import org.cryowarden.rules.SourcePosition;

/**
 * An output the daemon may drive (a relay coil, a valve, a setpoint register). Interlock actions name outputs
 * by id; the owning driver executes the write.
 *
 * @param safeValue value written when the daemon has no reason to act (fan off, valve closed)
 */
public record OutputDef(String id, String description, double safeValue, SourcePosition position) {

    public OutputDef {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(description, "description");
        Objects.requireNonNull(position, "position");
    }
}
