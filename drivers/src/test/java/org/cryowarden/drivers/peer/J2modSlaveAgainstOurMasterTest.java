package org.cryowarden.drivers.peer;

import static org.assertj.core.api.Assertions.assertThat;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import com.ghgande.j2mod.modbus.Modbus;
import com.ghgande.j2mod.modbus.procimg.SimpleDigitalIn;
import com.ghgande.j2mod.modbus.procimg.SimpleDigitalOut;
import com.ghgande.j2mod.modbus.procimg.SimpleInputRegister;
import com.ghgande.j2mod.modbus.procimg.SimpleProcessImage;
import com.ghgande.j2mod.modbus.procimg.SimpleRegister;
import com.ghgande.j2mod.modbus.slave.ModbusSlave;
import com.ghgande.j2mod.modbus.slave.ModbusSlaveFactory;
import com.ghgande.j2mod.modbus.util.SerialParameters;
import java.nio.file.Path;
import java.time.Duration;
import org.cryowarden.drivers.modbus.FunctionCode;
import org.cryowarden.drivers.modbus.ModbusClient;
import org.cryowarden.drivers.modbus.ModbusReply;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.modbus.RegisterCodec;
import org.cryowarden.drivers.modbus.RegisterType;
import org.cryowarden.drivers.modbus.WordOrder;
import org.cryowarden.drivers.testing.SocatPair;
import org.cryowarden.drivers.transport.SerialSettings;
import org.cryowarden.drivers.transport.SerialTransport;
import org.cryowarden.drivers.transport.TcpSettings;
import org.cryowarden.drivers.transport.TcpTransport;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Our master against a Modbus implementation we did not write: j2mod 3.2.1 as an RTU slave on a socat
 * pseudo-terminal, every function we speak, values and an exception response as j2mod produces them.
 */
class J2modSlaveAgainstOurMasterTest {

    private static final int UNIT = 5;
    private static final Duration TIMEOUT = Duration.ofSeconds(2);

    @TempDir
    Path folder;

    private SocatPair line;
    private ModbusSlave slave;
    private SerialTransport transport;
    private SimpleProcessImage image;

    @BeforeAll
    static void needsSocat() {
        assumeTrue(SocatPair.available(), "socat is not installed (the CI script installs it)");
    }

    @AfterEach
    void stop() throws Exception {
        if (transport != null) {
            transport.close();
        }
        // Pull the line away first: j2mod's serial listener then stops at once instead of after its read
        // timeouts (closing it on a live line took about 3.7 s here).
        if (line != null) {
            line.close();
        }
        if (slave != null) {
            closeWithin(Duration.ofSeconds(10), () -> ModbusSlaveFactory.close(slave));
        }
    }

    @Test
    void everyFunctionWeSpeakWorksAgainstJ2mod() throws Exception {
        start();
        ModbusClient client = ModbusClient.forTransport(transport, Duration.ofMillis(20));

        assertThat(values(client, ModbusRequest.read(UNIT, FunctionCode.READ_HOLDING_REGISTERS, 0, 3)))
                .containsExactly(555, 0, 100);
        assertThat(values(client, ModbusRequest.read(UNIT, FunctionCode.READ_INPUT_REGISTERS, 0, 2)))
                .containsExactly(0x4120, 0x0000);
        assertThat(RegisterCodec.decode(values(client, ModbusRequest.read(UNIT, FunctionCode.READ_INPUT_REGISTERS, 0, 2)),
                0, RegisterType.FLOAT32, WordOrder.BIG)).isEqualTo(10.0);
        assertThat(values(client, ModbusRequest.read(UNIT, FunctionCode.READ_COILS, 0, 3))).containsExactly(1, 0, 1);
        assertThat(values(client, ModbusRequest.read(UNIT, FunctionCode.READ_DISCRETE_INPUTS, 0, 2))).containsExactly(0, 1);

        assertThat(reply(client, ModbusRequest.writeSingleCoil(UNIT, 1, true))).isInstanceOf(ModbusReply.WriteConfirmed.class);
        assertThat(image.getDigitalOut(1).isSet()).isTrue();
        assertThat(reply(client, ModbusRequest.writeSingleRegister(UNIT, 2, 1234))).isInstanceOf(ModbusReply.WriteConfirmed.class);
        assertThat(image.getRegister(2).getValue()).isEqualTo(1234);
        assertThat(reply(client, ModbusRequest.writeMultipleRegisters(UNIT, 0, new int[] {7, 8})))
                .isInstanceOf(ModbusReply.WriteConfirmed.class);
        assertThat(image.getRegister(1).getValue()).isEqualTo(8);
        assertThat(reply(client, ModbusRequest.writeMultipleCoils(UNIT, 0, new boolean[] {false, false, false})))
                .isInstanceOf(ModbusReply.WriteConfirmed.class);
        assertThat(image.getDigitalOut(2).isSet()).isFalse();
    }

