package org.cryowarden.simulator.emulators;

/** The wire protocols the emulators speak, through the drivers' codecs. */
public enum Protocol {
    /** Modbus RTU frames (on a pseudo-terminal, or raw over TCP as a serial device server passes them). */
    MODBUS_RTU,
    /** SCPI-style text commands and responses, one per line. */
    SCPI,
    /** A device that prints a line per reading by itself. */
    LINE
}
