package org.cryowarden.rules.model;

/**
 * Which side of a setpoint is abnormal. For a rate rule HIGH means rising faster than the rate, LOW falling
 * faster than it.
 */
public enum Direction {
    HIGH,
    LOW
}
