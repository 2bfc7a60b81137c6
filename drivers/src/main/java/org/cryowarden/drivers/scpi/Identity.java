package org.cryowarden.drivers.scpi;

import java.util.Objects;
import java.util.Optional;

/**
 * The answer to {@code *IDN?}: four comma-separated fields, manufacturer, model, serial number and firmware
 * level (IEEE 488.2-1992, §10.14). Published as the instrument's identity.
 */
public record Identity(String manufacturer, String model, String serialNumber, String firmware) {

    public Identity {
        Objects.requireNonNull(manufacturer, "manufacturer");
        Objects.requireNonNull(model, "model");
        Objects.requireNonNull(serialNumber, "serialNumber");
        Objects.requireNonNull(firmware, "firmware");
    }

    /** The four fields of an {@code *IDN?} response, or empty when it does not have exactly four. */
    public static Optional<Identity> parse(String response) {
        String[] fields = response.strip().split(",", -1);
        if (fields.length != 4) {
            return Optional.empty();
        }
        return Optional.of(new Identity(fields[0].strip(), fields[1].strip(), fields[2].strip(), fields[3].strip()));
    }

    /** The response text an instrument sends: "ACME,LM-500,1234,1.2". */
    public String format() {
        return manufacturer + "," + model + "," + serialNumber + "," + firmware;
    }
}
