package org.cryowarden.simulator.emulators;

import java.io.IOException;
import java.net.InetAddress;
import java.net.InetSocketAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.List;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.ConcurrentHashMap;
import java.util.concurrent.DelayQueue;
import java.util.concurrent.Delayed;
import java.util.concurrent.TimeUnit;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.concurrent.atomic.AtomicLong;
import java.util.function.Supplier;
import org.cryowarden.drivers.modbus.ModbusRequest;
import org.cryowarden.drivers.modbus.ModbusSlaveCodec;
import org.cryowarden.drivers.modbus.RtuFrame;
import org.cryowarden.drivers.modbus.RtuFrameReader;
import org.cryowarden.drivers.modbus.RtuTiming;
import org.cryowarden.drivers.modbus.SlaveRequest;
import org.cryowarden.drivers.scpi.ScpiCodec;
import org.cryowarden.drivers.scpi.ScpiCommand;
import org.cryowarden.drivers.text.LineAssembler;
import org.cryowarden.drivers.text.LineEvent;
import org.cryowarden.simulator.sensors.SensorSnapshot;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * One emulated line on a TCP port: it accepts connections (a master, or the simulator's own socat bridge to a
 * pseudo-terminal) and serves the instruments on it in their protocol. Modbus requests are cut by the drivers'
 * {@link RtuFrameReader} and parsed by {@link ModbusSlaveCodec}; the slave with the request's unit answers, the
 * others stay silent as on a multidrop line, and bad frames are ignored (Modbus over Serial Line V1.02, §2.4.1).
 * SCPI lines go to the first instrument that knows the header (common commands to the first instrument). A
 * streaming device's lines go to every connection. Link faults (silence, garbage, bad CRC, slow replies) belong to
 * the instrument addressed; a disconnect drops the whole port. One thread accepts; each connection has one thread
 * that reads and answers and one that puts the answers on the line, each at its own due time: a slow instrument's
 * late reply is scheduled, not waited for, so a neighbour addressed meanwhile answers on time, as on a real
 * multidrop line where each slave answers by itself (Modbus over Serial Line V1.02, §2.4.1). The line carries one
 * frame at a time, with the t3.5 silence between frames ({@link SocketLink}): a reply due while another is being
 * sent follows it (a real line would garble both; the master sees a late reply either way).
 */
public final class PortServer implements AutoCloseable {

    private static final Logger LOG = LoggerFactory.getLogger(PortServer.class);
    private static final int MAX_LINE = 4096;

    private final PortSpec spec;
    private final List<Instrument> instruments;
    private final Protocol protocol;
    private final Supplier<SensorSnapshot> snapshots;
    private final Set<Connection> connections = ConcurrentHashMap.newKeySet();
    private final Object lock = new Object();
    private final AtomicLong ignoredFrames = new AtomicLong();
    /** When the line last finished sending (System.nanoTime), for {@link #quietFor()}. */
    private volatile long lastSentNanos = System.nanoTime();
    private volatile ServerSocket server;
    private volatile boolean disconnected;
    private volatile boolean closed;
    private InetAddress host;
    private int port;
    private Thread acceptor;

    public PortServer(PortSpec spec, List<Instrument> instruments, Supplier<SensorSnapshot> snapshots) {
        if (instruments.isEmpty()) {
            throw new IllegalArgumentException("port " + spec.id() + " has no instruments");
        }
        this.spec = spec;
        this.instruments = List.copyOf(instruments);
        this.protocol = instruments.get(0).protocol();
        for (Instrument instrument : instruments) {
            if (instrument.protocol() != protocol) {
                throw new IllegalArgumentException("port " + spec.id() + " mixes " + protocol + " and "
                        + instrument.protocol());
            }
        }
        this.snapshots = snapshots;
    }

    public PortSpec spec() {
        return spec;
    }

    public Protocol protocol() {
        return protocol;
    }

    public List<Instrument> instruments() {
        return instruments;
    }

