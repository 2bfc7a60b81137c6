package org.cryowarden.daemon.run;

import java.io.IOException;
import java.time.Duration;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.TimeUnit;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Tells systemd how the service is (sd_notify states {@code READY=1}, {@code WATCHDOG=1}, {@code STOPPING=1}).
 * Java 17 has no unix datagram sockets, so the state goes through {@code systemd-notify --pid=<our pid>}; the unit
 * needs {@code NotifyAccess=all} since the sender is a child process. Outside systemd ({@code NOTIFY_SOCKET}
 * unset) nothing is sent.
 */
interface SystemdNotify {

    void send(String state);

    /** How often systemd wants {@code WATCHDOG=1} (half its {@code WATCHDOG_USEC}), when it asked for it. */
    default Optional<Duration> watchdogEvery() {
        return Optional.empty();
    }

    static SystemdNotify none() {
        return state -> {
        };
    }

    /** The {@code systemd-notify} command when {@code NOTIFY_SOCKET} is set, else {@link #none()}. */
    static SystemdNotify fromEnvironment(Map<String, String> env) {
        if (env.getOrDefault("NOTIFY_SOCKET", "").isBlank()) {
            return none();
        }
        Optional<Duration> every = Optional.ofNullable(env.get("WATCHDOG_USEC")).flatMap(text -> {
            try {
                long micros = Long.parseLong(text.strip());
                return micros > 0 ? Optional.of(Duration.ofNanos(micros * 1000 / 2)) : Optional.empty();
            } catch (NumberFormatException e) {
                return Optional.empty();
            }
        });
        return new Command(ProcessHandle.current().pid(), every);
    }

    /** Runs {@code systemd-notify --pid=PID STATE}, waiting at most a few seconds. */
    final class Command implements SystemdNotify {

        private static final Logger LOG = LoggerFactory.getLogger(SystemdNotify.class);

        private final long pid;
        private final Optional<Duration> every;
        private boolean warned;

        Command(long pid, Optional<Duration> every) {
            this.pid = pid;
            this.every = every;
        }

        @Override
        public Optional<Duration> watchdogEvery() {
            return every;
        }

        @Override
        public synchronized void send(String state) {
            try {
                Process process = new ProcessBuilder("systemd-notify", "--pid=" + pid, state)
                        .redirectErrorStream(true).redirectOutput(ProcessBuilder.Redirect.DISCARD).start();
                if (!process.waitFor(5, TimeUnit.SECONDS)) {
                    process.destroyForcibly();
                    LOG.warn("systemd-notify {} did not finish within 5 s", state);
                } else if (process.exitValue() != 0 && !warned) {
                    warned = true;
                    LOG.warn("systemd-notify {} exited with {}; is NotifyAccess=all set in the unit?", state,
                            process.exitValue());
                }
            } catch (IOException e) {
                if (!warned) {
                    warned = true;
                    LOG.warn("cannot run systemd-notify ({}); systemd will not hear {}", e.getMessage(), state);
                }
            } catch (InterruptedException e) {
                Thread.currentThread().interrupt();
            }
        }
    }
}
