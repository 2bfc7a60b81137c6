package org.cryowarden.drivers.peer;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;
import static org.junit.jupiter.api.Assumptions.assumeTrue;

import com.ghgande.j2mod.modbus.Modbus;
import com.ghgande.j2mod.modbus.ModbusSlaveException;
import com.ghgande.j2mod.modbus.facade.ModbusSerialMaster;
import com.ghgande.j2mod.modbus.procimg.InputRegister;
import com.ghgande.j2mod.modbus.procimg.Register;
import com.ghgande.j2mod.modbus.procimg.SimpleRegister;
import com.ghgande.j2mod.modbus.util.BitVector;
import com.ghgande.j2mod.modbus.util.SerialParameters;
import java.nio.file.Path;
import org.cryowarden.drivers.testing.ModbusTestDevice;
import org.cryowarden.drivers.testing.PtyModbusSlave;
import org.cryowarden.drivers.testing.SocatPair;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The slave side of our codec (request framing, parsing, response and exception encoding; what the simulator
 * serves) against j2mod 3.2.1 as master over a socat pseudo-terminal.
 */
class J2modMasterAgainstOurSlaveTest {

    private static final int UNIT = 12;

    @TempDir
    Path folder;

    @BeforeAll
    static void needsSocat() {
        assumeTrue(SocatPair.available(), "socat is not installed (the CI script installs it)");
    }

    @Test
    void j2modReadsAndWritesOurSlave() throws Exception {
        ModbusTestDevice device = new ModbusTestDevice(UNIT).holding(0, 555).holding(1, 0).holding(2, 100)
                .input(8, 10);
        try (SocatPair line = SocatPair.start(folder);
                PtyModbusSlave slave = new PtyModbusSlave(line.far().toString(), device).start()) {
            ModbusSerialMaster master = new ModbusSerialMaster(parameters(line.near().toString()), 1000);
            master.connect();
            try {
                // V1.1b3 §6.3 and §6.4 example values.
                Register[] registers = master.readMultipleRegisters(UNIT, 0, 3);
                assertThat(registers).extracting(Register::getValue).containsExactly(555, 0, 100);
                InputRegister[] inputs = master.readInputRegisters(UNIT, 8, 1);
                assertThat(inputs[0].getValue()).isEqualTo(10);

                master.writeSingleRegister(UNIT, 5, new SimpleRegister(4711));
                assertThat(device.holdingValue(5)).isEqualTo(4711);
                master.writeMultipleRegisters(UNIT, 6, new Register[] {new SimpleRegister(1), new SimpleRegister(2)});
                assertThat(device.holdingValue(7)).isEqualTo(2);

                assertThat(master.writeCoil(UNIT, 3, true)).isTrue();
                BitVector coils = master.readCoils(UNIT, 0, 5);
                assertThat(coils.getBit(3)).isTrue();
                assertThat(coils.getBit(2)).isFalse();
                BitVector many = new BitVector(10);
                many.setBit(9, true);
                master.writeMultipleCoils(UNIT, 20, many);
                assertThat(device.coilValue(29)).isEqualTo(1);
            } finally {
                master.disconnect();
            }
        }
    }

    @Test
    void j2modReceivesOurExceptionResponse() throws Exception {
        ModbusTestDevice device = new ModbusTestDevice(UNIT);
        try (SocatPair line = SocatPair.start(folder);
                PtyModbusSlave slave = new PtyModbusSlave(line.far().toString(), device).start()) {
            ModbusSerialMaster master = new ModbusSerialMaster(parameters(line.near().toString()), 1000);
            master.connect();
            try {
                // V1.1b3 §7: exception code 02, ILLEGAL DATA ADDRESS, for an unmapped register.
                assertThatThrownBy(() -> master.readMultipleRegisters(UNIT, 900, 1))
                        .isInstanceOfSatisfying(ModbusSlaveException.class, e -> assertThat(e.getType()).isEqualTo(2));
            } finally {
                master.disconnect();
            }
        }
    }

    private static SerialParameters parameters(String port) {
        SerialParameters parameters = new SerialParameters();
        parameters.setPortName(port);
        parameters.setBaudRate(9600);
        parameters.setDatabits(8);
        parameters.setParity("None");
        parameters.setStopbits(1);
        parameters.setEncoding(Modbus.SERIAL_ENCODING_RTU);
        parameters.setEcho(false);
        parameters.setOpenDelay(0);
        return parameters;
    }
}
