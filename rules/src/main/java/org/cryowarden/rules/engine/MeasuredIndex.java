package org.cryowarden.rules.engine;

import java.util.Map;

/**
 * The measured channels by id, for the one lookup every reading makes. An open-addressed table of ids and channels
 * side by side in one array: a reading's id is usually the very string the configuration was built from (drivers
 * take their ids from it), so the probe ends on a reference comparison in the slot that holds the channel too,
 * without the entry object and pointer hops of a hash map. Each slot's hash sits in an array beside, so that a
 * probe passing another channel's slot rejects it without reading that id's characters; strings of equal hash are
 * compared by content. Built once; never changes.
 */
final class MeasuredIndex {

    /** Each slot's id and channel side by side ({@code 2 * slot}, {@code 2 * slot + 1}): one cache line a probe. */
    private final Object[] slots;
    private final int[] hashes;
    private final int mask;

    MeasuredIndex(Map<String, MeasuredChannel> measured) {
        int capacity = Integer.highestOneBit(Math.max(4, measured.size() * 4) - 1) << 1;
        slots = new Object[2 * capacity];
        hashes = new int[capacity];
        mask = capacity - 1;
        for (Map.Entry<String, MeasuredChannel> entry : measured.entrySet()) {
            int hash = entry.getKey().hashCode();
            int slot = spread(hash) & mask;
            while (slots[2 * slot] != null) {
                slot = (slot + 1) & mask;
            }
            slots[2 * slot] = entry.getKey();
            slots[2 * slot + 1] = entry.getValue();
            hashes[slot] = hash;
        }
    }

    /** The channel of that id, or null when it is not a measured channel. */
    MeasuredChannel get(String id) {
        int hash = id.hashCode();
        int slot = spread(hash) & mask;
        Object key;
        while ((key = slots[2 * slot]) != null) {
            if (key == id || hashes[slot] == hash && key.equals(id)) {
                return (MeasuredChannel) slots[2 * slot + 1];
            }
            slot = (slot + 1) & mask;
        }
        return null;
    }

    private static int spread(int hash) {
        return hash ^ (hash >>> 16);
    }
}
