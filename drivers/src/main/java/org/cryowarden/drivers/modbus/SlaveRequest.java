package org.cryowarden.drivers.modbus;

import java.util.Objects;

/**
 * What a slave made of a received frame: a request to serve, a frame to ignore silently (the serial line
 * specification has slaves stay silent on a CRC error), or a request to refuse with an exception response.
 */
public sealed interface SlaveRequest {

    /** A well-formed request; the slave answers it unless it is a broadcast (unit 0). */
    record Accepted(ModbusRequest request) implements SlaveRequest {
        public Accepted {
            Objects.requireNonNull(request, "request");
        }
    }

    /** Not a usable frame (too short, bad CRC, read broadcast): no reply is sent. */
    record Ignored(FrameFault fault, String detail) implements SlaveRequest {
        public Ignored {
            Objects.requireNonNull(fault, "fault");
            Objects.requireNonNull(detail, "detail");
        }
    }

    /**
     * A frame for {@code unit} that the slave must refuse with {@code exception}; encode the reply with
     * {@link ModbusSlaveCodec#encodeException(int, int, ExceptionCode)}.
     */
    record Refused(int unit, int functionCode, ExceptionCode exception, String detail) implements SlaveRequest {
        public Refused {
            Objects.requireNonNull(exception, "exception");
            Objects.requireNonNull(detail, "detail");
        }
    }
}
