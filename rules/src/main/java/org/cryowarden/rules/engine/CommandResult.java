package org.cryowarden.rules.engine;

import java.util.List;
import java.util.Objects;
import java.util.Optional;

/**
 * The answer to an operator command: accepted, or refused with a reason the operator can act on. Either way
 * {@code events} holds everything the engine emitted during the call (a refused command may still come with the
 * events of timers that fell due first).
 */
public record CommandResult(Optional<String> refusal, List<EngineEvent> events) {

    public CommandResult {
        Objects.requireNonNull(refusal, "refusal");
        events = List.copyOf(events);
    }

    static CommandResult ok(List<EngineEvent> events) {
        return new CommandResult(Optional.empty(), events);
    }

    static CommandResult refused(String reason, List<EngineEvent> events) {
        return new CommandResult(Optional.of(reason), events);
    }

    public boolean isOk() {
        return refusal.isEmpty();
    }
}
