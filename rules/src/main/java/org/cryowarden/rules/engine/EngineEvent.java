package org.cryowarden.rules.engine;

import java.time.Instant;

/**
 * Something the engine decided. Every event carries the wall-clock instant (UTC) at which the engine decided it
 * and a cause an operator can read. Events come back from every engine call in the order they happened; the
 * daemon journals and publishes them, and hands {@link OutputCommand}s to the drivers.
 */
public sealed interface EngineEvent
        permits AlarmTransition, InterlockTripped, InterlockReset, BypassStarted, BypassEnded, OutputCommand,
        FillStarted, FillStopped, FillReset, FloodStarted, FloodEnded {

    Instant instant();

    String cause();
}
