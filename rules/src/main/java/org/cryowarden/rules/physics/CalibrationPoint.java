package org.cryowarden.rules.physics;

/** One row of a sensor calibration table: what the instrument reads and what it means. */
public record CalibrationPoint(double raw, double value) {
}
