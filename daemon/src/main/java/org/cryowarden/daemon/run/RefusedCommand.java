package org.cryowarden.daemon.run;

import com.fasterxml.jackson.databind.node.ObjectNode;
import java.time.Instant;
import java.util.Optional;

/**
 * The {@code command.refused} event: an operator command that changed nothing, with the reason the reply gave, so
 * the journal shows who tried what and why it was refused.
 */
final class RefusedCommand {

    static final String KIND = "command.refused";

    private RefusedCommand() {
    }

    /** The subject and operator are the command's when its body could be read. */
    static DaemonEvent event(String via, String verb, Optional<OperatorCommand> command, String reason, Instant at) {
        ObjectNode payload = Payloads.object();
        payload.put("cause", "command " + verb + " over " + via + " refused: " + reason);
        payload.put("via", via);
        payload.put("verb", verb);
        payload.put("reason", reason);
        command.ifPresent(c -> {
            if (!c.note().isEmpty()) {
                payload.put("note", c.note());
            }
            c.duration().ifPresent(d -> payload.put("duration", d.toString()));
            if (!c.reason().isEmpty()) {
                payload.put("command_reason", c.reason());
            }
        });
        return new DaemonEvent(KIND, at, command.map(OperatorCommand::target), command.map(OperatorCommand::operator),
                payload);
    }
}
