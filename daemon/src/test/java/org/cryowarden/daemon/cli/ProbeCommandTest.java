package org.cryowarden.daemon.cli;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.PrintWriter;
import java.io.StringWriter;
import org.cryowarden.drivers.modbus.Hex;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.testing.ModbusTestDevice;
import org.cryowarden.drivers.testing.TcpDeviceServer;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;

class ProbeCommandTest {

    private final StringWriter out = new StringWriter();
    private final StringWriter err = new StringWriter();
    private TcpDeviceServer server;

    @AfterEach
    void stop() throws Exception {
        if (server != null) {
            server.close();
        }
    }

    @Test
    void modbusReadPrintsValuesAsJson() throws Exception {
        // The V1.1b3 §6.3 example registers (555, 0, 100) served by a test slave at unit 17.
        server = TcpDeviceServer.modbus(new ModbusTestDevice(17).holding(107, 555).holding(108, 0).holding(109, 100));

        int exit = run("probe", "modbus", "--tcp", server.address(), "--unit", "17", "--read", "holding:107:3", "--json");

        assertThat(exit).as(err.toString()).isZero();
        JsonNode json = new ObjectMapper().readTree(out.toString());
        assertThat(json.get("values").toString()).isEqualTo("[555.0,0.0,100.0]");
        assertThat(json.get("request").asText()).isEqualTo("read holding registers 107+3 at unit 17");
        assertThat(json.get("round_trip_ms").asDouble()).isPositive();
    }

    @Test
    void modbusFloatWithLittleWordOrderAndVerboseFrames() throws Exception {
        // IEEE 754 binary32 0x41200000 = 10.0, stored low word first.
        server = TcpDeviceServer.modbus(new ModbusTestDevice(2).input(0, 0x0000).input(1, 0x4120));

        int exit = run("probe", "modbus", "--tcp", server.address(), "--unit", "2", "--read", "input:0:2",
                "--type", "float32", "--word-order", "little", "--verbose");

        assertThat(exit).as(err.toString()).isZero();
        String sent = Hex.of(ModbusRequest.read(2, org.cryowarden.drivers.modbus.FunctionCode.READ_INPUT_REGISTERS, 0, 2)
                .encode());
        assertThat(out.toString()).contains("-> " + sent + "\n").contains("read input registers 0+2 at unit 2: 10\n")
                .containsPattern("<- 02 04 04 00 00 41 20 [0-9A-F]{2} [0-9A-F]{2}\n").contains("round trip ");
    }

    @Test
    void modbusWritesACoilAndARegister() throws Exception {
        ModbusTestDevice device = new ModbusTestDevice(5);
        server = TcpDeviceServer.modbus(device);

        assertThat(run("probe", "modbus", "--tcp", server.address(), "--unit", "5", "--write-coil", "12:on")).isZero();
        assertThat(out.toString()).contains("write coil 12 at unit 5: confirmed");
        assertThat(run("probe", "modbus", "--tcp", server.address(), "--unit", "5", "--write-register", "40:1234"))
                .isZero();

        assertThat(device.coilValue(12)).isEqualTo(1);
        assertThat(device.holdingValue(40)).isEqualTo(1234);
    }

    @Test
    void exceptionResponseExitsThreeWithTheReasonOnStderr() throws Exception {
        server = TcpDeviceServer.modbus(new ModbusTestDevice(5));

        int exit = run("probe", "modbus", "--tcp", server.address(), "--unit", "5", "--read", "holding:999:1");

        assertThat(exit).isEqualTo(3);
        assertThat(err.toString()).isEqualTo("probe: exception response 0x02 ILLEGAL DATA ADDRESS to read holding "
                + "registers 999 at unit 5\n");
    }

    @Test
    void silentSlaveExitsThreeWithATimeout() throws Exception {
        server = TcpDeviceServer.modbus(new ModbusTestDevice(5));

        int exit = run("probe", "modbus", "--tcp", server.address(), "--unit", "6", "--read", "holding:0:1",
                "--timeout", "200ms");

        assertThat(exit).isEqualTo(3);
        assertThat(err.toString()).isEqualTo("probe: no reply from unit 6 within 200 ms to read holding registers 0 at unit 6\n");
    }

