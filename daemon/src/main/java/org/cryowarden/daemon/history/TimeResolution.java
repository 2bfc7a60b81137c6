package org.cryowarden.daemon.history;

/**
 * The step in which a block counts its timestamps: the coarsest one that every interval in the block is a whole
 * multiple of, so whole-second readings cost as little as the Gorilla paper's and nanosecond ones stay exact.
 */
enum TimeResolution {
    NANOSECOND(0, 1L),
    MICROSECOND(1, 1_000L),
    MILLISECOND(2, 1_000_000L),
    SECOND(3, 1_000_000_000L);

    final int code;
    final long nanos;

    TimeResolution(int code, long nanos) {
        this.code = code;
        this.nanos = nanos;
    }

    /** The coarsest resolution not coarser than {@code current} that divides {@code intervalNanos}. */
    static TimeResolution fitting(long intervalNanos, TimeResolution current) {
        TimeResolution[] all = values();
        for (int i = current.ordinal(); i > 0; i--) {
            if (intervalNanos % all[i].nanos == 0) {
                return all[i];
            }
        }
        return NANOSECOND;
    }

    /** The resolution of a stored code; null when the code is unknown. */
    static TimeResolution ofCode(int code) {
        for (TimeResolution resolution : values()) {
            if (resolution.code == code) {
                return resolution;
            }
        }
        return null;
    }
}
