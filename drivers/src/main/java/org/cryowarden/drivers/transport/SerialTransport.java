package org.cryowarden.drivers.transport;

import com.fazecast.jSerialComm.SerialPort;
import com.fazecast.jSerialComm.SerialPortInvalidPortException;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Objects;
import java.util.OptionalInt;
import org.cryowarden.drivers.spi.Transport;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * A serial port through jSerialComm, opened exclusively by path (pseudo-terminals included, which the library
 * does not list). A reader thread blocks in the library and hands bytes to the poller through a {@link ByteInbox},
 * so the poller's timeouts are exact rather than the library's 100 ms steps (jSerialComm #49). An unplugged
 * adapter shows as a failed read; the port is then closed by us (the library keeps {@code isOpen()} true,
 * jSerialComm #481) and reopened by the poller. {@code closePort} runs on its own thread with a bound because it
 * can hang on a dead device (jSerialComm #287).
 */
public final class SerialTransport implements Transport {

    private static final Logger LOG = LoggerFactory.getLogger(SerialTransport.class);
    private static final Duration CLOSE_BOUND = Duration.ofSeconds(2);
    private static final int EACCES = 13;
    private static final int ENOENT = 2;
    private static final int EAGAIN = 11;
    private static final int EBUSY = 16;

    private final SerialSettings settings;
    private volatile Session session;

    /** A transport that is not open yet; the poller opens it with {@link #reopen()}. */
    public SerialTransport(SerialSettings settings) {
        this.settings = Objects.requireNonNull(settings, "settings");
    }

    @Override
    public String describe() {
        return "serial " + settings.port() + " " + settings.lineCode();
    }

    @Override
    public void write(byte[] bytes) throws IOException {
        Session current = openSession();
        int written = current.port.writeBytes(bytes, bytes.length);
        if (written != bytes.length) {
            String reason = "write to " + settings.port() + " failed (" + written + " of " + bytes.length
                    + " bytes, error " + current.port.getLastErrorCode() + "); the adapter may be unplugged";
            current.inbox.fail(reason);
            throw new IOException(reason);
        }
    }

    @Override
    public int read(byte[] buffer, int offset, int length, Duration timeout) throws IOException {
        return openSession().inbox.take(buffer, offset, length, timeout);
    }

    @Override
    public int drainInput() throws IOException {
        return openSession().inbox.clear();
    }

    @Override
    public boolean isOpen() {
        Session current = session;
        return current != null && !current.inbox.failed();
    }

    @Override
    public void reopen() throws IOException {
        close();
        SerialPort port;
        try {
            port = SerialPort.getCommPort(settings.port());
        } catch (SerialPortInvalidPortException e) {
            throw new IOException(openFailure(ENOENT, false), e);
        }
        port.setComPortParameters(settings.baud(), settings.dataBits(),
                settings.stopBits() == 2 ? SerialPort.TWO_STOP_BITS : SerialPort.ONE_STOP_BIT,
                switch (settings.parity()) {
                    case NONE -> SerialPort.NO_PARITY;
                    case EVEN -> SerialPort.EVEN_PARITY;
                    case ODD -> SerialPort.ODD_PARITY;
                });
        port.setFlowControl(switch (settings.flow()) {
            case NONE -> SerialPort.FLOW_CONTROL_DISABLED;
            case RTS_CTS -> SerialPort.FLOW_CONTROL_RTS_ENABLED | SerialPort.FLOW_CONTROL_CTS_ENABLED;
            case XON_XOFF -> SerialPort.FLOW_CONTROL_XONXOFF_IN_ENABLED | SerialPort.FLOW_CONTROL_XONXOFF_OUT_ENABLED;
        });
        port.setComPortTimeouts(SerialPort.TIMEOUT_READ_SEMI_BLOCKING | SerialPort.TIMEOUT_WRITE_BLOCKING, 100, 1000);
        if (!port.openPort(0)) {
            throw new IOException(openFailure(port.getLastErrorCode(), Files.exists(Path.of(settings.port()))));
        }
        Session opened = new Session(port, new ByteInbox(8192));
        Thread reader = new Thread(() -> pump(opened), "serial-reader " + settings.port());
        reader.setDaemon(true);
        session = opened;
        reader.start();
        LOG.info("opened {}", describe());
    }

    @Override
    public OptionalInt baudRate() {
        return OptionalInt.of(settings.baud());
    }

    @Override
    public void close() {
        Session current = session;
        session = null;
        if (current == null) {
            return;
        }
        current.closing = true;
        current.inbox.fail("serial port " + settings.port() + " was closed");
        Thread closer = new Thread(current.port::closePort, "serial-close " + settings.port());
        closer.setDaemon(true);
        closer.start();
        try {
            closer.join(CLOSE_BOUND.toMillis());
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        }
        if (closer.isAlive()) {
            LOG.warn("closing {} did not finish within {} s; left to a background thread", describe(),
                    CLOSE_BOUND.toSeconds());
        }
    }

    private Session openSession() throws IOException {
        Session current = session;
        if (current == null) {
            throw new IOException("serial port " + settings.port() + " is not open");
        }
        return current;
    }

    private void pump(Session owner) {
        byte[] buffer = new byte[1024];
        while (!owner.closing) {
            int count = owner.port.readBytes(buffer, buffer.length);
            if (count < 0) {
                if (!owner.closing) {
                    String reason = "serial port " + settings.port() + " stopped working (unplugged? read error "
                            + owner.port.getLastErrorCode() + ")";
                    LOG.warn(reason);
                    owner.inbox.fail(reason);
                }
                return;
            }
            if (count > 0) {
                owner.inbox.put(buffer, 0, count);
            }
        }
    }

    /**
     * The message an operator sees when the port cannot be opened, naming the fix. jSerialComm 2.11 reports the
     * errno of its last failing call: 13 for permission denied (jSerialComm #446); an existing port that another
     * program holds shows as 2, 11 or 16 from the exclusive lock (trial with a pseudo-terminal here).
     */
    String openFailure(int errorCode, boolean pathExists) {
        String port = settings.port();
        if (!pathExists) {
            return "serial port " + port + " does not exist; check the path and that the adapter is plugged in";
        }
        return switch (errorCode) {
            case EACCES -> "permission denied opening serial port " + port + ": add the user running cryowarden to "
                    + "the 'dialout' group (sudo usermod -aG dialout USER, then log in again)";
            case ENOENT, EAGAIN, EBUSY -> "serial port " + port + " is in use by another program (cryowarden opens "
                    + "it exclusively); find it with: fuser -v " + port;
            default -> "cannot open serial port " + port + " (error " + errorCode + ")";
        };
    }

    private static final class Session {
        final SerialPort port;
        final ByteInbox inbox;
        volatile boolean closing;

        Session(SerialPort port, ByteInbox inbox) {
            this.port = port;
            this.inbox = inbox;
        }
    }
}