    /**
     * Binds and starts accepting; {@code tcpPort} 0 picks a free port, see {@link #port()}. A picked port lies
     * below the Linux ephemeral range (32768-60999), so that re-listening after a scripted disconnect cannot
     * collide with the local port of some outgoing connection made meanwhile.
     */
    public void start(InetAddress bindAddress, int tcpPort) throws IOException {
        this.host = bindAddress;
        ServerSocket socket = tcpPort == 0 ? bindBelowEphemeralRange() : bind(tcpPort);
        this.port = socket.getLocalPort();
        this.server = socket;
        acceptor = new Thread(this::acceptLoop, "sim-port " + spec.id());
        acceptor.setDaemon(true);
        acceptor.start();
    }

    private ServerSocket bindBelowEphemeralRange() throws IOException {
        java.util.concurrent.ThreadLocalRandom random = java.util.concurrent.ThreadLocalRandom.current();
        for (int attempt = 0; attempt < 64; attempt++) {
            int candidate = random.nextInt(20_000, 32_000);
            ServerSocket socket = new ServerSocket();
            try {
                socket.bind(new InetSocketAddress(host, candidate));
                return socket;
            } catch (IOException taken) {
                socket.close();
            }
        }
        return bind(0);
    }

    private ServerSocket bind(int tcpPort) throws IOException {
        ServerSocket socket = new ServerSocket();
        socket.setReuseAddress(true);
        try {
            socket.bind(new InetSocketAddress(host, tcpPort));
        } catch (IOException e) {
            socket.close();
            throw new IOException("port " + spec.id() + ": cannot listen on " + host.getHostAddress() + ":" + tcpPort
                    + " (" + e.getMessage() + "); choose another with --tcp-base-port", e);
        }
        return socket;
    }

    public int port() {
        return port;
    }

    public InetAddress host() {
        return host;
    }

    public int connectionCount() {
        return connections.size();
    }

    /** Frames that were not answered because they were malformed (bad CRC, short, wrong length). */
    public long ignoredFrames() {
        return ignoredFrames.get();
    }

    /**
     * How long the line has carried nothing from the instruments: zero while a reply is scheduled or being sent
     * (a slow instrument's late reply included), else the time since the last one ended. Lets a test that drives
     * a virtual clock leave the real time a late reply takes, as the real second between two polls would.
     */
    public Duration quietFor() {
        for (Connection connection : connections) {
            if (connection.sending()) {
                return Duration.ZERO;
            }
        }
        return Duration.ofNanos(Math.max(0, System.nanoTime() - lastSentNanos));
    }

    public boolean isDisconnected() {
        return disconnected;
    }

    /**
     * Drops every connection and refuses new ones (a device server losing power), or serves again. The listening
     * socket stays bound meanwhile and new connections are closed at once: releasing the port would let another
     * program on a busy machine take it, and the device could then never come back. Called by the timeline on the
     * simulation thread.
     */
    public void setDisconnected(boolean down) throws IOException {
        synchronized (lock) {
            if (down == disconnected || closed) {
                return;
            }
            disconnected = down;
            if (down) {
                for (Connection connection : connections) {
                    connection.close();
                }
            }
            lock.notifyAll();
        }
    }

    /** Sends a streaming device's line to every connection (simulation thread; never blocks it). */
    public void publish(StreamingDevice device, String line) {
        byte[] bytes;
        long delayNanos = 0;
        if (device.fault(FaultKind.SILENCE).isPresent()) {
            return;
        }
        if (device.fault(FaultKind.GARBAGE).isPresent()) {
            bytes = concat(device.garbage(), device.terminator().text().getBytes(StandardCharsets.ISO_8859_1));
        } else {
            bytes = (line + device.terminator().text()).getBytes(StandardCharsets.ISO_8859_1);
        }
        Optional<Fault> slow = device.fault(FaultKind.SLOW);
        if (slow.isPresent()) {
            delayNanos = slow.get().delay().toNanos();
        }
        for (Connection connection : connections) {
            connection.enqueue(bytes, System.nanoTime() + delayNanos);
        }
    }

    private void acceptLoop() {
        while (!closed) {
            ServerSocket current = server;
            if (current == null) {
                synchronized (lock) {
                    try {
                        lock.wait(200);
                    } catch (InterruptedException e) {
                        return;
                    }
                }
                continue;
            }
            try {
                Socket socket = current.accept();
                if (disconnected || closed) {
                    socket.close();
                    continue;
                }
                Connection connection = new Connection(socket);
                connections.add(connection);
                connection.start();
            } catch (IOException e) {
                if (!closed && !disconnected) {
                    LOG.debug("port {}: accept failed: {}", spec.id(), e.toString());
                }
            }
        }
    }

