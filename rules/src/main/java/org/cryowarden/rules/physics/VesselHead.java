package org.cryowarden.rules.physics;

/** The shape of a vertical vessel's bottom, which sets how litres grow with the first centimetres of liquid. */
public enum VesselHead {
    FLAT,
    HEMISPHERICAL,
    /** Torispherical (flanged and dished): a spherical crown joined to the shell by a toroidal knuckle. */
    TORISPHERICAL
}
