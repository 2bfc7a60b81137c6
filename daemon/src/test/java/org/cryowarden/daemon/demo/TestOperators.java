package org.cryowarden.daemon.demo;

import java.net.URI;
import java.net.http.HttpClient;
import java.net.http.HttpRequest;
import java.net.http.HttpResponse;
import java.util.List;
import java.util.Optional;
import org.cryowarden.daemon.access.OperatorRoster;
import org.cryowarden.daemon.access.OperatorRoster.Operator;
import org.cryowarden.daemon.access.Role;
import org.cryowarden.daemon.access.TokenHash;
import org.cryowarden.daemon.api.ApiServer;

/**
 * One operator of each role with a fresh HTTP token, for the tests of the command paths (every command is
 * checked against a roster; a site without one refuses them all): {@code alan} viewer, {@code ada} operator,
 * {@code grace} supervisor. Start a night with them by {@code Night.start(..., s -> s.withOperators(roster()))}.
 */
final class TestOperators {

    static final String VIEWER = "alan";
    static final String OPERATOR = "ada";
    static final String SUPERVISOR = "grace";

    final String viewerToken = TokenHash.newToken();
    final String operatorToken = TokenHash.newToken();
    final String supervisorToken = TokenHash.newToken();

    OperatorRoster roster() {
        return OperatorRoster.of(List.of(
                new Operator(VIEWER, Role.VIEWER, Optional.of(TokenHash.of(viewerToken))),
                new Operator(OPERATOR, Role.OPERATOR, Optional.of(TokenHash.of(operatorToken))),
                new Operator(SUPERVISOR, Role.SUPERVISOR, Optional.of(TokenHash.of(supervisorToken)))));
    }

    List<String> tokens() {
        return List.of(viewerToken, operatorToken, supervisorToken);
    }

    /** Posts a command with {@code token} while the night steps: in driven mode the engine answers at a step. */
    static HttpResponse<String> post(Night night, ApiServer api, String token, String verb, String body)
            throws Exception {
        HttpRequest request = HttpRequest.newBuilder(URI.create("http://127.0.0.1:" + api.port() + "/api/commands/"
                        + verb)).header("Authorization", "Bearer " + token)
                .POST(HttpRequest.BodyPublishers.ofString(body)).build();
        var response = HttpClient.newHttpClient().sendAsync(request, HttpResponse.BodyHandlers.ofString());
        night.stepUntil(response::isDone, 200);
        return response.get();
    }
}
