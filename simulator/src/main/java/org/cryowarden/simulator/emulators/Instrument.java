package org.cryowarden.simulator.emulators;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;
import java.util.Random;
import java.util.concurrent.ConcurrentHashMap;

/**
 * An emulated instrument: it reads sensor values from the latest snapshot and shows the faults the timeline
 * scripts. The timeline sets faults on the simulation thread; connection threads read them, so the fault list
 * is an immutable list behind a volatile field.
 */
public abstract class Instrument {

    private final String id;
    private volatile List<Fault> faults = List.of();
    private final Map<Integer, Double> frozen = new ConcurrentHashMap<>();
    private final Random faultNoise;

    protected Instrument(String id, long seed) {
        this.id = id;
        this.faultNoise = new Random(seed ^ id.hashCode());
    }

    public String id() {
        return id;
    }

    /** The protocol the instrument speaks; all instruments on one port speak the same. */
    public abstract Protocol protocol();

    /** Starts a fault, replacing one of the same kind. */
    public synchronized void startFault(Fault fault) {
        List<Fault> next = new ArrayList<>();
        for (Fault existing : faults) {
            if (existing.kind() != fault.kind()) {
                next.add(existing);
            }
        }
        next.add(fault);
        if (fault.kind() == FaultKind.STUCK) {
            frozen.clear();
        }
        faults = List.copyOf(next);
    }

    /** Ends faults of one kind, or all of them when {@code kind} is empty. */
    public synchronized void clearFault(Optional<FaultKind> kind) {
        List<Fault> next = new ArrayList<>();
        for (Fault existing : faults) {
            if (kind.isPresent() && existing.kind() != kind.get()) {
                next.add(existing);
            }
        }
        faults = List.copyOf(next);
    }

    public List<Fault> faults() {
        return faults;
    }

    public Optional<Fault> fault(FaultKind kind) {
        for (Fault fault : faults) {
            if (fault.kind() == kind) {
                return Optional.of(fault);
            }
        }
        return Optional.empty();
    }

    /** True when a fault of this kind affects {@code channel}. */
    protected boolean hasFault(FaultKind kind, int channel) {
        for (Fault fault : faults) {
            if (fault.kind() == kind && fault.appliesTo(channel)) {
                return true;
            }
        }
        return false;
    }

    /** The value of a channel as the faulty instrument reports it at {@code now} (seconds since the start). */
    protected double faulted(int channel, double value, double now) {
        double result = value;
        for (Fault fault : faults) {
            if (!fault.appliesTo(channel)) {
                continue;
            }
            switch (fault.kind()) {
                case DRIFT -> result += fault.amount() * (now - fault.since()) / 3600;
                case NOISE -> {
                    synchronized (faultNoise) {
                        result += fault.amount() * faultNoise.nextGaussian();
                    }
                }
                default -> {
                }
            }
        }
        for (Fault fault : faults) {
            if (fault.kind() == FaultKind.STUCK && fault.appliesTo(channel)) {
                final double current = result;
                return frozen.computeIfAbsent(channel, c -> current);
            }
        }
        return result;
    }

    /** Bytes for a garbage reply: a few random bytes, seeded. */
    byte[] garbage() {
        synchronized (faultNoise) {
            byte[] bytes = new byte[3 + faultNoise.nextInt(10)];
            faultNoise.nextBytes(bytes);
            return bytes;
        }
    }
}
