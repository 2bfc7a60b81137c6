package org.cryowarden.drivers.modbus;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import org.junit.jupiter.api.Test;

class ModbusCrcTest {

    @Test
    void readHoldingRequestCarriesCrcC5CdLowByteFirst() {
        // Modbus over Serial Line V1.02, §2.5.1.2 / Appendix B: request 01 03 00 00 00 0A is sent with CRC C5 CD.
        byte[] frame = ModbusCrc.append(Hex.parse("01 03 00 00 00 0A"));

        assertThat(Hex.of(frame)).isEqualTo("01 03 00 00 00 0A C5 CD");
        assertThat(ModbusCrc.isValid(frame, frame.length)).isTrue();
    }

    @Test
    void checkValueOfTheStandardNineDigitsIs4B37() {
        // Catalogue of parametrised CRC algorithms (R. Williams' model; G. Cook's catalogue), CRC-16/MODBUS:
        // poly 0x8005 reflected, init 0xFFFF, check value for "123456789" is 0x4B37.
        byte[] digits = "123456789".getBytes(StandardCharsets.US_ASCII);

        assertThat(ModbusCrc.compute(digits, 0, digits.length)).isEqualTo(0x4B37);
    }

    @Test
    void singleRegisterReadCarriesCrc840A() {
        // from memory: the frequently quoted frame 01 03 00 00 00 01 84 0A.
        assertThat(Hex.of(ModbusCrc.append(Hex.parse("01 03 00 00 00 01")))).isEqualTo("01 03 00 00 00 01 84 0A");
    }

    @Test
    void anySingleBitFlipIsDetected() {
        byte[] frame = ModbusCrc.append(Hex.parse("11 03 06 02 2B 00 00 00 64"));
        for (int bit = 0; bit < frame.length * 8; bit++) {
            byte[] copy = frame.clone();
            copy[bit / 8] ^= (byte) (1 << (bit % 8));
            assertThat(ModbusCrc.isValid(copy, copy.length)).as("bit %d flipped", bit).isFalse();
        }
    }

    @Test
    void framesShorterThanThreeBytesAreNeverValid() {
        assertThat(ModbusCrc.isValid(new byte[] {(byte) 0xFF, (byte) 0xFF}, 2)).isFalse();
        assertThat(ModbusCrc.isValid(new byte[0], 0)).isFalse();
    }
}
