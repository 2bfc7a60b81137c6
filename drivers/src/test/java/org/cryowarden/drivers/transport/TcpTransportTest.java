package org.cryowarden.drivers.transport;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.IOException;
import java.io.OutputStream;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.net.Socket;
import java.time.Duration;
import java.util.Arrays;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.CompletionException;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;

/**
 * The TCP transport against a real loopback peer: bytes already received, waits that end with none, rounding of
 * sub-millisecond waits, the peer closing or resetting, draining, and a close from another thread. Waits here
 * are for real bytes or for the timeout under test, each with a bound.
 */
@Timeout(30)
class TcpTransportTest {

    /** How long a condition on real bytes may take on a loaded machine before the test gives up. */
    private static final Duration BOUND = Duration.ofSeconds(5);
    /** Slack above a timeout for scheduling on shared cores (common practice: tens of ms). */
    private static final Duration SLACK = Duration.ofMillis(200);

    private ServerSocket server;
    private Socket peer;
    private TcpTransport transport;
    private String address;

    @BeforeEach
    void connect() throws IOException {
        server = new ServerSocket(0, 1, InetAddress.getLoopbackAddress());
        server.setSoTimeout((int) BOUND.toMillis());
        address = "127.0.0.1:" + server.getLocalPort();
        transport = new TcpTransport(new TcpSettings("127.0.0.1", server.getLocalPort(), BOUND));
        transport.reopen();
        peer = server.accept();
    }

    @AfterEach
    void disconnect() throws IOException {
        transport.close();
        peer.close();
        server.close();
    }

    @Test
    void bytesAlreadyReceivedComeBackFromAReadWithZeroTimeout() throws Exception {
        send("01 03");

        byte[] got = readUntil(2, Duration.ZERO);

        assertThat(got).containsExactly(0x01, 0x03); // the bytes sent, in order (common practice)
    }

    @Test
    void bytesAlreadyReceivedComeBackFromASubMillisecondReadToo() throws Exception {
        send("11 22 33");

        byte[] got = readUntil(3, Duration.ofNanos(1));

        assertThat(got).containsExactly(0x11, 0x22, 0x33); // the bytes sent, in order (common practice)
    }

    @Test
    void aReadReturnsAsSoonAsBytesArriveRatherThanAtTheTimeout() throws Exception {
        long start = System.nanoTime();
        CompletableFuture<Integer> reading = CompletableFuture.supplyAsync(() -> readOnce(new byte[16], BOUND));

        send("7e");

        int count = reading.get(BOUND.toMillis(), TimeUnit.MILLISECONDS);
        assertThat(count).isEqualTo(1); // one byte sent, one returned
        // Well before the 5 s timeout (common practice: loopback delivers in microseconds).
        assertThat(Duration.ofNanos(System.nanoTime() - start)).isLessThan(BOUND.dividedBy(2));
    }

    @Test
    void aReadWithNothingToReadReturnsZeroNoSoonerThanItsTimeout() throws IOException {
        Duration timeout = Duration.ofMillis(50);

        long start = System.nanoTime();
        int count = transport.read(new byte[16], 0, 16, timeout);
        Duration waited = Duration.ofNanos(System.nanoTime() - start);

        assertThat(count).isZero();
        assertThat(waited).isGreaterThanOrEqualTo(timeout); // the Transport contract: never shorter
        assertThat(waited).isLessThan(timeout.plus(SLACK));
        assertThat(transport.isOpen()).isTrue(); // a read timeout leaves the socket usable (java.net.Socket#setSoTimeout)
    }

    @Test
    void aSubMillisecondOrFractionalTimeoutIsRoundedUpAndEndsWithZero() throws IOException {
        for (Duration timeout : new Duration[] {Duration.ofNanos(1), Duration.ofNanos(300_000),
                Duration.ofNanos(1_500_000)}) {
            long start = System.nanoTime();
            int count = transport.read(new byte[16], 0, 16, timeout);
            Duration waited = Duration.ofNanos(System.nanoTime() - start);

            assertThat(count).as("read with %s", timeout).isZero();
            // Rounded up, never down: at least what was asked (the Transport contract).
            assertThat(waited).as("wait for %s", timeout).isGreaterThanOrEqualTo(timeout);
            assertThat(waited).as("wait for %s", timeout).isLessThan(Duration.ofMillis(2).plus(SLACK));
        }
        assertThat(transport.isOpen()).isTrue();
    }

    @Test
    void aReadWithZeroTimeoutAndNothingToReadReturnsZeroAtOnce() throws IOException {
        long start = System.nanoTime();
        int count = transport.read(new byte[16], 0, 16, Duration.ZERO);

        assertThat(count).isZero();
        assertThat(Duration.ofNanos(System.nanoTime() - start)).isLessThan(SLACK);
    }

    @Test
    void thePeerClosingFailsTheTransportNamingHostAndPort() throws IOException {
        peer.close();

        assertThatThrownBy(() -> transport.read(new byte[16], 0, 16, BOUND))
                .isInstanceOf(IOException.class)
                .hasMessage("device server " + address + " closed the connection");
        assertThat(transport.isOpen()).isFalse();
        // Every later call reports the same failure until the poller reopens.
        assertThatThrownBy(() -> transport.drainInput()).hasMessage("device server " + address
                + " closed the connection");
    }

