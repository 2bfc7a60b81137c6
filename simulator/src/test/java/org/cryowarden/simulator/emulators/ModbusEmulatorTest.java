package org.cryowarden.simulator.emulators;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.assertj.core.api.Assertions.within;

import java.io.IOException;
import java.io.InputStream;
import java.net.InetSocketAddress;
import java.net.Socket;
import java.net.SocketTimeoutException;
import java.time.Duration;
import java.util.Arrays;
import java.util.HexFormat;
import java.util.Optional;
import java.util.OptionalInt;
import org.cryowarden.drivers.modbus.FrameFault;
import org.cryowarden.drivers.modbus.FunctionCode;
import org.cryowarden.drivers.modbus.ModbusClient;
import org.cryowarden.drivers.modbus.ModbusReply;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.modbus.RegisterCodec;
import org.cryowarden.drivers.modbus.RegisterType;
import org.cryowarden.drivers.modbus.WordOrder;
import org.cryowarden.drivers.transport.TcpSettings;
import org.cryowarden.drivers.transport.TcpTransport;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.physics.Cryogen;
import org.cryowarden.simulator.EmulatorOptions;
import org.cryowarden.simulator.Endpoint;
import org.cryowarden.simulator.Simulator;
import org.cryowarden.simulator.scenario.Scenario;
import org.cryowarden.simulator.scenario.ScenarioReader;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

class ModbusEmulatorTest {

    private static final Duration TIMEOUT = Duration.ofMillis(300);

    private Simulator sim;
    private int port;
    private TcpTransport transport;
    private ModbusClient master;

    @BeforeEach
    void start() throws Exception {
        Scenario scenario = ScenarioReader.read(SCENARIO, "<modbus-test>");
        sim = Simulator.create(scenario, new VirtualTimeSource(scenario.start()), true);
        Endpoint endpoint = sim.startEmulators(EmulatorOptions.loopbackAnyPort()).get(0);
        port = endpoint.tcpPort();
        transport = new TcpTransport(new TcpSettings("127.0.0.1", port, Duration.ofSeconds(2)));
        transport.reopen();
        master = ModbusClient.forTransport(transport, Duration.ofMillis(20));
    }

    @AfterEach
    void stop() {
        transport.close();
        sim.close();
    }

    // ---- the drivers' master codec ----------------------------------------------------------------------

