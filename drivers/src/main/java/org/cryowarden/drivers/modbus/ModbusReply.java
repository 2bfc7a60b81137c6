package org.cryowarden.drivers.modbus;

import java.util.Objects;

/**
 * What a master made of the bytes that came back for one request: values, a confirmed write, an exception
 * response, or a fault. Every possible byte sequence maps to exactly one of these (see
 * {@link ModbusMasterCodec#decodeResponse}).
 */
public sealed interface ModbusReply {

    /** True only for a {@link Success}: {@link Values} and {@link WriteConfirmed}. */
    boolean isOk();

    /** Text for a reading's reason or an operator's terminal; empty when OK. */
    String reason();

    /** The counter key this outcome is counted under ("ok", "exception_response", or a {@link FrameFault} key). */
    String counterKey();

    /** A reply that did what was asked: values read or a write confirmed; counted as "ok", with no reason. */
    sealed interface Success extends ModbusReply {

        @Override
        default boolean isOk() {
            return true;
        }

        @Override
        default String reason() {
            return "";
        }

        @Override
        default String counterKey() {
            return "ok";
        }
    }

    /** Coil/discrete states as 0/1, or register values 0-65535, in address order. */
    record Values(ModbusRequest request, int[] values) implements Success {
        public Values {
            Objects.requireNonNull(request, "request");
            values = values.clone();
        }

        @Override
        public int[] values() {
            return values.clone();
        }
    }

    /** The slave echoed a write as the specification prescribes. */
    record WriteConfirmed(ModbusRequest request) implements Success {
        public WriteConfirmed {
            Objects.requireNonNull(request, "request");
        }
    }

    /** A well-formed exception response (function code with the high bit set, one exception code byte). */
    record ExceptionReply(ModbusRequest request, int code) implements ModbusReply {
        public ExceptionReply {
            Objects.requireNonNull(request, "request");
        }

        /** The specification's name of the code, e.g. "ILLEGAL DATA ADDRESS". */
        public String name() {
            return ExceptionCode.describe(code);
        }

        @Override
        public boolean isOk() {
            return false;
        }

        @Override
        public String reason() {
            return String.format("exception response 0x%02X %s to %s", code, name(), request.describe());
        }

        @Override
        public String counterKey() {
            return "exception_response";
        }
    }

    /** The bytes were not a usable reply to the request. */
    record Fault(FrameFault fault, String detail) implements ModbusReply {
        public Fault {
            Objects.requireNonNull(fault, "fault");
            Objects.requireNonNull(detail, "detail");
        }

        @Override
        public boolean isOk() {
            return false;
        }

        @Override
        public String reason() {
            return detail;
        }

        @Override
        public String counterKey() {
            return fault.counterKey();
        }
    }
}
