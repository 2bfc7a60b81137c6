package org.cryowarden.daemon.demo;

import static org.assertj.core.api.Assertions.assertThat;

import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.read.ListAppender;
import java.net.http.HttpResponse;
import java.nio.charset.StandardCharsets;
import java.util.List;
import java.util.Map;
import java.util.TreeMap;
import org.cryowarden.daemon.access.OperatorRoster;
import org.cryowarden.daemon.access.TokenHash;
import org.cryowarden.daemon.api.ApiServer;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.run.Payloads;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.slf4j.LoggerFactory;

/**
 * Roles checked on both command paths of a running daemon (the machine's Mosquitto, the HTTP API): each refusal is
 * replied to and journaled with its reason, and no token appears in the log or the journal.
 */
class OperatorRolesOnMosquittoTest {

    @TempDir
    java.nio.file.Path folder;

    @BeforeAll
    static void mosquittoRuns() throws Exception {
        Night.mosquittoRuns();
    }

    private final TestOperators operators = new TestOperators();
    private final String alanToken = operators.viewerToken;
    private final String adaToken = operators.operatorToken;
    private final String graceToken = operators.supervisorToken;

    @Test
    void commandsBeyondTheOperatorsRoleAreRefusedAndJournaledOnBothPaths() throws Exception {
        OperatorRoster roster = operators.roster();
        ListAppender<ILoggingEvent> logged = new ListAppender<>();
        Logger root = (Logger) LoggerFactory.getLogger(org.slf4j.Logger.ROOT_LOGGER_NAME);
        logged.start();
        root.addAppender(logged);
        try (Night night = Night.start(folder, Night.MOSQUITTO, false, s -> s.withOperators(roster));
             Subscriber console = new Subscriber(Night.MOSQUITTO, night.prefix + "/replies/#")) {
            night.stepUntil(night.daemon::acceptingCommands, 100);
            String replies = night.prefix + "/replies/console";
            console.request(night.prefix + "/command/ack", "{\"target\": \"o2-magnet-hall-low\", \"operator\":"
                    + " \"alan\"}", replies, "viewer-ack");
            console.request(night.prefix + "/command/reset", "{\"target\": \"magnet-hall-ventilation\", \"operator\":"
                    + " \"ada\"}", replies, "operator-reset");
            console.request(night.prefix + "/command/ack", "{\"target\": \"o2-magnet-hall-low\", \"operator\":"
                    + " \"mallory\"}", replies, "stranger-ack");
            console.request(night.prefix + "/command/reset", "{\"target\": \"magnet-hall-ventilation\", \"operator\":"
                    + " \"grace\"}", replies, "supervisor-reset");
            night.stepUntil(() -> console.on(replies).size() >= 4, 200, () -> console.received.toString());
            Map<String, String> answers = new TreeMap<>();
            for (Subscriber.Message reply : console.on(replies)) {
                answers.put(new String(reply.correlation(), StandardCharsets.UTF_8),
                        Payloads.JSON.readTree(reply.text()).path("error").asText());
            }
            assertThat(answers).containsEntry("viewer-ack", "operator 'alan' has the role viewer; ack needs an"
                    + " operator or supervisor")
                    .containsEntry("operator-reset", "operator 'ada' has the role operator; reset needs a supervisor")
                    .containsEntry("stranger-ack", "operator 'mallory' is not in the site file's operators section");
            // The supervisor passes the role check; the engine then judges the state (nothing latched to reset).
            assertThat(answers.get("supervisor-reset")).doesNotContain("role", "operators section");

            try (ApiServer api = ApiServer.start(night.daemon, 0)) {
                HttpResponse<String> impostor = TestOperators.post(night, api, adaToken, "ack",
                        "{\"target\": \"o2-magnet-hall-low\", \"operator\": \"grace\"}");
                assertThat(impostor.statusCode()).isEqualTo(403);
                assertThat(impostor.body()).contains("the command names operator 'grace' but the token is ada's");
                HttpResponse<String> operatorBypass = TestOperators.post(night, api, adaToken, "bypass",
                        "{\"target\": \"magnet-hall-ventilation\", \"operator\": \"ada\", \"duration\": \"1h\","
                                + " \"reason\": \"fan service\"}");
                assertThat(operatorBypass.statusCode()).isEqualTo(409);
                assertThat(operatorBypass.body()).contains("operator 'ada' has the role operator; bypass needs a"
                        + " supervisor");
                HttpResponse<String> viewerShelve = TestOperators.post(night, api, alanToken, "shelve",
                        "{\"target\": \"o2-magnet-hall-low\", \"operator\": \"alan\", \"duration\": \"1h\","
                                + " \"reason\": \"sensor swap\"}");
                assertThat(viewerShelve.statusCode()).isEqualTo(409);
                HttpResponse<String> unknownToken = TestOperators.post(night, api, TokenHash.newToken(), "ack",
                        "{\"target\": \"o2-magnet-hall-low\", \"operator\": \"ada\"}");
                assertThat(unknownToken.statusCode()).isEqualTo(401);
                HttpResponse<String> supervisorShelve = TestOperators.post(night, api, graceToken, "shelve",
                        "{\"target\": \"o2-magnet-hall-low\", \"operator\": \"grace\", \"duration\": \"1h\","
                                + " \"reason\": \"sensor swap\"}");
                assertThat(supervisorShelve.body()).doesNotContain("role", "token");
                night.steps(2);
                night.daemon.awaitQuiet(java.time.Duration.ofSeconds(5));
            }

            List<JournalEvent> events = night.daemon.eventsAfter(0, 5000);
            assertThat(events).filteredOn(e -> e.kind().equals("command.refused"))
                    .extracting(e -> Payloads.JSON.readTree(e.payloadJson()).path("reason").asText())
                    .contains("operator 'alan' has the role viewer; ack needs an operator or supervisor",
                            "operator 'ada' has the role operator; reset needs a supervisor",
                            "operator 'mallory' is not in the site file's operators section",
                            "the command names operator 'grace' but the token is ada's",
                            "operator 'ada' has the role operator; bypass needs a supervisor",
                            "operator 'alan' has the role viewer; shelve needs an operator or supervisor");
            for (String secret : List.of(alanToken, adaToken, graceToken)) {
                assertThat(events).noneMatch(e -> e.payloadJson().contains(secret));
                assertThat(logged.list).noneMatch(e -> e.getFormattedMessage().contains(secret));
            }
            assertThat(logged.list).isNotEmpty();
        } finally {
            root.detachAppender(logged);
        }
    }

