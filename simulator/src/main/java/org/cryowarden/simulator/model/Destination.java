package org.cryowarden.simulator.model;

/** Where gas leaving a vessel goes: the helium recovery line (out of the model) or the vessel's room. */
public enum Destination {
    RECOVERY, ROOM
}
