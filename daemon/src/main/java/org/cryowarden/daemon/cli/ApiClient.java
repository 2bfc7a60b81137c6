package org.cryowarden.daemon.cli;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Duration;
import java.util.Optional;
import org.cryowarden.daemon.run.Payloads;
import picocli.CommandLine.Option;

/** The options and the HTTP calls the client commands share: where the daemon's API is and the token. */
final class ApiClient {

    @Option(names = "--api", paramLabel = "URL", defaultValue = "http://127.0.0.1:8741",
            description = "the daemon's HTTP API (default ${DEFAULT-VALUE})")
    String api;

    @Option(names = "--token-file", paramLabel = "FILE", description = "the API token, for commands that change state")
    Path tokenFile;

    @Option(names = "--json", description = "print the daemon's JSON instead of a table")
    boolean json;

    /** The daemon's answer: status code and JSON body. */
    record Answer(int status, JsonNode body) {
    }

    Answer get(String path) throws IOException, InterruptedException {
        return send(HttpRequest.newBuilder(URI.create(api + path)).GET());
    }

    Answer post(String path, String body) throws IOException, InterruptedException {
        HttpRequest.Builder request = HttpRequest.newBuilder(URI.create(api + path))
                .header("Content-Type", "application/json")
                .POST(HttpRequest.BodyPublishers.ofString(body));
        token().ifPresent(t -> request.header("Authorization", "Bearer " + t));
        return send(request);
    }

    private Optional<String> token() throws IOException {
        if (tokenFile == null) {
            return Optional.empty();
        }
        return Optional.of(Files.readString(tokenFile).strip());
    }

    private Answer send(HttpRequest.Builder request) throws IOException, InterruptedException {
        HttpClient client = HttpClient.newBuilder().connectTimeout(Duration.ofSeconds(3)).build();
        try {
            HttpResponse<String> response = client.send(request.timeout(Duration.ofSeconds(15)).build(),
                    HttpResponse.BodyHandlers.ofString());
            return new Answer(response.statusCode(), Payloads.JSON.readTree(response.body()));
        } catch (java.net.ConnectException e) {
            throw new IOException("no cryowarden daemon answers at " + api + "; is `cryowarden run` running, and is"
                    + " this its api port?", e);
        }
    }
}
