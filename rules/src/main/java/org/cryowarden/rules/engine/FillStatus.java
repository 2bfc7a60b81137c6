package org.cryowarden.rules.engine;

import java.time.Instant;
import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * A fill controller now, for the API and the dashboard.
 *
 * @param since          when it entered {@code state}
 * @param lockout        the cause of the lockout while locked out
 * @param activeBlockers the blocking alarms active now; no fill starts while any is
 */
public record FillStatus(String id, String channel, String valve, FillState state, Instant since,
        Optional<String> lockout, List<String> activeBlockers) {

    public FillStatus {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(channel, "channel");
        Objects.requireNonNull(valve, "valve");
        Objects.requireNonNull(state, "state");
        Objects.requireNonNull(since, "since");
        Objects.requireNonNull(lockout, "lockout");
        activeBlockers = List.copyOf(activeBlockers);
    }
}
