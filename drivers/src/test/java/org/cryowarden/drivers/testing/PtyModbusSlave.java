package org.cryowarden.drivers.testing;

import java.io.IOException;
import java.time.Duration;
import java.util.concurrent.TimeUnit;
import org.cryowarden.drivers.modbus.ModbusSlaveCodec;
import org.cryowarden.drivers.modbus.RtuFrame;
import org.cryowarden.drivers.modbus.RtuFrameReader;
import org.cryowarden.drivers.transport.SerialSettings;
import org.cryowarden.drivers.transport.SerialTransport;

/**
 * Serves a {@link ModbusTestDevice} on one end of a pseudo-terminal pair with our own serial transport, RTU
 * framing and slave codec, on a thread of its own. When the line vanishes it keeps trying to reopen it (every
 * 20 ms, until stopped), as a device that is powered again would.
 */
public final class PtyModbusSlave implements AutoCloseable {

    private final SerialTransport transport;
    private final ModbusTestDevice device;
    private final Thread thread;
    private volatile boolean running = true;

    public PtyModbusSlave(String path, ModbusTestDevice device) {
        this.transport = new SerialTransport(SerialSettings.defaults(path));
        this.device = device;
        this.thread = new Thread(this::serve, "pty-modbus-slave " + path);
        this.thread.setDaemon(true);
    }

    public PtyModbusSlave start() {
        thread.start();
        return this;
    }

    private void serve() {
        RtuFrameReader reader = new RtuFrameReader(Duration.ofMillis(5));
        while (running) {
            try {
                if (!transport.isOpen()) {
                    transport.reopen();
                }
                RtuFrame frame = reader.read(transport, ModbusSlaveCodec::requestLength, Duration.ofMillis(100));
                if (frame.length() > 0) {
                    byte[] answer = device.respond(frame.bytes());
                    if (answer.length > 0) {
                        transport.write(answer);
                    }
                }
            } catch (IOException e) {
                transport.close();
                try {
                    TimeUnit.MILLISECONDS.sleep(20); // retry interval while the line is gone; not test timing
                } catch (InterruptedException interrupted) {
                    return;
                }
            }
        }
    }

    @Override
    public void close() throws InterruptedException {
        running = false;
        thread.join(5_000);
        transport.close();
    }
}
