package org.cryowarden.drivers.modbus;

import java.time.Duration;

/**
 * RTU character timing: a character is 11 bits on the line (start, 8 data, parity or second stop, stop); frames
 * are separated by at least 3.5 character times and characters inside a frame by at most 1.5. Above 19200 baud
 * the specification fixes 1.750 ms and 0.750 ms. Source: Modbus over Serial Line Specification and
 * Implementation Guide V1.02, §2.5.1.1 (MODBUS Message RTU Framing).
 *
 * @param interFrame    the silent interval t3.5 that ends a frame
 * @param interCharacter the limit t1.5 between two characters of one frame
 */
public record RtuTiming(Duration interFrame, Duration interCharacter) {

    private static final int BITS_PER_CHARACTER = 11;

    public static RtuTiming forBaud(int baud) {
        if (baud <= 0) {
            throw new IllegalArgumentException("baud rate must be positive, got " + baud);
        }
        if (baud > 19200) {
            return new RtuTiming(Duration.ofNanos(1_750_000), Duration.ofNanos(750_000));
        }
        long characterNanosTimesBaud = BITS_PER_CHARACTER * 1_000_000_000L;
        return new RtuTiming(Duration.ofNanos(35 * characterNanosTimesBaud / (10L * baud)),
                Duration.ofNanos(15 * characterNanosTimesBaud / (10L * baud)));
    }
}