    @Test
    void analogInputCarriesTheOxygenLoopCurrentInMicroamps() throws Exception {
        int[] values = read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 1);
        // 21.0 %vol on a 0-25 %vol loop: 4 + 16 * 21/25 = 17.44 mA (linear 4-20 mA scaling, common practice)
        assertThat(values).containsExactly(17_440);
    }

    @Test
    void analogInputCarriesTheBathPressureAsFloat32Milliamps() throws Exception {
        int[] values = read(3, FunctionCode.READ_INPUT_REGISTERS, 1, 2);
        double milliamps = RegisterCodec.decode(values, 0, RegisterType.FLOAT32, WordOrder.BIG);
        double gauge = (sim.state().vessel("cryostat").orElseThrow().pressurePascal() - 101_325) / 1000;
        assertThat(milliamps).isCloseTo(4 + 16 * gauge / 100, within(1e-5));
    }

    @Test
    void coilWriteStartsTheExhaustFanAndReadsBack() throws Exception {
        ModbusReply reply = master.transact(ModbusRequest.writeSingleCoil(7, 0, true), TIMEOUT, 0).reply();
        assertThat(reply).isInstanceOf(ModbusReply.WriteConfirmed.class);
        sim.step();
        assertThat(sim.state().room("hall").orElseThrow().exhaustFanOn()).isTrue();
        assertThat(read(7, FunctionCode.READ_COILS, 0, 2)).containsExactly(1, 0);
        // the airflow switch follows the fan
        assertThat(read(7, FunctionCode.READ_DISCRETE_INPUTS, 0, 1)).containsExactly(1);
    }

    @Test
    void unmappedAddressGetsIllegalDataAddress() throws Exception {
        ModbusReply reply = master.transact(ModbusRequest.read(3, FunctionCode.READ_INPUT_REGISTERS, 9, 1), TIMEOUT, 0)
                .reply();
        assertThat(reply).isInstanceOfSatisfying(ModbusReply.ExceptionReply.class,
                e -> assertThat(e.name()).isEqualTo("ILLEGAL DATA ADDRESS"));
    }

    @Test
    void tableTheModuleDoesNotHaveGetsIllegalFunction() throws Exception {
        ModbusReply reply = master.transact(ModbusRequest.read(3, FunctionCode.READ_HOLDING_REGISTERS, 0, 1), TIMEOUT,
                0).reply();
        assertThat(reply).isInstanceOfSatisfying(ModbusReply.ExceptionReply.class,
                e -> assertThat(e.name()).isEqualTo("ILLEGAL FUNCTION"));
    }

    @Test
    void oxygenMonitorSetPointOutOfRangeGetsIllegalDataValue() throws Exception {
        ModbusReply reply = master.transact(ModbusRequest.writeSingleRegister(1, 0, 300), TIMEOUT, 0).reply();
        assertThat(reply).isInstanceOfSatisfying(ModbusReply.ExceptionReply.class,
                e -> assertThat(e.name()).isEqualTo("ILLEGAL DATA VALUE"));
        assertThat(master.transact(ModbusRequest.writeSingleRegister(1, 0, 200), TIMEOUT, 0).reply())
                .isInstanceOf(ModbusReply.WriteConfirmed.class);
        assertThat(read(1, FunctionCode.READ_HOLDING_REGISTERS, 0, 2)).containsExactly(200, 180);
    }

    @Test
    void unitNobodyHasStaysSilent() throws Exception {
        ModbusReply reply = master.transact(ModbusRequest.read(9, FunctionCode.READ_INPUT_REGISTERS, 0, 1), TIMEOUT, 0)
                .reply();
        assertThat(reply).isInstanceOfSatisfying(ModbusReply.Fault.class,
                f -> assertThat(f.fault()).isEqualTo(FrameFault.NO_REPLY));
    }

    // ---- frames written out by hand from the specification ---------------------------------------------

    @Test
    void handBuiltReadOfInputRegisterGetsTheHandBuiltReply() throws Exception {
        // Modbus Application Protocol V1.1b3 §6.4 (function 04) with the CRC of Modbus over Serial Line V1.02
        // §6.2.2, worked out by hand: unit 3, address 0, quantity 1
        byte[] reply = exchange("03 04 00 00 00 01 30 28", 7);
        // unit 3, function 04, 2 bytes, 0x4420 = 17440 uA, CRC low byte first
        assertThat(hex(reply)).isEqualTo("03 04 02 44 20 F2 28");
    }

    @Test
    void specificationExampleRequestGetsAnExceptionResponse() throws Exception {
        // The CRC example of Modbus over Serial Line V1.02: 01 03 00 00 00 0A carries C5 CD. Unit 1 (the
        // oxygen monitor) has two holding registers, so ten are refused: exception 02 (Application Protocol §7)
        byte[] reply = exchange("01 03 00 00 00 0A C5 CD", 5);
        assertThat(hex(reply)).isEqualTo("01 83 02 C0 F1");
    }

    @Test
    void handBuiltCoilWriteWithAnIllegalValueGetsExceptionThree() throws Exception {
        // Application Protocol §6.5: a coil value other than FF00 or 0000 is ILLEGAL DATA VALUE
        assertThat(hex(exchange("07 05 00 00 12 34 C0 DB", 5))).isEqualTo("07 85 03 E2 90");
        // the same write with FF00 is echoed
        assertThat(hex(exchange("07 05 00 00 FF 00 8C 5C", 8))).isEqualTo("07 05 00 00 FF 00 8C 5C");
        assertThat(hex(exchange("07 01 00 00 00 02 BD AD", 6))).isEqualTo("07 01 01 01 90 C0");
    }

    @Test
    void frameWithABadCrcIsIgnored() throws Exception {
        // the last CRC byte altered: a slave stays silent (Modbus over Serial Line V1.02 §2.4.1)
        assertThat(exchange("03 04 00 00 00 01 30 29", 1)).isEmpty();
        assertThat(sim.port("rack").orElseThrow().ignoredFrames()).isEqualTo(1);
    }

    // ---- scripted faults --------------------------------------------------------------------------------

    @Test
    void silenceFaultMeansNoReply() throws Exception {
        aim().startFault(fault(FaultKind.SILENCE, 0));
        assertThat(faultOf(3)).isEqualTo(FrameFault.NO_REPLY);
        // the other slave on the line still answers
        assertThat(read(7, FunctionCode.READ_COILS, 0, 1)).containsExactly(0);
    }

    @Test
    void garbageFaultIsNotAUsableReply() throws Exception {
        aim().startFault(fault(FaultKind.GARBAGE, 0));
        ModbusReply reply = master.transact(ModbusRequest.read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 1), TIMEOUT, 0)
                .reply();
        assertThat(reply.isOk()).isFalse();
        assertThat(reply).isInstanceOf(ModbusReply.Fault.class);
    }

    @Test
    void badCrcFaultIsCaughtByTheMaster() throws Exception {
        aim().startFault(fault(FaultKind.BAD_CRC, 0));
        assertThat(faultOf(3)).isEqualTo(FrameFault.BAD_CRC);
        aim().clearFault(Optional.of(FaultKind.BAD_CRC));
        assertThat(read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 1)).containsExactly(17_440);
    }

    @Test
    void slowRepliesMissTheMastersTimeout() throws Exception {
        aim().startFault(new Fault(FaultKind.SLOW, 0, Duration.ofMillis(600), OptionalInt.empty(), 0));
        assertThat(faultOf(3)).isEqualTo(FrameFault.NO_REPLY);
    }

    @Test
    void slowInstrumentsLateReplyDoesNotHoldBackItsNeighbour() throws Exception {
        // On a multidrop line each slave answers by itself (Modbus over Serial Line V1.02, §2.4.1): after the
        // master gives up on the slow unit 3, the relay module (unit 7) it addresses next answers at once, long
        // before unit 3's reply, due 600 ms after its request, goes out.
        aim().startFault(new Fault(FaultKind.SLOW, 0, Duration.ofMillis(600), OptionalInt.empty(), 0));
        long start = System.nanoTime();
        assertThat(faultOf(3)).isEqualTo(FrameFault.NO_REPLY);

        ModbusClient.Exchange neighbour = master.transact(ModbusRequest.read(7, FunctionCode.READ_COILS, 0, 1),
                TIMEOUT, 0);

        assertThat(neighbour.reply()).as(neighbour.reply().reason()).isInstanceOf(ModbusReply.Values.class);
        assertThat(neighbour.last().foreignUnits()).isEmpty();
        // Answered before unit 3's late reply was even due: a line held by the slow reply would answer after it.
        assertThat(Duration.ofNanos(System.nanoTime() - start)).isLessThan(Duration.ofMillis(600));
    }

    @Test
    void stuckValueIgnoresThePlant() throws Exception {
        aim().startFault(fault(FaultKind.STUCK, 0));
        int[] before = read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 1);
        sim.plant().room("hall").orElseThrow().release(Cryogen.HELIUM, 5);
        sim.step();
        assertThat(sim.sensors().value("o2")).isLessThan(20.5);
        assertThat(read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 1)).containsExactly(before);
    }

    @Test
    void driftMovesTheValueAtItsRate() throws Exception {
        aim().startFault(new Fault(FaultKind.DRIFT, -1.0, Duration.ZERO, OptionalInt.of(0), 0));
        sim.advance(Duration.ofHours(1));
        transport.reopen(); // the scripted disconnect at 00:01 dropped the connection
        // 21.0 - 1.0 %vol after one hour: 4 + 16 * 20/25 = 16.8 mA
        assertThat(read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 1)).containsExactly(16_800);
    }

    @Test
    void noiseFaultScattersTheValue() throws Exception {
        aim().startFault(fault(FaultKind.NOISE, 0.5));
        int[] samples = new int[20];
        for (int i = 0; i < samples.length; i++) {
            samples[i] = read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 1)[0];
        }
        assertThat(Arrays.stream(samples).distinct().count()).isGreaterThan(10);
    }

    @Test
    void wireBreakReadsZeroMilliamps() throws Exception {
        aim().startFault(new Fault(FaultKind.WIRE_BREAK, 0, Duration.ZERO, OptionalInt.of(0), 0));
        assertThat(read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 1)).containsExactly(0);
    }

    @Test
    void scriptedDisconnectDropsTheLineAndItComesBack() throws Exception {
        sim.advance(Duration.ofSeconds(61));
        assertThat(sim.eventLog()).containsExactly("00:01:00 fault disconnect aim-1");
        // The emulator's own listener is down and the open connection was dropped. (Probing the port number with a
        // fresh connect is not a test of the emulator: on a busy machine another program may take the port.)
        assertThat(sim.port("rack").orElseThrow().isDisconnected()).isTrue();
        assertThatThrownBy(() -> read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 1)).isInstanceOf(IOException.class);
        sim.advance(Duration.ofSeconds(60));
        transport.reopen();
        assertThat(read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 1)).containsExactly(17_440);
    }

    // ---- helpers ----------------------------------------------------------------------------------------

    private static final String SCENARIO = """
            scenario: {name: modbus test, seed: 5}
            rooms:
              - {id: hall, volume: 100 m3, ventilation: 1 m3/min, exhaust_fan: 20 m3/min}
            vessels:
              - {id: cryostat, room: hall, fluid: helium, diameter: 0.5 m, straight_height: 0.8 m, liquid: 100 L,
                 heat_load: 0.2 W}
            sensors:
              - {id: o2, kind: oxygen, room: hall, response_time: 0s, noise: 0 %vol}
              - {id: bath-p, kind: pressure, vessel: cryostat, noise: 0 kPa}
            ports:
              - id: rack
                pace: false
                instruments:
                  - id: aim-1
                    kind: analog-input-module
                    unit: 3
                    inputs:
                      - {address: 0, sensor: o2, type: uint16, scale: 0.001, range: [0, 25]}
                      - {address: 1, sensor: bath-p, type: float32, scale: 1, range: [0, 100]}
                  - id: relay-1
                    kind: relay-module
                    unit: 7
                    coils:
                      - {address: 0, action: exhaust-fan, target: hall}
                      - {address: 1, action: none}
                    discrete_inputs:
                      - {address: 0, source: exhaust-fan, target: hall}
                  - {id: o2-monitor, kind: oxygen-monitor, unit: 1, sensor: o2}
            timeline:
              - {at: "00:01", do: fault, target: aim-1, kind: disconnect, for: 1min}
            """;

    private Instrument aim() {
        return sim.instrument("aim-1").orElseThrow();
    }

    private static Fault fault(FaultKind kind, double amount) {
        return new Fault(kind, amount, Duration.ZERO, OptionalInt.empty(), 0);
    }

    private int[] read(int unit, FunctionCode function, int address, int count) throws IOException {
        ModbusReply reply = master.transact(ModbusRequest.read(unit, function, address, count), TIMEOUT, 0).reply();
        assertThat(reply).as(reply.reason()).isInstanceOf(ModbusReply.Values.class);
        return ((ModbusReply.Values) reply).values();
    }

    private FrameFault faultOf(int unit) throws IOException {
        ModbusReply reply = master.transact(ModbusRequest.read(unit, FunctionCode.READ_INPUT_REGISTERS, 0, 1), TIMEOUT,
                0).reply();
        assertThat(reply).isInstanceOf(ModbusReply.Fault.class);
        return ((ModbusReply.Fault) reply).fault();
    }

    /** Sends hand-written bytes on a raw socket and collects up to {@code expected} reply bytes (1 s bound). */
    private byte[] exchange(String requestHex, int expected) throws IOException {
        try (Socket socket = new Socket()) {
            socket.connect(new InetSocketAddress("127.0.0.1", port), 2000);
            socket.getOutputStream().write(HexFormat.ofDelimiter(" ").parseHex(requestHex));
            socket.setSoTimeout(1000);
            InputStream in = socket.getInputStream();
            byte[] buffer = new byte[256];
            int length = 0;
            try {
                while (length < expected) {
                    int count = in.read(buffer, length, buffer.length - length);
                    if (count < 0) {
                        break;
                    }
                    length += count;
                }
            } catch (SocketTimeoutException e) {
                // fewer bytes than expected: the assertion shows what came
            }
            return Arrays.copyOf(buffer, length);
        }
    }

    private static String hex(byte[] bytes) {
        return HexFormat.ofDelimiter(" ").withUpperCase().formatHex(bytes);
    }
}
