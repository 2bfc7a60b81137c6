package org.cryowarden.drivers.transport;

import java.util.Objects;

/**
 * The line settings of a serial port.
 *
 * @param port     device path ("/dev/ttyUSB0", "/dev/serial/by-id/...", a pseudo-terminal link)
 * @param baud     line speed in bit/s
 * @param dataBits 5-8
 * @param parity   none, even or odd
 * @param stopBits 1 or 2
 * @param flow     flow control
 */
public record SerialSettings(String port, int baud, int dataBits, Parity parity, int stopBits, FlowControl flow) {

    public SerialSettings {
        Objects.requireNonNull(port, "port");
        Objects.requireNonNull(parity, "parity");
        Objects.requireNonNull(flow, "flow");
        if (baud <= 0 || dataBits < 5 || dataBits > 8 || (stopBits != 1 && stopBits != 2)) {
            throw new IllegalArgumentException("invalid serial settings " + baud + " " + dataBits + " " + stopBits);
        }
    }

    /** 9600 baud 8N1 without flow control, the usual Modbus RTU default (the RTU specification asks for even parity). */
    public static SerialSettings defaults(String port) {
        return new SerialSettings(port, 9600, 8, Parity.NONE, 1, FlowControl.NONE);
    }

    /** "9600 8N1". */
    public String lineCode() {
        return baud + " " + dataBits + parity.letter() + stopBits;
    }

    public enum Parity {
        NONE('N'), EVEN('E'), ODD('O');

        private final char letter;

        Parity(char letter) {
            this.letter = letter;
        }

        public char letter() {
            return letter;
        }
    }

    public enum FlowControl {
        NONE, RTS_CTS, XON_XOFF
    }
}
