package org.cryowarden.simulator.emulators;

import java.util.ArrayDeque;
import java.util.Deque;
import java.util.List;
import java.util.Optional;
import java.util.OptionalInt;
import org.cryowarden.drivers.scpi.ErrorEntry;
import org.cryowarden.drivers.scpi.Identity;
import org.cryowarden.drivers.scpi.ScpiCommand;
import org.cryowarden.drivers.text.Terminator;
import org.cryowarden.simulator.sensors.SensorSnapshot;

/**
 * A text instrument with a command set of our own built on standard SCPI forms: the IEEE 488.2 common commands
 * {@code *IDN?}, {@code *RST}, {@code *CLS}, {@code *OPC?}, an error queue read by {@code SYSTem:ERRor[:NEXT]?}
 * ({@code 0,"No error"} when empty) and the SCPI 1999 command-error codes: -102 Syntax error, -109 Missing
 * parameter, -113 Undefined header, -222 Data out of range, -350 Queue overflow (SCPI 1999, Volume 2, §21.8).
 * A command in error adds to the queue and, as with real instruments, a query in error sends nothing.
 */
public abstract class ScpiInstrument extends Instrument {

    private static final int QUEUE_LENGTH = 16;

    private final Identity identity;
    private final Terminator terminator;
    private final Deque<ErrorEntry> errors = new ArrayDeque<>();

    protected ScpiInstrument(String id, Identity identity, Terminator terminator, long seed) {
        super(id, seed);
        this.identity = identity;
        this.terminator = terminator;
    }

    @Override
    public Protocol protocol() {
        return Protocol.SCPI;
    }

    public Terminator terminator() {
        return terminator;
    }

    public Identity identity() {
        return identity;
    }

    /** True when the header is one of this instrument's own (device-specific) commands. */
    public abstract boolean knows(ScpiCommand command);

    /** Runs a device-specific command; empty for a command, or a query that failed (its error is queued). */
    protected abstract Optional<String> execute(ScpiCommand command, SensorSnapshot snapshot);

    /** Runs any command addressed to this instrument; returns the response line of a query, if any. */
    public final Optional<String> handle(ScpiCommand command, SensorSnapshot snapshot) {
        if (command.matches("*IDN") && command.query()) {
            return Optional.of(identity.format());
        }
        if (command.matches("*OPC") && command.query()) {
            return Optional.of("1");
        }
        if (command.matches("*CLS") && !command.query()) {
            synchronized (errors) {
                errors.clear();
            }
            return Optional.empty();
        }
        if (command.matches("*RST") && !command.query()) {
            return Optional.empty();
        }
        if ((command.matches("SYSTem:ERRor") || command.matches("SYSTem:ERRor:NEXT")) && command.query()) {
            synchronized (errors) {
                ErrorEntry next = errors.pollFirst();
                return Optional.of((next == null ? ErrorEntry.NO_ERROR : next).format());
            }
        }
        if (knows(command)) {
            return execute(command, snapshot);
        }
        queueError(-113, "Undefined header");
        return Optional.empty();
    }

    /** Adds an entry to the error queue; a full queue replaces its last entry with -350 (SCPI 1999). */
    public void queueError(int code, String text) {
        synchronized (errors) {
            if (errors.size() >= QUEUE_LENGTH) {
                errors.pollLast();
                errors.addLast(new ErrorEntry(-350, "Queue overflow"));
                return;
            }
            errors.addLast(new ErrorEntry(code, text));
        }
    }

    /** The channel number a query names as its one parameter, or empty after queuing the error. */
    protected OptionalInt channelParameter(ScpiCommand command, List<Integer> channels) {
        List<String> parameters = command.parameters();
        if (parameters.isEmpty()) {
            queueError(-109, "Missing parameter");
            return OptionalInt.empty();
        }
        int channel;
        try {
            channel = Integer.parseInt(parameters.get(0).strip());
        } catch (NumberFormatException e) {
            queueError(-102, "Syntax error");
            return OptionalInt.empty();
        }
        if (!channels.contains(channel)) {
            queueError(-222, "Data out of range");
            return OptionalInt.empty();
        }
        return OptionalInt.of(channel);
    }
}
