package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * One interlock as the status API shows it.
 *
 * @param causes the alarms that tripped it since it was last reset, first one first
 */
public record InterlockStatus(
        String id, String description, boolean tripped, Optional<Instant> trippedAt, List<String> causes,
        Optional<Bypass> bypass) {

    public InterlockStatus {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(description, "description");
        Objects.requireNonNull(trippedAt, "trippedAt");
        causes = List.copyOf(causes);
        Objects.requireNonNull(bypass, "bypass");
    }
}