    @Test
    void corruptedReplyExitsThreeWithBadCrc() throws Exception {
        ModbusTestDevice device = new ModbusTestDevice(5).holding(0, 1);
        device.behave(ModbusTestDevice.Behaviour.BAD_CRC);
        server = TcpDeviceServer.modbus(device);

        int exit = run("probe", "modbus", "--tcp", server.address(), "--unit", "5", "--read", "holding:0:1", "--json");

        assertThat(exit).isEqualTo(3);
        assertThat(err.toString()).startsWith("probe: bad CRC in reply to read holding registers 0 at unit 5");
        assertThat(new ObjectMapper().readTree(out.toString()).get("error").asText()).startsWith("bad CRC");
    }

    @Test
    void badArgumentsExitTwo() {
        assertThat(run("probe", "modbus", "--tcp", "localhost", "--unit", "5", "--read", "holding:0:1")).isEqualTo(2);
        assertThat(err.toString()).contains("--tcp must be HOST:PORT with a port 1-65535, got 'localhost'");
        assertThat(run("probe", "modbus", "--port", "/dev/null", "--unit", "300", "--read", "holding:0:1")).isEqualTo(2);
        assertThat(run("probe", "modbus", "--port", "/dev/null", "--unit", "5", "--read", "holdings:0:1")).isEqualTo(2);
        assertThat(err.toString()).contains("--read table must be holding, input, coil or discrete, got 'holdings'");
        assertThat(run("probe", "modbus", "--port", "/dev/null", "--unit", "5", "--read", "holding:0:3", "--type",
                "float32")).isEqualTo(2);
        assertThat(run("probe", "modbus", "--unit", "5", "--read", "holding:0:1")).isEqualTo(2);
        assertThat(run("probe", "line", "--port", "/dev/null", "--pattern", "([0-9]+)")).isEqualTo(2);
        assertThat(err.toString()).contains("--pattern has no named group 'value'");
    }

    @Test
    void missingSerialPortExitsThreeNamingThePath() {
        int exit = run("probe", "scpi", "--port", "/dev/cryowarden-no-such-port", "--query", "*IDN?");

        assertThat(exit).isEqualTo(3);
        assertThat(err.toString()).isEqualTo("probe: serial port /dev/cryowarden-no-such-port does not exist; check "
                + "the path and that the adapter is plugged in\n");
    }

    @Test
    void scpiQueryPrintsTheResponseAsJson() throws Exception {
        server = TcpDeviceServer.lines(line -> line.equals("*IDN?") ? "Northwind Cryo,TB-7,SN77,1.0\r\n" : null);

        int exit = run("probe", "scpi", "--tcp", server.address(), "--query", "*IDN?", "--terminator", "crlf", "--json");

        assertThat(exit).as(err.toString()).isZero();
        assertThat(new ObjectMapper().readTree(out.toString()).get("response").asText())
                .isEqualTo("Northwind Cryo,TB-7,SN77,1.0");
    }

    @Test
    void scpiTimeoutExitsThree() throws Exception {
        server = TcpDeviceServer.lines(line -> null);

        assertThat(run("probe", "scpi", "--tcp", server.address(), "--query", "MEAS:TEMP?", "--timeout", "150ms"))
                .isEqualTo(3);
        assertThat(err.toString()).isEqualTo("probe: no reply to 'MEAS:TEMP?' within 150 ms\n");
    }

    @Test
    void lineProbeExtractsTheValueOrExitsThreeOnNoMatch() throws Exception {
        server = TcpDeviceServer.lines(line -> line.equals("READ") ? "O2=20.8%\n" : "ERR\n");

        assertThat(run("probe", "line", "--tcp", server.address(), "--query", "READ", "--pattern",
                "O2=(?<value>[0-9.]+)%", "--json")).isZero();
        assertThat(new ObjectMapper().readTree(out.toString()).get("values").toString()).isEqualTo("[20.8]");

        assertThat(run("probe", "line", "--tcp", server.address(), "--query", "STAT", "--pattern",
                "O2=(?<value>[0-9.]+)%")).isEqualTo(3);
        assertThat(err.toString()).isEqualTo("probe: line 'ERR' does not match pattern O2=(?<value>[0-9.]+)%\n");
    }

    private int run(String... args) {
        out.getBuffer().setLength(0);
        err.getBuffer().setLength(0);
        CommandLine line = Main.commandLine();
        line.setOut(new PrintWriter(out, true));
        line.setErr(new PrintWriter(err, true));
        return line.execute(args);
    }
}
