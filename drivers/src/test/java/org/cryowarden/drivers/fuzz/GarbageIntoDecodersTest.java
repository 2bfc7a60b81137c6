package org.cryowarden.drivers.fuzz;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import org.cryowarden.drivers.line.LinePattern;
import org.cryowarden.drivers.modbus.FunctionCode;
import org.cryowarden.drivers.modbus.ModbusClient;
import org.cryowarden.drivers.modbus.ModbusCrc;
import org.cryowarden.drivers.modbus.ModbusMasterCodec;
import org.cryowarden.drivers.modbus.ModbusReply;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.modbus.ModbusSlaveCodec;
import org.cryowarden.drivers.modbus.SlaveRequest;
import org.cryowarden.drivers.scpi.ErrorEntry;
import org.cryowarden.drivers.scpi.Identity;
import org.cryowarden.drivers.scpi.ScpiCodec;
import org.cryowarden.drivers.scpi.ScpiNumbers;
import org.cryowarden.drivers.scpi.ScpiValue;
import org.cryowarden.drivers.testing.ScriptedTransport;
import org.cryowarden.drivers.text.LineAssembler;
import org.cryowarden.drivers.text.LineEvent;
import org.junit.jupiter.api.Test;

/**
 * Seeded random bytes, and valid frames with random damage, into every decoder: nothing may throw, and every
 * input must land in exactly one class. The class counts are asserted so the damage actually reaches each path.
 */
class GarbageIntoDecodersTest {

    private static final int FRAMES = 20_000;

    private final Random random = new Random(20261201L);

    @Test
    void masterClassifiesEveryRandomOrDamagedReply() throws Exception {
        List<ModbusRequest> requests = List.of(
                ModbusRequest.read(7, FunctionCode.READ_HOLDING_REGISTERS, 100, 2),
                ModbusRequest.read(7, FunctionCode.READ_COILS, 0, 11),
                ModbusRequest.read(7, FunctionCode.READ_INPUT_REGISTERS, 0, 1),
                ModbusRequest.writeSingleCoil(7, 3, true),
                ModbusRequest.writeMultipleRegisters(7, 10, new int[] {1, 2, 3}));
        Map<String, Integer> classes = new HashMap<>();
        for (int i = 0; i < FRAMES; i++) {
            ModbusRequest request = requests.get(random.nextInt(requests.size()));
            byte[] frame = i % 2 == 0 ? randomBytes(random.nextInt(40)) : damaged(validReply(request));
            ModbusReply reply = ModbusMasterCodec.decodeResponse(request, frame, frame.length);
            ModbusMasterCodec.replyLength(request, frame, frame.length);
            assertThat(reply).isNotNull();
            assertThat(reply.isOk() || !reply.reason().isEmpty()).isTrue();
            classes.merge(reply.counterKey(), 1, Integer::sum);
        }
        assertThat(classes).containsKeys("ok", "bad_crc", "short_frame", "timeout", "exception_response");
        assertThat(classes.values().stream().mapToInt(Integer::intValue).sum()).isEqualTo(FRAMES);
    }

    @Test
    void masterOverAGarbageSpewingTransportClassifiesEveryTransaction() throws Exception {
        ScriptedTransport transport = ScriptedTransport.serial(written -> randomBytes(random.nextInt(300)));
        transport.reopen();
        ModbusClient client = new ModbusClient(transport, Duration.ofNanos(1), Duration.ofNanos(1));
        ModbusRequest request = ModbusRequest.read(7, FunctionCode.READ_HOLDING_REGISTERS, 0, 4);
        Map<String, Integer> classes = new HashMap<>();
        for (int i = 0; i < 2_000; i++) {
            classes.merge(client.transact(request, Duration.ofMillis(1), 0).reply().counterKey(), 1, Integer::sum);
        }
        assertThat(classes).containsKeys("oversized_frame", "bad_crc");
        assertThat(classes.values().stream().mapToInt(Integer::intValue).sum()).isEqualTo(2_000);
    }

    @Test
    void slaveClassifiesEveryRandomOrDamagedRequest() {
        Map<Class<?>, Integer> classes = new HashMap<>();
        for (int i = 0; i < FRAMES; i++) {
            byte[] frame = i % 2 == 0 ? randomBytes(random.nextInt(40)) : damaged(randomValidRequest().encode());
            SlaveRequest parsed = ModbusSlaveCodec.parseRequest(frame, frame.length);
            ModbusSlaveCodec.requestLength(frame, frame.length);
            assertThat(parsed).isNotNull();
            classes.merge(parsed.getClass(), 1, Integer::sum);
        }
        assertThat(classes).containsKeys(SlaveRequest.Accepted.class, SlaveRequest.Ignored.class);
        // Frames with a valid CRC but an unknown function or a bad quantity are refused with an exception.
        byte[] unknown = ModbusCrc.append(new byte[] {7, 0x2B, 0, 0, 0, 1});
        assertThat(ModbusSlaveCodec.parseRequest(unknown, unknown.length)).isInstanceOf(SlaveRequest.Refused.class);
    }

