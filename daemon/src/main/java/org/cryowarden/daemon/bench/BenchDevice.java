package org.cryowarden.daemon.bench;

import java.io.DataInputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.util.List;
import java.util.concurrent.CopyOnWriteArrayList;
import java.util.concurrent.atomic.AtomicIntegerArray;
import java.util.concurrent.atomic.AtomicLongArray;
import org.cryowarden.drivers.modbus.ModbusSlaveCodec;
import org.cryowarden.drivers.modbus.SlaveRequest;

/**
 * A Modbus RTU slave on a TCP port (a serial device server without the line timing) whose input registers the
 * bench sets: register {@code i} is channel {@code i} of one bus. When a register is marked, the first reply
 * that carries it records when its last byte was handed to the loopback socket, which is when it arrives at the
 * daemon's transport within the loopback's tens of microseconds. Only reads of input registers (function 04,
 * 8-byte requests) are served; the daemon's driver sends nothing else to it.
 */
final class BenchDevice implements AutoCloseable {

    static final int REQUEST_BYTES = 8;

    private final ServerSocket server;
    private final AtomicIntegerArray registers;
    private final AtomicIntegerArray marked;
    private final AtomicLongArray sentNanos;
    private final List<Thread> threads = new CopyOnWriteArrayList<>();
    private volatile boolean closed;

    BenchDevice(int registers, int initialValue) throws IOException {
        this.server = new ServerSocket(0, 4, InetAddress.getLoopbackAddress());
        this.registers = new AtomicIntegerArray(registers);
        this.marked = new AtomicIntegerArray(registers);
        this.sentNanos = new AtomicLongArray(registers);
        for (int i = 0; i < registers; i++) {
            this.registers.set(i, initialValue);
        }
        Thread acceptor = new Thread(this::accept, "bench-device-accept " + server.getLocalPort());
        acceptor.setDaemon(true);
        acceptor.start();
    }

    int port() {
        return server.getLocalPort();
    }

    /** Sets a register; with {@code mark}, the next reply carrying it records its send time. */
    void set(int register, int value, boolean mark) {
        sentNanos.set(register, 0);
        registers.set(register, value);
        marked.set(register, mark ? 1 : 0);
    }

    /** When the marked value of {@code register} left in a reply ({@link System#nanoTime}), 0 when not yet. */
    long sentNanos(int register) {
        return sentNanos.get(register);
    }

    /** The threads serving connections, whose CPU time the footprint suite takes out of the daemon's. */
    List<Thread> threads() {
        return threads;
    }

    private void accept() {
        while (!closed) {
            try {
                Socket socket = server.accept();
                socket.setTcpNoDelay(true);
                Thread serving = new Thread(() -> serve(socket), "bench-device " + server.getLocalPort());
                serving.setDaemon(true);
                threads.add(serving);
                serving.start();
            } catch (IOException e) {
                return;
            }
        }
    }

    private void serve(Socket socket) {
        byte[] frame = new byte[REQUEST_BYTES];
        try (socket) {
            DataInputStream in = new DataInputStream(socket.getInputStream());
            OutputStream out = socket.getOutputStream();
            while (!closed) {
                in.readFully(frame);
                if (!(ModbusSlaveCodec.parseRequest(frame, frame.length) instanceof SlaveRequest.Accepted accepted)) {
                    continue;
                }
                var request = accepted.request();
                int[] values = new int[request.quantity()];
                boolean[] carried = new boolean[values.length];
                for (int i = 0; i < values.length; i++) {
                    int register = request.address() + i;
                    values[i] = registers.get(register);
                    carried[i] = marked.get(register) == 1;
                }
                out.write(ModbusSlaveCodec.encodeReadResponse(request, values));
                out.flush();
                long sent = System.nanoTime();
                for (int i = 0; i < values.length; i++) {
                    if (carried[i] && marked.compareAndSet(request.address() + i, 1, 0)) {
                        sentNanos.set(request.address() + i, sent);
                    }
                }
            }
        } catch (IOException e) {
            // the daemon closed the connection
        }
        threads.remove(Thread.currentThread());
    }

    @Override
    public void close() {
        closed = true;
        try {
            server.close();
        } catch (IOException e) {
            // closing anyway
        }
    }
}
