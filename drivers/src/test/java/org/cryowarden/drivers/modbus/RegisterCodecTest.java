package org.cryowarden.drivers.modbus;

import static org.assertj.core.api.Assertions.assertThat;

import org.junit.jupiter.api.Test;

class RegisterCodecTest {

    @Test
    void float32FollowsIeee754Binary32InEitherWordOrder() {
        // IEEE Std 754-2008 binary32: 0x41200000 is 10.0; 0x40490FDB is the float nearest pi (3.14159274...).
        assertThat(RegisterCodec.decode(new int[] {0x4120, 0x0000}, 0, RegisterType.FLOAT32, WordOrder.BIG)).isEqualTo(10.0);
        assertThat(RegisterCodec.decode(new int[] {0x0000, 0x4120}, 0, RegisterType.FLOAT32, WordOrder.LITTLE)).isEqualTo(10.0);
        assertThat(RegisterCodec.decode(new int[] {0x4049, 0x0FDB}, 0, RegisterType.FLOAT32, WordOrder.BIG))
                .isEqualTo((double) (float) Math.PI);
        assertThat(RegisterCodec.encode(10.0, RegisterType.FLOAT32, WordOrder.LITTLE)).containsExactly(0x0000, 0x4120);
    }

    @Test
    void signedTypesAreTwosComplement() {
        // common practice: int16 0xFFFF is -1, 0x8000 is -32768; int32 0xFFFFFFFE is -2.
        assertThat(RegisterCodec.decode(new int[] {0xFFFF}, 0, RegisterType.INT16, WordOrder.BIG)).isEqualTo(-1.0);
        assertThat(RegisterCodec.decode(new int[] {0x8000}, 0, RegisterType.INT16, WordOrder.BIG)).isEqualTo(-32768.0);
        assertThat(RegisterCodec.decode(new int[] {0xFFFF}, 0, RegisterType.UINT16, WordOrder.BIG)).isEqualTo(65535.0);
        assertThat(RegisterCodec.decode(new int[] {0xFFFF, 0xFFFE}, 0, RegisterType.INT32, WordOrder.BIG)).isEqualTo(-2.0);
        assertThat(RegisterCodec.decode(new int[] {0xFFFE, 0xFFFF}, 0, RegisterType.INT32, WordOrder.LITTLE)).isEqualTo(-2.0);
        assertThat(RegisterCodec.decode(new int[] {0xFFFF, 0xFFFE}, 0, RegisterType.UINT32, WordOrder.BIG))
                .isEqualTo(4_294_967_294.0);
        assertThat(RegisterCodec.decode(new int[] {0x0001, 0x0000}, 0, RegisterType.UINT32, WordOrder.BIG)).isEqualTo(65536.0);
    }

    @Test
    void encodingRoundTripsAndRefusesValuesThatDoNotFit() {
        for (RegisterType type : RegisterType.values()) {
            for (WordOrder order : WordOrder.values()) {
                int[] registers = RegisterCodec.encode(1234, type, order);
                assertThat(RegisterCodec.decode(registers, 0, type, order)).as("%s %s", type, order).isEqualTo(1234.0);
            }
        }
        assertThat(RegisterCodec.fits(-1, RegisterType.UINT16)).isFalse();
        assertThat(RegisterCodec.fits(40000, RegisterType.INT16)).isFalse();
        assertThat(RegisterCodec.fits(-40000, RegisterType.INT32)).isTrue();
        assertThat(RegisterCodec.fits(Double.NaN, RegisterType.UINT32)).isFalse();
    }
}