    @Test
    void scpiParsersClassifyEveryRandomLine() {
        Map<Class<?>, Integer> classes = new HashMap<>();
        for (int i = 0; i < FRAMES; i++) {
            String line = i % 3 == 0 ? randomText(30) : mutate(List.of("+1.2345E+02", "9.91E37", "-9.9E37", "42",
                    "0,\"No error\"", "A,B,C,D").get(random.nextInt(6)));
            ScpiValue value = ScpiNumbers.parse(line);
            classes.merge(value.getClass(), 1, Integer::sum);
            ErrorEntry.parse(line);
            Identity.parse(line);
            ScpiCodec.parseProgramMessage(line);
        }
        assertThat(classes).containsKeys(ScpiValue.Number.class, ScpiValue.Malformed.class, ScpiValue.NotANumber.class,
                ScpiValue.Overflow.class);
    }

    @Test
    void lineAssemblerAndPatternClassifyEveryRandomStream() {
        LineAssembler assembler = new LineAssembler(64);
        LinePattern pattern = LinePattern.compile("T=(?<value>\\S+)K").pattern().orElseThrow();
        Map<Class<?>, Integer> events = new HashMap<>();
        Map<Class<?>, Integer> matches = new HashMap<>();
        for (int i = 0; i < FRAMES; i++) {
            byte[] chunk = i % 2 == 0 ? randomBytes(random.nextInt(90))
                    : mutate("T=77.3K\n").getBytes(StandardCharsets.ISO_8859_1);
            for (LineEvent event : assembler.feed(chunk, 0, chunk.length)) {
                events.merge(event.getClass(), 1, Integer::sum);
                if (event instanceof LineEvent.Line line) {
                    matches.merge(pattern.match(line.text()).getClass(), 1, Integer::sum);
                }
            }
        }
        assertThat(events).containsKeys(LineEvent.Line.class, LineEvent.Oversized.class);
        assertThat(matches).containsKeys(LinePattern.LineMatch.Value.class, LinePattern.LineMatch.NoMatch.class,
                LinePattern.LineMatch.NotANumber.class);
    }

    private byte[] validReply(ModbusRequest request) {
        if (random.nextInt(10) == 0) {
            return ModbusSlaveCodec.encodeException(request.unit(), request.function().code(),
                    org.cryowarden.drivers.modbus.ExceptionCode.values()[random.nextInt(9)]);
        }
        if (request.function().isRead()) {
            int[] values = new int[request.quantity()];
            for (int i = 0; i < values.length; i++) {
                values[i] = request.function().readsBits() ? random.nextInt(2) : random.nextInt(65536);
            }
            return ModbusSlaveCodec.encodeReadResponse(request, values);
        }
        return ModbusSlaveCodec.encodeWriteResponse(request);
    }

    private ModbusRequest randomValidRequest() {
        int unit = 1 + random.nextInt(247);
        int address = random.nextInt(1000);
        return switch (random.nextInt(6)) {
            case 0 -> ModbusRequest.read(unit, FunctionCode.READ_HOLDING_REGISTERS, address, 1 + random.nextInt(125));
            case 1 -> ModbusRequest.read(unit, FunctionCode.READ_DISCRETE_INPUTS, address, 1 + random.nextInt(2000));
            case 2 -> ModbusRequest.writeSingleCoil(unit, address, random.nextBoolean());
            case 3 -> ModbusRequest.writeSingleRegister(unit, address, random.nextInt(65536));
            case 4 -> ModbusRequest.writeMultipleCoils(unit, address, new boolean[1 + random.nextInt(20)]);
            default -> ModbusRequest.writeMultipleRegisters(unit, address, new int[1 + random.nextInt(10)]);
        };
    }

    /** Leaves the frame intact, truncates it, flips a bit, or appends bytes. */
    private byte[] damaged(byte[] frame) {
        switch (random.nextInt(4)) {
            case 0 -> {
                return frame;
            }
            case 1 -> {
                return java.util.Arrays.copyOf(frame, random.nextInt(frame.length));
            }
            case 2 -> {
                byte[] copy = frame.clone();
                copy[random.nextInt(copy.length)] ^= (byte) (1 << random.nextInt(8));
                return copy;
            }
            default -> {
                byte[] longer = java.util.Arrays.copyOf(frame, frame.length + 1 + random.nextInt(5));
                return longer;
            }
        }
    }

    private String mutate(String text) {
        StringBuilder out = new StringBuilder(text);
        int edits = random.nextInt(3);
        for (int i = 0; i < edits && out.length() > 0; i++) {
            int at = random.nextInt(out.length());
            switch (random.nextInt(3)) {
                case 0 -> out.deleteCharAt(at);
                case 1 -> out.insert(at, (char) random.nextInt(256));
                default -> out.setCharAt(at, (char) random.nextInt(128));
            }
        }
        return out.toString();
    }

    private byte[] randomBytes(int length) {
        byte[] bytes = new byte[length];
        random.nextBytes(bytes);
        return bytes;
    }

    private String randomText(int maxLength) {
        return new String(randomBytes(random.nextInt(maxLength)), StandardCharsets.ISO_8859_1);
    }
}
