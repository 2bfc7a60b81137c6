package org.cryowarden.drivers.text;

import java.util.Objects;

/** What a {@link LineAssembler} found in the bytes fed to it. */
public sealed interface LineEvent {

    /** A complete line without its terminator. */
    record Line(String text) implements LineEvent {
        public Line {
            Objects.requireNonNull(text, "text");
        }
    }

    /** A line longer than the limit; its bytes up to the next terminator were dropped. */
    record Oversized(int droppedBytes, int limit) implements LineEvent {
    }
}
