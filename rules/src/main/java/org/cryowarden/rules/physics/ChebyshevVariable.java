package org.cryowarden.rules.physics;

/** What a Chebyshev calibration series is written in: the raw reading itself or its decimal logarithm. */
public enum ChebyshevVariable {
    /** Z = raw (diode voltages). */
    RAW,
    /** Z = log10(raw) (resistance thermometers, whose resistance spans decades). */
    LOG10_RAW
}
