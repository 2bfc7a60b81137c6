package org.cryowarden.daemon.history;

/**
 * A stored history block cannot be read: truncated, damaged, of an unknown format version, or inconsistent. The
 * message names the block and what is wrong; no reading of such a block is ever returned.
 */
public final class CorruptBlockException extends RuntimeException {

    private final String block;

    CorruptBlockException(String block, String problem) {
        super("history block " + block + ": " + problem);
        this.block = block;
    }

    /** The label of the block, as given to {@link HistoryBlock#parse}. */
    public String block() {
        return block;
    }
}
