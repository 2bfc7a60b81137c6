package org.cryowarden.drivers.bench;

import java.util.concurrent.TimeUnit;
import org.cryowarden.drivers.modbus.FunctionCode;
import org.cryowarden.drivers.modbus.ModbusCrc;
import org.cryowarden.drivers.modbus.ModbusMasterCodec;
import org.cryowarden.drivers.modbus.ModbusReply;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.modbus.ModbusSlaveCodec;
import org.cryowarden.drivers.modbus.RegisterCodec;
import org.cryowarden.drivers.modbus.RegisterType;
import org.cryowarden.drivers.modbus.WordOrder;
import org.cryowarden.drivers.scpi.ScpiCodec;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;

/**
 * Nanoseconds per operation of the codecs a poll goes through: Modbus CRC-16 over a request and over a frame of
 * the 256-byte maximum (Modbus over Serial Line V1.02), building a request frame, decoding a reply of 8
 * registers, a float32 register pair, and parsing one SCPI program message. Run by hand with the command in the
 * developer guide; the name ends in Benchmark, so {@code mvn test} never runs it.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.NANOSECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(1)
public class CodecBenchmark {

    private ModbusRequest request;
    private byte[] requestFrame;
    private byte[] replyFrame;
    private byte[] largestFrame;
    private final int[] floatRegisters = RegisterCodec.encode(20.93, RegisterType.FLOAT32, WordOrder.BIG);

    @Setup
    public void setUp() {
        request = ModbusRequest.read(3, FunctionCode.READ_INPUT_REGISTERS, 0, 8);
        requestFrame = request.encode();
        replyFrame = ModbusSlaveCodec.encodeReadResponse(request, new int[] {11, 22, 33, 44, 55, 66, 77, 88});
        largestFrame = new byte[256];
        for (int i = 0; i < largestFrame.length; i++) {
            largestFrame[i] = (byte) (i * 37);
        }
    }

    @Benchmark
    public int crcOfRequest() {
        return ModbusCrc.compute(requestFrame, 0, requestFrame.length - 2);
    }

    @Benchmark
    public int crcOfLargestFrame() {
        return ModbusCrc.compute(largestFrame, 0, largestFrame.length - 2);
    }

    @Benchmark
    public byte[] encodeReadRequest() {
        return request.encode();
    }

    @Benchmark
    public ModbusReply decodeReadReply() {
        return ModbusMasterCodec.decodeResponse(request, replyFrame, replyFrame.length);
    }

    @Benchmark
    public double decodeFloat32() {
        return RegisterCodec.decode(floatRegisters, 0, RegisterType.FLOAT32, WordOrder.BIG);
    }

    @Benchmark
    public Object parseScpiQuery() {
        return ScpiCodec.parseProgramMessage("MEAS:TEMP? A;:SYST:ERR?");
    }
}
