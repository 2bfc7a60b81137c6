package org.cryowarden.rules.model;

import java.util.List;
import java.util.Objects;
import org.cryowarden.rules.SourcePosition;

/** One transport shared by several instruments (RS-485 multidrop), polled by one thread, one transaction at a time. */
public record BusDef(String id, TransportDef transport, List<InstrumentDef> instruments, SourcePosition position) {

    public BusDef {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(transport, "transport");
        instruments = List.copyOf(instruments);
        Objects.requireNonNull(position, "position");
    }
}
