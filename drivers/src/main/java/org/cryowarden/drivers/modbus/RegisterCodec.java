package org.cryowarden.drivers.modbus;

/**
 * Register values to numbers and back, for both sides: the master decodes what it read, the simulator encodes
 * what it serves. Scale and offset apply as {@code value = raw * scale + offset}.
 */
public final class RegisterCodec {

    private RegisterCodec() {
    }

    /** The raw number held in {@code type.registers()} registers starting at {@code offset} (values 0-65535). */
    public static double decode(int[] registers, int offset, RegisterType type, WordOrder order) {
        return switch (type) {
            case UINT16 -> registers[offset] & 0xFFFF;
            case INT16 -> (short) registers[offset];
            case UINT32 -> Integer.toUnsignedLong(join(registers, offset, order));
            case INT32 -> join(registers, offset, order);
            case FLOAT32 -> Float.intBitsToFloat(join(registers, offset, order));
        };
    }

    /**
     * The registers that hold {@code raw} (already un-scaled), rounding integers to the nearest value.
     *
     * @throws IllegalArgumentException when {@code raw} does not fit the type (a programming or configuration
     *                                  error: callers check {@link #fits} first)
     */
    public static int[] encode(double raw, RegisterType type, WordOrder order) {
        if (!fits(raw, type)) {
            throw new IllegalArgumentException(raw + " does not fit " + type.configName());
        }
        return switch (type) {
            case UINT16, INT16 -> new int[] {(int) Math.round(raw) & 0xFFFF};
            case UINT32, INT32 -> split((int) Math.round(raw), order);
            case FLOAT32 -> split(Float.floatToIntBits((float) raw), order);
        };
    }

    /** True when {@code raw} can be written as {@code type} without wrapping. */
    public static boolean fits(double raw, RegisterType type) {
        if (Double.isNaN(raw)) {
            return type == RegisterType.FLOAT32;
        }
        double rounded = Math.rint(raw);
        return switch (type) {
            case UINT16 -> rounded >= 0 && rounded <= 0xFFFF;
            case INT16 -> rounded >= Short.MIN_VALUE && rounded <= Short.MAX_VALUE;
            case UINT32 -> rounded >= 0 && rounded <= 0xFFFF_FFFFL;
            case INT32 -> rounded >= Integer.MIN_VALUE && rounded <= Integer.MAX_VALUE;
            case FLOAT32 -> Double.isInfinite(raw) || Math.abs(raw) <= Float.MAX_VALUE;
        };
    }

    private static int join(int[] registers, int offset, WordOrder order) {
        int first = registers[offset] & 0xFFFF;
        int second = registers[offset + 1] & 0xFFFF;
        return order == WordOrder.BIG ? first << 16 | second : second << 16 | first;
    }

    private static int[] split(int bits, WordOrder order) {
        int high = bits >>> 16;
        int low = bits & 0xFFFF;
        return order == WordOrder.BIG ? new int[] {high, low} : new int[] {low, high};
    }
}
