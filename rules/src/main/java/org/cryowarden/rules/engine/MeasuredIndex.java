package org.cryowarden.rules.engine;

import java.util.Map;

/**
 * The measured channels by id, for the one lookup every reading makes. An open-addressed table of ids and channels
 * side by side: a reading's id is usually the very string the configuration was built from (drivers take their ids
 * from it), so the probe ends on a reference comparison in the key array, without the entry object and pointer
 * hops of a hash map. Each slot's hash sits in an array beside, so that a probe passing another channel's slot
 * rejects it without reading that id's characters; strings of equal hash are compared by content. Built once;
 * never changes.
 */
final class MeasuredIndex {

    private final String[] ids;
    private final int[] hashes;
    private final MeasuredChannel[] channels;
    private final int mask;

    MeasuredIndex(Map<String, MeasuredChannel> measured) {
        int capacity = Integer.highestOneBit(Math.max(4, measured.size() * 4) - 1) << 1;
        ids = new String[capacity];
        hashes = new int[capacity];
        channels = new MeasuredChannel[capacity];
        mask = capacity - 1;
        for (Map.Entry<String, MeasuredChannel> entry : measured.entrySet()) {
            int hash = entry.getKey().hashCode();
            int slot = spread(hash) & mask;
            while (ids[slot] != null) {
                slot = (slot + 1) & mask;
            }
            ids[slot] = entry.getKey();
            hashes[slot] = hash;
            channels[slot] = entry.getValue();
        }
    }

    /** The channel of that id, or null when it is not a measured channel. */
    MeasuredChannel get(String id) {
        int hash = id.hashCode();
        int slot = spread(hash) & mask;
        String key;
        while ((key = ids[slot]) != null) {
            if (key == id || hashes[slot] == hash && key.equals(id)) {
                return channels[slot];
            }
            slot = (slot + 1) & mask;
        }
        return null;
    }

    private static int spread(int hash) {
        return hash ^ (hash >>> 16);
    }
}
