package org.cryowarden.rules.engine;

import java.util.List;

/**
 * What {@link Engine#restore(EngineSnapshot)} did.
 *
 * @param events output commands that re-assert the actions of interlocks still tripped, for the drivers
 * @param notes  entries of the snapshot that no longer fit the configuration (a removed rule), for the log
 */
public record RestoreResult(List<EngineEvent> events, List<String> notes) {

    public RestoreResult {
        events = List.copyOf(events);
        notes = List.copyOf(notes);
    }
}