    @Test
    void bytesSentBeforeThePeerClosedAreReadBeforeTheFailure() throws Exception {
        send("05 06");
        peer.close();

        byte[] got = readUntil(2, BOUND);

        assertThat(got).containsExactly(0x05, 0x06); // TCP delivers data before the FIN (RFC 9293 §3.6)
        assertThatThrownBy(() -> transport.read(new byte[16], 0, 16, BOUND))
                .hasMessage("device server " + address + " closed the connection");
    }

    @Test
    void aResetConnectionFailsTheTransportSayingItWasLost() throws IOException {
        peer.setSoLinger(true, 0); // closing with a zero linger sends RST (common practice, SO_LINGER)
        peer.close();

        assertThatThrownBy(() -> transport.read(new byte[16], 0, 16, BOUND))
                .isInstanceOf(IOException.class)
                .hasMessageStartingWith("connection to " + address + " lost: ");
        assertThat(transport.isOpen()).isFalse();
    }

    @Test
    void drainingDiscardsWhatArrivedAndCountsItWithoutTouchingLaterBytes() throws Exception {
        send("aa bb cc dd ee");
        int discarded = 0;
        long deadline = System.nanoTime() + BOUND.toNanos();
        while (discarded < 5 && System.nanoTime() < deadline) {
            discarded += transport.drainInput();
        }
        assertThat(discarded).isEqualTo(5); // five bytes sent

        assertThat(transport.drainInput()).isZero(); // nothing left; and it did not wait
        assertThat(transport.read(new byte[16], 0, 16, Duration.ofMillis(1))).isZero();

        send("42");
        assertThat(readUntil(1, BOUND)).containsExactly(0x42); // only the byte sent after the drain
    }

    @Test
    void closingFromAnotherThreadEndsAWaitingReadPromptly() throws Exception {
        Thread[] readerThread = new Thread[1];
        CompletableFuture<Integer> reading = CompletableFuture.supplyAsync(() -> {
            readerThread[0] = Thread.currentThread();
            return readOnce(new byte[16], Duration.ofSeconds(60));
        });
        awaitBlockedInRead(reading, readerThread);

        long start = System.nanoTime();
        transport.close();
        transport.close(); // idempotent

        assertThatThrownBy(() -> reading.get(BOUND.toMillis(), TimeUnit.MILLISECONDS))
                .isInstanceOf(ExecutionException.class)
                .cause().isInstanceOf(IOException.class)
                .hasMessage("connection to " + address + " was closed");
        // Far below the 60 s the read would have waited (java.net.Socket#close wakes a blocked read).
        assertThat(Duration.ofNanos(System.nanoTime() - start)).isLessThan(Duration.ofSeconds(2));
        assertThat(transport.isOpen()).isFalse();
    }

    @Test
    void aConnectionRefusedSaysWhereAndWhy() throws IOException {
        int freePort;
        try (ServerSocket probe = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            freePort = probe.getLocalPort();
        }
        TcpTransport nowhere = new TcpTransport(new TcpSettings("127.0.0.1", freePort, BOUND));

        assertThatThrownBy(nowhere::reopen).isInstanceOf(IOException.class)
                .hasMessageStartingWith("cannot connect to 127.0.0.1:" + freePort + ": ");
        assertThat(nowhere.isOpen()).isFalse();
    }

    private void send(String hex) throws IOException {
        OutputStream out = peer.getOutputStream();
        for (String octet : hex.split(" ")) {
            out.write(Integer.parseInt(octet, 16));
        }
        out.flush();
    }

    /** Reads with {@code timeout} per call until {@code expected} bytes came, bounded by {@link #BOUND}. */
    private byte[] readUntil(int expected, Duration timeout) throws IOException {
        byte[] buffer = new byte[64];
        int length = 0;
        long deadline = System.nanoTime() + BOUND.toNanos();
        while (length < expected && System.nanoTime() < deadline) {
            length += transport.read(buffer, length, buffer.length - length, timeout);
        }
        return Arrays.copyOf(buffer, length);
    }

    private int readOnce(byte[] buffer, Duration timeout) {
        try {
            return transport.read(buffer, 0, buffer.length, timeout);
        } catch (IOException e) {
            throw new CompletionException(e);
        }
    }

    /** Waits (bounded) until the reading thread sits in the socket's native wait inside the transport's read. */
    private static void awaitBlockedInRead(CompletableFuture<?> reading, Thread[] readerThread)
            throws InterruptedException {
        long deadline = System.nanoTime() + BOUND.toNanos();
        while (System.nanoTime() < deadline && !reading.isDone()) {
            Thread thread = readerThread[0];
            if (thread != null) {
                StackTraceElement[] stack = thread.getStackTrace();
                boolean inRead = Arrays.stream(stack).anyMatch(frame -> frame.getClassName()
                        .equals(TcpTransport.class.getName()) && frame.getMethodName().equals("read"));
                if (inRead && stack.length > 0 && stack[0].isNativeMethod()) {
                    return;
                }
            }
            Thread.sleep(1); // a look at the other thread's stack each millisecond, bounded above
        }
        throw new AssertionError("the read did not start waiting within " + BOUND
                + (reading.isDone() ? " (it ended: " + reading + ")" : ""));
    }
}