    @Override
    public void close() {
        synchronized (lock) {
            closed = true;
            ServerSocket current = server;
            server = null;
            if (current != null) {
                try {
                    current.close();
                } catch (IOException e) {
                    // closing anyway
                }
            }
            lock.notifyAll();
        }
        for (Connection connection : connections) {
            connection.close();
        }
    }

    private static byte[] concat(byte[] a, byte[] b) {
        byte[] out = new byte[a.length + b.length];
        System.arraycopy(a, 0, out, 0, a.length);
        System.arraycopy(b, 0, out, a.length, b.length);
        return out;
    }

    /** One accepted connection and the thread serving it. */
    private final class Connection {
        private final Socket socket;
        private final SocketLink link;
        private final DelayQueue<Outgoing> outbox = new DelayQueue<>();
        private final AtomicLong queued = new AtomicLong();
        /** Queued or being sent; goes down only once the bytes are out. */
        private final AtomicInteger unsent = new AtomicInteger();

        Connection(Socket socket) throws IOException {
            this.socket = socket;
            this.link = new SocketLink(socket, spec.baud(), spec.bitsPerByte(), spec.pace(),
                    protocol == Protocol.MODBUS_RTU && spec.baud() > 0
                            ? RtuTiming.forBaud(spec.baud()).interFrame() : Duration.ZERO);
        }

        void start() {
            Thread reader = new Thread(this::serve, "sim-conn " + spec.id() + " " + socket.getRemoteSocketAddress());
            reader.setDaemon(true);
            reader.start();
            Thread writer = new Thread(this::drainOutbox, "sim-line " + spec.id());
            writer.setDaemon(true);
            writer.start();
        }

        boolean sending() {
            return unsent.get() > 0;
        }

        /** Queues bytes for the line, to go out no sooner than {@code notBeforeNanos}; at most 256 wait. */
        void enqueue(byte[] bytes, long notBeforeNanos) {
            if (outbox.size() < 256) {
                unsent.incrementAndGet();
                outbox.offer(new Outgoing(bytes, notBeforeNanos, queued.incrementAndGet()));
            }
        }

        private void serve() {
            try {
                switch (protocol) {
                    case MODBUS_RTU -> serveModbus();
                    case SCPI -> serveScpi();
                    case LINE -> discardInput();
                }
            } catch (IOException e) {
                LOG.debug("port {}: connection ended: {}", spec.id(), e.getMessage());
            } finally {
                close();
            }
        }

        private void serveModbus() throws IOException {
            Duration silence = RtuTiming.forBaud(spec.baud() > 0 ? spec.baud() : 19200).interFrame();
            if (silence.compareTo(Duration.ofMillis(5)) < 0) {
                silence = Duration.ofMillis(5);
            }
            RtuFrameReader reader = new RtuFrameReader(silence);
            while (!closed && !socket.isClosed()) {
                RtuFrame frame = reader.read(link, ModbusSlaveCodec::requestLength, Duration.ofMillis(500));
                if (frame.ending() == RtuFrame.Ending.NO_REPLY) {
                    continue;
                }
                SlaveRequest parsed = ModbusSlaveCodec.parseRequest(frame.bytes(), frame.length());
                SensorSnapshot snapshot = snapshots.get();
                if (parsed instanceof SlaveRequest.Accepted accepted) {
                    ModbusRequest request = accepted.request();
                    if (request.unit() == 0) {
                        for (Instrument instrument : instruments) {
                            ((ModbusInstrument) instrument).serve(request, snapshot);
                        }
                        continue;
                    }
                    Optional<ModbusInstrument> slave = slave(request.unit());
                    if (slave.isPresent()) {
                        reply(slave.get(), slave.get().serve(request, snapshot), true);
                    }
                } else if (parsed instanceof SlaveRequest.Refused refused) {
                    Optional<ModbusInstrument> slave = slave(refused.unit());
                    if (slave.isPresent()) {
                        reply(slave.get(), ModbusSlaveCodec.encodeException(refused.unit(), refused.functionCode(),
                                refused.exception()), true);
                    }
                } else {
                    ignoredFrames.incrementAndGet();
                }
            }
        }

