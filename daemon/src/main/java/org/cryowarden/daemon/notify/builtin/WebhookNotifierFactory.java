package org.cryowarden.daemon.notify.builtin;

import java.net.URI;
import java.net.URISyntaxException;
import java.net.http.HttpClient;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Optional;
import org.cryowarden.daemon.notify.spi.Notifier;
import org.cryowarden.daemon.notify.spi.NotifierFactory;
import org.cryowarden.drivers.settings.SettingsReader;

/**
 * {@code kind: webhook}: POSTs each notice as JSON to {@code url}, signed with the secret in {@code secret_file}.
 * <pre>
 * - {id: pager-hook, kind: webhook, url: https://HOST/PATH, secret_file: FILE, timeout: 10s}
 * </pre>
 */
public final class WebhookNotifierFactory implements NotifierFactory {

    static final Duration DEFAULT_TIMEOUT = Duration.ofSeconds(10);

    @Override
    public String kind() {
        return "webhook";
    }

    @Override
    public String description() {
        return "HTTP POST of a JSON notice, HMAC-SHA256 signed (" + Signature.HEADER + ")";
    }

    @Override
    public void validate(SettingsReader settings, Path folder) {
        read(settings, folder);
    }

    @Override
    public Notifier create(String senderId, SettingsReader settings, Path folder) {
        Optional<WebhookNotifier.Target> target = read(settings, folder);
        if (target.isEmpty()) {
            throw new IllegalArgumentException("sender " + senderId + " did not validate: " + settings.problems());
        }
        HttpClient client = HttpClient.newBuilder().connectTimeout(target.get().timeout())
                .followRedirects(HttpClient.Redirect.NEVER).build();
        return new WebhookNotifier(client, target.get());
    }

    private static Optional<WebhookNotifier.Target> read(SettingsReader settings, Path folder) {
        settings.allowOnly("url", "secret_file", "timeout");
        Optional<URI> url = settings.text("url", true).flatMap(text -> {
            try {
                URI uri = new URI(text.strip());
                if (!("http".equals(uri.getScheme()) || "https".equals(uri.getScheme())) || uri.getHost() == null) {
                    throw new URISyntaxException(text, "not an http:// or https:// address with a host");
                }
                return Optional.of(uri);
            } catch (URISyntaxException e) {
                settings.problem(settings.position("url"), "url must be an http:// or https:// address, got '"
                        + text + "'");
                return Optional.empty();
            }
        });
        Optional<String> secret = SecretFile.read(settings, "secret_file", folder, true);
        Duration timeout = settings.duration("timeout", Duration.ofMillis(100), Duration.ofMinutes(1), false)
                .orElse(DEFAULT_TIMEOUT);
        if (url.isEmpty() || secret.isEmpty() || !settings.problems().isEmpty()) {
            return Optional.empty();
        }
        return Optional.of(new WebhookNotifier.Target(url.get(), Signature.utf8(secret.get()), timeout));
    }
}
