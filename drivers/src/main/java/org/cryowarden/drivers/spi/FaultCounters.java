package org.cryowarden.drivers.spi;

import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.atomic.LongAdder;

/**
 * Outcome counters for {@link InstrumentDriver#counters()}: incremented by the poller thread, read by anyone
 * (metrics, {@code status}).
 */
public final class FaultCounters {

    private final Map<String, LongAdder> counts = new ConcurrentHashMap<>();

    public void increment(String key) {
        counts.computeIfAbsent(key, k -> new LongAdder()).increment();
    }

    public long get(String key) {
        LongAdder adder = counts.get(key);
        return adder == null ? 0 : adder.sum();
    }

    /** A sorted copy. */
    public Map<String, Long> snapshot() {
        Map<String, Long> copy = new TreeMap<>();
        counts.forEach((key, adder) -> copy.put(key, adder.sum()));
        return copy;
    }
}
