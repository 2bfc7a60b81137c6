package org.cryowarden.daemon.notify.builtin;

import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.time.Duration;
import org.cryowarden.daemon.notify.spi.Delivery;
import org.cryowarden.daemon.notify.spi.Notice;
import org.cryowarden.daemon.notify.spi.Notifier;

/**
 * One webhook sender: a POST per notice with the JDK's HTTP client. Any 2xx answer is a delivery; anything else
 * (refused connection, timeout, 4xx, 5xx) is a failure the host retries. The notice id travels in the body and in
 * {@code X-Cryowarden-Notice} so a receiver can drop repeats without parsing.
 */
final class WebhookNotifier implements Notifier {

    static final String ID_HEADER = "X-Cryowarden-Notice";

    record Target(URI url, byte[] secret, Duration timeout) {
    }

    private final HttpClient client;
    private final Target target;

    WebhookNotifier(HttpClient client, Target target) {
        this.client = client;
        this.target = target;
    }

    @Override
    public Delivery deliver(Notice notice) {
        byte[] body = Signature.utf8(notice.json());
        HttpRequest request = HttpRequest.newBuilder(target.url())
                .timeout(target.timeout())
                .header("Content-Type", "application/json")
                .header(Signature.HEADER, Signature.header(target.secret(), body))
                .header(ID_HEADER, notice.id())
                .POST(HttpRequest.BodyPublishers.ofByteArray(body))
                .build();
        try {
            HttpResponse<Void> response = client.send(request, HttpResponse.BodyHandlers.discarding());
            int status = response.statusCode();
            return status / 100 == 2 ? Delivery.delivered("HTTP " + status)
                    : Delivery.failed("HTTP " + status + " from " + target.url());
        } catch (IOException e) {
            return Delivery.failed(e.getClass().getSimpleName() + " posting to " + target.url()
                    + (e.getMessage() == null ? "" : ": " + e.getMessage()));
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
            return Delivery.failed("interrupted while posting to " + target.url());
        }
    }
}
