package org.cryowarden.drivers.testing;

import java.io.ByteArrayOutputStream;
import java.io.IOException;
import java.io.InputStream;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.nio.charset.StandardCharsets;
import java.util.Arrays;
import java.util.function.UnaryOperator;
import org.cryowarden.drivers.modbus.ModbusSlaveCodec;

/**
 * A device behind a pretend serial device server: a loopback TCP port serving one connection at a time, either
 * Modbus RTU frames (framed by their own length, answered by a {@link ModbusTestDevice}) or text lines (each LF
 * terminated line answered by a function; a null answer is silence). For command-line and transport tests.
 */
public final class TcpDeviceServer implements AutoCloseable {

    private final ServerSocket server;
    private final Thread thread;
    private final ScriptedTransport.Responder modbus;
    private final UnaryOperator<String> lines;

    private TcpDeviceServer(int port, ScriptedTransport.Responder modbus, UnaryOperator<String> lines)
            throws IOException {
        this.server = new ServerSocket();
        this.server.setReuseAddress(true);
        this.server.bind(new java.net.InetSocketAddress(InetAddress.getLoopbackAddress(), port), 4);
        this.modbus = modbus;
        this.lines = lines;
        this.thread = new Thread(this::serve, "tcp-device " + server.getLocalPort());
        this.thread.setDaemon(true);
        this.thread.start();
    }

    public static TcpDeviceServer modbus(ScriptedTransport.Responder device) throws IOException {
        return new TcpDeviceServer(0, device, null);
    }

    public static TcpDeviceServer lines(UnaryOperator<String> answer) throws IOException {
        return new TcpDeviceServer(0, null, answer);
    }

    /** A line device on a given port, e.g. to come back where a previous one was. */
    public static TcpDeviceServer lines(int port, UnaryOperator<String> answer) throws IOException {
        return new TcpDeviceServer(port, null, answer);
    }

    public int port() {
        return server.getLocalPort();
    }

    /** "127.0.0.1:PORT" for {@code --tcp}. */
    public String address() {
        return "127.0.0.1:" + port();
    }

    private volatile Socket client;

    private void serve() {
        while (!server.isClosed()) {
            try (Socket socket = server.accept()) {
                client = socket;
                socket.setTcpNoDelay(true);
                handle(socket.getInputStream(), socket.getOutputStream());
            } catch (IOException e) {
                // connection closed by the client or the server; serve the next one
            }
        }
    }

    private void handle(InputStream in, OutputStream out) throws IOException {
        ByteArrayOutputStream pending = new ByteArrayOutputStream();
        byte[] buffer = new byte[512];
        int count;
        while ((count = in.read(buffer)) >= 0) {
            pending.write(buffer, 0, count);
            byte[] bytes = pending.toByteArray();
            int used = modbus != null ? answerFrames(bytes, out) : answerLines(bytes, out);
            pending.reset();
            pending.write(bytes, used, bytes.length - used);
        }
    }

    private int answerFrames(byte[] bytes, OutputStream out) throws IOException {
        int used = 0;
        while (true) {
            byte[] rest = Arrays.copyOfRange(bytes, used, bytes.length);
            int length = ModbusSlaveCodec.requestLength(rest, rest.length);
            if (length < 0 && rest.length >= 256) {
                return bytes.length;
            }
            if (length < 0 || rest.length < length) {
                return used;
            }
            byte[] answer = modbus.respond(Arrays.copyOf(rest, length));
            if (answer != null && answer.length > 0) {
                out.write(answer);
                out.flush();
            }
            used += length;
        }
    }

    private int answerLines(byte[] bytes, OutputStream out) throws IOException {
        int used = 0;
        for (int i = 0; i < bytes.length; i++) {
            if (bytes[i] == '\n') {
                String line = new String(bytes, used, i - used, StandardCharsets.ISO_8859_1).replace("\r", "");
                used = i + 1;
                String answer = lines.apply(line);
                if (answer != null) {
                    out.write(answer.getBytes(StandardCharsets.ISO_8859_1));
                    out.flush();
                }
            }
        }
        return used;
    }

    @Override
    public void close() throws IOException, InterruptedException {
        server.close();
        Socket current = client;
        if (current != null) {
            current.close();
        }
        thread.join(5_000);
    }
}