    @Test
    void everyCommandIsRefusedAndJournaledOnBothPathsWhenTheSiteListsNoOperators() throws Exception {
        try (Night night = Night.start(folder, Night.MOSQUITTO, false, s -> s.withOperators(OperatorRoster.none()));
             Subscriber console = new Subscriber(Night.MOSQUITTO, night.prefix + "/replies/#")) {
            night.stepUntil(night.daemon::acceptingCommands, 100);
            String replies = night.prefix + "/replies/console";
            console.request(night.prefix + "/command/ack", "{\"target\": \"o2-magnet-hall-low\", \"operator\":"
                    + " \"duty-1\"}", replies, "ack");
            console.request(night.prefix + "/command/reset", "{\"target\": \"magnet-hall-ventilation\","
                    + " \"operator\": \"lab-lead\"}", replies, "reset");
            night.stepUntil(() -> console.on(replies).size() >= 2, 200, () -> console.received.toString());
            for (Subscriber.Message reply : console.on(replies)) {
                assertThat(Payloads.JSON.readTree(reply.text()).path("error").asText())
                        .as(new String(reply.correlation(), StandardCharsets.UTF_8))
                        .isEqualTo(OperatorRoster.NO_OPERATORS);
            }
            try (ApiServer api = ApiServer.start(night.daemon, 0)) {
                // Whatever token comes with it: there is no one it could belong to.
                HttpResponse<String> ack = TestOperators.post(night, api, adaToken, "ack",
                        "{\"target\": \"o2-magnet-hall-low\", \"operator\": \"duty-1\"}");
                assertThat(ack.statusCode()).isEqualTo(403);
                assertThat(Payloads.JSON.readTree(ack.body()).path("error").asText())
                        .isEqualTo(OperatorRoster.NO_OPERATORS);
                night.steps(2);
                night.daemon.awaitQuiet(java.time.Duration.ofSeconds(5));
            }
            List<JournalEvent> events = night.daemon.eventsAfter(0, 5000);
            assertThat(events).filteredOn(e -> e.kind().equals("command.refused"))
                    .extracting(e -> Payloads.JSON.readTree(e.payloadJson()).path("via").asText() + " "
                            + Payloads.JSON.readTree(e.payloadJson()).path("verb").asText() + " by "
                            + e.operator().orElse("-") + ": "
                            + Payloads.JSON.readTree(e.payloadJson()).path("reason").asText())
                    .containsExactlyInAnyOrder("mqtt ack by duty-1: " + OperatorRoster.NO_OPERATORS,
                            "mqtt reset by lab-lead: " + OperatorRoster.NO_OPERATORS,
                            "http ack by duty-1: " + OperatorRoster.NO_OPERATORS);
            assertThat(events).noneMatch(e -> e.kind().equals("alarm.acknowledged")
                    || e.kind().equals("interlock.reset"));
        }
    }
}
