package org.cryowarden.daemon.mqtt;

import java.net.URI;
import java.net.URISyntaxException;
import java.nio.charset.StandardCharsets;
import java.time.Duration;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import org.eclipse.paho.mqttv5.common.util.MqttTopicValidator;

/**
 * How an {@link MqttLink} connects. Start from {@link #of} and adjust with the {@code with...} methods.
 *
 * @param serverUri      {@code tcp://host:port}, or {@code ssl://host:port} / {@code mqtts://host:port} for TLS
 * @param clientId       MQTT client identifier; unique per daemon on the broker
 * @param statusTopic    where the online status and the last will are published, retained
 * @param onlinePayload  published retained on {@code statusTopic} after every connect
 * @param willPayload    the last will, retained on {@code statusTopic}, sent by the broker if the connection breaks
 * @param username       MQTT user name, if the broker wants one
 * @param password       MQTT password, if the broker wants one; never printed
 * @param maxInFlight    how many publishes may wait for the broker's acknowledgement at once
 * @param queueCapacity  how many publishes may wait for a window slot; beyond that a publish fails at once
 * @param connectTimeout how long one connect attempt may take
 * @param keepAlive      MQTT keep-alive interval
 * @param minRetryDelay  first delay between connect attempts
 * @param maxRetryDelay  longest delay between connect attempts
 * @param tls            certificates for an {@code ssl://} broker; ignored for {@code tcp://}
 */