    @Test
    void j2modExceptionResponseIsDecodedToItsName() throws Exception {
        start();
        ModbusClient client = ModbusClient.forTransport(transport, Duration.ofMillis(20));

        ModbusReply reply = reply(client, ModbusRequest.read(UNIT, FunctionCode.READ_HOLDING_REGISTERS, 40, 1));

        // Modbus Application Protocol V1.1b3 §7: an address outside the slave's table is exception 02.
        assertThat(reply.reason()).isEqualTo("exception response 0x02 ILLEGAL DATA ADDRESS to read holding registers "
                + "40 at unit 5");
    }

    @Test
    void requestsToAnotherUnitGetNoReply() throws Exception {
        start();
        ModbusClient client = ModbusClient.forTransport(transport, Duration.ofMillis(20));

        ModbusReply reply = client.transact(ModbusRequest.read(UNIT + 1, FunctionCode.READ_HOLDING_REGISTERS, 0, 1),
                Duration.ofMillis(300), 0).reply();

        assertThat(reply.counterKey()).isEqualTo("timeout");
    }

    @Test
    void ourMasterTalksToJ2modOverTcpWithRtuFraming() throws Exception {
        image = processImage();
        int port;
        try (java.net.ServerSocket probe = new java.net.ServerSocket(0, 1, java.net.InetAddress.getLoopbackAddress())) {
            port = probe.getLocalPort();
        }
        // j2mod's TCP slave with RTU framing ("RTU over TCP"), as a serial device server would pass it through.
        slave = ModbusSlaveFactory.createTCPSlave(java.net.InetAddress.getLoopbackAddress(), port, 2, true);
        slave.addProcessImage(UNIT, image);
        slave.open();
        TcpTransport tcp = new TcpTransport(new TcpSettings("127.0.0.1", port, Duration.ofSeconds(2)));
        try {
            tcp.reopen();
            ModbusClient client = ModbusClient.forTransport(tcp, Duration.ofMillis(50));

            assertThat(values(client, ModbusRequest.read(UNIT, FunctionCode.READ_HOLDING_REGISTERS, 0, 3)))
                    .containsExactly(555, 0, 100);
        } finally {
            tcp.close();
        }
    }

    private void start() throws Exception {
        line = SocatPair.start(folder);
        image = processImage();
        SerialParameters parameters = new SerialParameters();
        parameters.setPortName(line.far().toString());
        parameters.setBaudRate(9600);
        parameters.setDatabits(8);
        parameters.setParity("None");
        parameters.setStopbits(1);
        parameters.setEncoding(Modbus.SERIAL_ENCODING_RTU);
        parameters.setEcho(false);
        parameters.setOpenDelay(0);
        slave = ModbusSlaveFactory.createSerialSlave(parameters);
        slave.addProcessImage(UNIT, image);
        slave.open();
        transport = new SerialTransport(SerialSettings.defaults(line.near().toString()));
        transport.reopen();
    }

    private static SimpleProcessImage processImage() {
        // Registers of the V1.1b3 §6.3 example (555, 0, 100); a float32 10.0 (IEEE 754 0x41200000) in inputs.
        SimpleProcessImage image = new SimpleProcessImage(UNIT);
        image.addRegister(new SimpleRegister(555));
        image.addRegister(new SimpleRegister(0));
        image.addRegister(new SimpleRegister(100));
        image.addInputRegister(new SimpleInputRegister(0x4120));
        image.addInputRegister(new SimpleInputRegister(0x0000));
        image.addDigitalOut(new SimpleDigitalOut(true));
        image.addDigitalOut(new SimpleDigitalOut(false));
        image.addDigitalOut(new SimpleDigitalOut(true));
        image.addDigitalIn(new SimpleDigitalIn(false));
        image.addDigitalIn(new SimpleDigitalIn(true));
        return image;
    }

    private static int[] values(ModbusClient client, ModbusRequest request) throws Exception {
        ModbusReply reply = reply(client, request);
        assertThat(reply).as(reply.reason()).isInstanceOf(ModbusReply.Values.class);
        return ((ModbusReply.Values) reply).values();
    }

    private static ModbusReply reply(ModbusClient client, ModbusRequest request) throws Exception {
        return client.transact(request, TIMEOUT, 0).reply();
    }

    /**
     * j2mod's close can deadlock in jSerialComm when the line has just gone away: its listener thread, handling the
     * port-disconnected event, calls {@code closePort} while our close waits for that listener to stop
     * (jSerialComm #471, seen here as a hung test run). Close on a thread of its own and give up after a bound, so a
     * stuck peer cannot hang the build; the daemon thread dies with the test JVM.
     */
    private static void closeWithin(Duration bound, Runnable close) throws InterruptedException {
        Thread closer = new Thread(close, "j2mod-close");
        closer.setDaemon(true);
        closer.start();
        closer.join(bound.toMillis());
        if (closer.isAlive()) {
            System.err.println("j2mod slave did not close within " + bound + " (jSerialComm listener deadlock); left behind");
        }
    }
}