        private Optional<ModbusInstrument> slave(int unit) {
            for (Instrument instrument : instruments) {
                if (((ModbusInstrument) instrument).unit() == unit) {
                    return Optional.of((ModbusInstrument) instrument);
                }
            }
            return Optional.empty();
        }

        private void serveScpi() throws IOException {
            LineAssembler lines = new LineAssembler(MAX_LINE);
            byte[] buffer = new byte[1024];
            while (!closed && !socket.isClosed()) {
                int count = link.read(buffer, 0, buffer.length, Duration.ofMillis(500));
                for (LineEvent event : lines.feed(buffer, 0, count)) {
                    ScpiInstrument first = (ScpiInstrument) instruments.get(0);
                    if (!(event instanceof LineEvent.Line line)) {
                        first.queueError(-102, "Syntax error");
                        continue;
                    }
                    Optional<List<ScpiCommand>> commands = ScpiCodec.parseProgramMessage(line.text());
                    if (commands.isEmpty()) {
                        first.queueError(-102, "Syntax error");
                        continue;
                    }
                    SensorSnapshot snapshot = snapshots.get();
                    for (ScpiCommand command : commands.get()) {
                        ScpiInstrument target = route(command);
                        Optional<String> response = target.handle(command, snapshot);
                        if (response.isPresent()) {
                            byte[] bytes = (response.get() + target.terminator().text())
                                    .getBytes(StandardCharsets.ISO_8859_1);
                            reply(target, bytes, false);
                        }
                    }
                }
            }
        }

        private ScpiInstrument route(ScpiCommand command) {
            for (Instrument instrument : instruments) {
                if (((ScpiInstrument) instrument).knows(command)) {
                    return (ScpiInstrument) instrument;
                }
            }
            return (ScpiInstrument) instruments.get(0);
        }

        private void discardInput() throws IOException {
            byte[] buffer = new byte[256];
            while (!closed && !socket.isClosed()) {
                link.read(buffer, 0, buffer.length, Duration.ofMillis(500));
            }
        }

        /** Schedules a reply as the instrument's faults allow: now, or after its slow fault's delay. */
        private void reply(Instrument instrument, byte[] bytes, boolean modbus) {
            if (instrument.fault(FaultKind.SILENCE).isPresent()) {
                return;
            }
            byte[] out = bytes;
            if (instrument.fault(FaultKind.GARBAGE).isPresent()) {
                out = instrument.garbage();
                if (!modbus) {
                    out = concat(out, "\n".getBytes(StandardCharsets.ISO_8859_1));
                }
            } else if (modbus && instrument.fault(FaultKind.BAD_CRC).isPresent()) {
                out = bytes.clone();
                out[out.length - 1] ^= (byte) 0xFF;
            }
            long delay = instrument.fault(FaultKind.SLOW).map(slow -> slow.delay().toNanos()).orElse(0L);
            enqueue(out, System.nanoTime() + delay);
        }

        private void drainOutbox() {
            try {
                while (!closed && !socket.isClosed()) {
                    Outgoing next = outbox.poll(500, TimeUnit.MILLISECONDS); // the earliest once it is due
                    if (next != null) {
                        try {
                            link.write(next.bytes);
                        } finally {
                            lastSentNanos = System.nanoTime();
                            unsent.decrementAndGet();
                        }
                    }
                }
            } catch (IOException | InterruptedException e) {
                close();
            }
        }

        void close() {
            connections.remove(this);
            link.close();
        }
    }

    /** Bytes for the line and when they are due; earlier first, then in the order queued. */
    private record Outgoing(byte[] bytes, long notBefore, long order) implements Delayed {
        @Override
        public long getDelay(TimeUnit unit) {
            return unit.convert(notBefore - System.nanoTime(), TimeUnit.NANOSECONDS);
        }

        @Override
        public int compareTo(Delayed other) {
            Outgoing that = (Outgoing) other;
            int byTime = Long.compare(notBefore - that.notBefore, 0);
            return byTime != 0 ? byTime : Long.compare(order, that.order);
        }
    }
}