public record MqttLinkSettings(String serverUri, String clientId, String statusTopic,
                               byte[] onlinePayload, byte[] willPayload,
                               Optional<String> username, Optional<String> password,
                               int maxInFlight, int queueCapacity,
                               Duration connectTimeout, Duration keepAlive,
                               Duration minRetryDelay, Duration maxRetryDelay, LinkTls tls) {

    public MqttLinkSettings {
        Objects.requireNonNull(tls, "tls");
        Objects.requireNonNull(serverUri, "serverUri");
        Objects.requireNonNull(clientId, "clientId");
        Objects.requireNonNull(statusTopic, "statusTopic");
        Objects.requireNonNull(onlinePayload, "onlinePayload");
        Objects.requireNonNull(willPayload, "willPayload");
        Objects.requireNonNull(username, "username");
        Objects.requireNonNull(password, "password");
        Objects.requireNonNull(connectTimeout, "connectTimeout");
        Objects.requireNonNull(keepAlive, "keepAlive");
        checkUri(serverUri);
        if (clientId.isBlank()) {
            throw new IllegalArgumentException("MQTT client id must not be blank");
        }
        MqttTopicValidator.validate(statusTopic, false, true);
        if (maxInFlight < 1 || maxInFlight > 65535) {
            throw new IllegalArgumentException("maxInFlight must be between 1 and 65535, got " + maxInFlight);
        }
        if (queueCapacity < 1) {
            throw new IllegalArgumentException("queueCapacity must be at least 1, got " + queueCapacity);
        }
        if (connectTimeout.toSeconds() < 1) {
            throw new IllegalArgumentException("connectTimeout must be at least 1 s (Paho counts whole seconds), got "
                    + connectTimeout);
        }
        if (keepAlive.toSeconds() < 1) {
            throw new IllegalArgumentException("keepAlive must be at least 1 s, got " + keepAlive);
        }
        new Backoff(minRetryDelay, maxRetryDelay);
        onlinePayload = onlinePayload.clone();
        willPayload = willPayload.clone();
    }

    /**
     * Settings with defaults: 32 publishes in flight, 10 000 queued, 10 s connect timeout, 30 s keep-alive,
     * retries from 0.5 s doubling to 30 s.
     */
    public static MqttLinkSettings of(String serverUri, String clientId, String statusTopic,
                                      String onlinePayload, String willPayload) {
        return new MqttLinkSettings(serverUri, clientId, statusTopic,
                onlinePayload.getBytes(StandardCharsets.UTF_8), willPayload.getBytes(StandardCharsets.UTF_8),
                Optional.empty(), Optional.empty(), 32, 10_000,
                Duration.ofSeconds(10), Duration.ofSeconds(30), Duration.ofMillis(500), Duration.ofSeconds(30),
                LinkTls.defaults());
    }

    public MqttLinkSettings withCredentials(String user, String secret) {
        return new MqttLinkSettings(serverUri, clientId, statusTopic, onlinePayload, willPayload,
                Optional.of(user), Optional.of(secret), maxInFlight, queueCapacity,
                connectTimeout, keepAlive, minRetryDelay, maxRetryDelay, tls);
    }

    public MqttLinkSettings withWindow(int inFlight, int queued) {
        return new MqttLinkSettings(serverUri, clientId, statusTopic, onlinePayload, willPayload,
                username, password, inFlight, queued, connectTimeout, keepAlive, minRetryDelay, maxRetryDelay, tls);
    }

    public MqttLinkSettings withRetryDelays(Duration min, Duration max) {
        return new MqttLinkSettings(serverUri, clientId, statusTopic, onlinePayload, willPayload,
                username, password, maxInFlight, queueCapacity, connectTimeout, keepAlive, min, max, tls);
    }

    public MqttLinkSettings withTimeouts(Duration connect, Duration keepAliveInterval) {
        return new MqttLinkSettings(serverUri, clientId, statusTopic, onlinePayload, willPayload,
                username, password, maxInFlight, queueCapacity, connect, keepAliveInterval, minRetryDelay, maxRetryDelay, tls);
    }

    /** TLS certificates for an {@code ssl://} or {@code mqtts://} broker. */
    public MqttLinkSettings withTls(LinkTls certificates) {
        return new MqttLinkSettings(serverUri, clientId, statusTopic, onlinePayload, willPayload,
                username, password, maxInFlight, queueCapacity, connectTimeout, keepAlive, minRetryDelay,
                maxRetryDelay, certificates);
    }

    /** Whether the link speaks TLS. */
    public boolean secure() {
        return !serverUri.startsWith("tcp:");
    }

    /** The address in the form Paho takes ({@code mqtts} becomes {@code ssl}). */
    String pahoUri() {
        return serverUri.startsWith("mqtts:") ? "ssl:" + serverUri.substring("mqtts:".length()) : serverUri;
    }

    @Override
    public byte[] onlinePayload() {
        return onlinePayload.clone();
    }

    @Override
    public byte[] willPayload() {
        return willPayload.clone();
    }

    Backoff backoff() {
        return new Backoff(minRetryDelay, maxRetryDelay);
    }

    @Override
    public String toString() {
        return "MqttLinkSettings[" + serverUri + ", client " + clientId + ", status " + statusTopic
                + username.map(u -> ", user " + u).orElse("") + (password.isPresent() ? ", password set" : "")
                + (secure() ? ", TLS" + tls.caFile().map(f -> " CA " + f).orElse("")
                        + tls.clientCert().map(f -> " client " + f).orElse("") : "")
                + ", " + maxInFlight + " in flight, " + queueCapacity + " queued]";
    }

    private static void checkUri(String serverUri) {
        URI uri;
        try {
            uri = new URI(serverUri);
        } catch (URISyntaxException e) {
            throw new IllegalArgumentException("MQTT broker address is not a URI: " + serverUri
                    + " (expected tcp://HOST:PORT, or ssl://HOST:PORT for TLS)", e);
        }
        if (!List.of("tcp", "ssl", "mqtts").contains(String.valueOf(uri.getScheme())) || uri.getHost() == null) {
            throw new IllegalArgumentException("MQTT broker address must look like tcp://HOST:PORT, or ssl://HOST:PORT"
                    + " or mqtts://HOST:PORT for TLS, got " + serverUri);
        }
    }
}
