package org.cryowarden.daemon.notify;

import static org.assertj.core.api.Assertions.assertThat;

import com.fasterxml.jackson.databind.JsonNode;
import com.icegreen.greenmail.junit5.GreenMailExtension;
import com.icegreen.greenmail.util.ServerSetupTest;
import jakarta.mail.internet.MimeMessage;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.time.Duration;
import java.time.Instant;
import java.util.ArrayList;
import java.util.HexFormat;
import java.util.List;
import java.util.Optional;
import javax.crypto.Mac;
import javax.crypto.spec.SecretKeySpec;
import org.cryowarden.daemon.journal.ImmutableFiles;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.extension.RegisterExtension;
import org.junit.jupiter.api.io.TempDir;

class NightEscalationTest {

    @RegisterExtension
    static GreenMailExtension smtp = new GreenMailExtension(ServerSetupTest.SMTP);

    @TempDir
    Path folder;

    private static final String ROSTER = """
            time_zone: UTC
            contacts:
              - id: ines
                name: Ines Okafor
                reach:
                  - {sender: pager-hook}
                  - {sender: lab-mail, to: ines.okafor@harbour-hall.example}
              - id: tomas
                name: Tomas Reyes
                reach:
                  - {sender: pager-hook}
                  - {sender: lab-mail, to: tomas.reyes@harbour-hall.example}
            groups:
              cryo-team: [ines, tomas]
            schedule:
              shifts:
                - {days: [mon, tue, wed, thu, fri, sat, sun], from: "18:00", to: "08:00", on_call: [ines]}
              otherwise: [cryo-team]
            escalation:
              critical:
                steps:
                  - notify: [on-call]
                  - {after: 10min, notify: [tomas]}
                repeat: {every: 15min, times: 1}
              high:
                steps:
                  - notify: [on-call]
              flood:
                notify: [cryo-team]
            pacing: 1min
            """;

    @Test
    void secondContactIsToldWhenTheFirstDoesNotAcknowledgeAndTheFirstLearnsWhoTookIt() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, ROSTER, receiver.url(),
                        Optional.of(smtp.getSmtp().getPort()))) {
            // 22:00 UTC on a Friday: the schedule's night shift (18:00-08:00) puts ines on call.
            night.raise("o2-east-low", "critical", "oxygen 18.9 %vol below 19.5 %vol");
            night.pass(Duration.ofMinutes(14), Duration.ofSeconds(10));
            night.acknowledge("o2-east-low", "critical", "Tomas Reyes");
            night.pass(Duration.ofMinutes(30), Duration.ofSeconds(10));

            assertThat(calls(receiver)).containsExactly(
                    "a100.s1.ines ines alarm",     // at once: the on-call contact
                    "a100.s2.tomas tomas alarm",   // 10 min without acknowledgement: the second step
                    "a100.taken.ines ines taken"); // Tomas took it: Ines is told, the reminder never goes
            List<String> mails = new ArrayList<>();
            for (MimeMessage mail : smtp.getReceivedMessages()) {
                mails.add(mail.getAllRecipients()[0] + " | " + mail.getSubject());
            }
            assertThat(mails).containsExactlyInAnyOrder(
                    "ines.okafor@harbour-hall.example | [cryowarden harbour-hall] CRITICAL o2-east-low: oxygen"
                            + " 18.9 %vol below 19.5 %vol",
                    "tomas.reyes@harbour-hall.example | [cryowarden harbour-hall] CRITICAL o2-east-low: oxygen"
                            + " 18.9 %vol below 19.5 %vol (not acknowledged 10min after it was raised)",
                    "ines.okafor@harbour-hall.example | [cryowarden harbour-hall] o2-east-low acknowledged by"
                            + " Tomas Reyes");
            assertThat(smtp.getReceivedMessages()[0].getHeader("Message-ID")[0]).isEqualTo("<a100.s1.ines@cryowarden>");
            assertThat(night.sent()).filteredOn(s -> s.startsWith("lab-mail")).containsExactly(
                    "lab-mail a100.s1.ines", "lab-mail a100.s2.tomas", "lab-mail a100.taken.ines");
            assertThat(night.sent()).hasSize(6);
        }
    }

    @Test
    void noticesQueuedWhileTheReceiverIsDownArriveInOrderAfterItComesBackAndSurviveARestart() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, ROSTER.replace("pacing: 1min", "pacing: 0s"),
                        receiver.url(), Optional.empty())) {
            receiver.down.set(true);
            night.raise("n2-trap-low", "high", "cold trap level 12 % below 20 %");
            night.pass(Duration.ofMinutes(20), Duration.ofSeconds(5));
            night.raise("lhe-dewar-2-low", "high", "helium level 9 % below 10 %");
            night.pass(Duration.ofMinutes(10), Duration.ofSeconds(5));
            night.restart(); // the daemon restarts while the receiver is still down
            night.pass(Duration.ofMinutes(10), Duration.ofSeconds(5));
            night.raise("cryostat-b-vacuum", "high", "insulating vacuum 2e-3 mbar above 1e-4 mbar");
            night.pass(Duration.ofMinutes(20), Duration.ofSeconds(5));
            assertThat(receiver.calls()).isEmpty();
            receiver.down.set(false); // an hour after the first notice
            night.pass(Duration.ofMinutes(15), Duration.ofSeconds(5));

            List<String> ids = receiver.calls().stream().map(WebhookReceiver.Call::id).toList();
            assertThat(ids).containsExactly("a100.s1.ines", "a101.s1.ines", "a102.s1.ines");
            assertThat(receiver.refused()).isGreaterThan(3);
            // Backoff doubles from 15 s to at most 10 min (common practice for retries), so the notices arrive
            // within one longest wait after the receiver is back.
            assertThat(night.service.depth("pager-hook")).isZero();
            assertThat(night.journalKinds()).filteredOn(k -> k.equals("notify.failed")).hasSizeGreaterThan(3);
            assertThat(night.journalKinds()).filteredOn(k -> k.equals("notify.sent")).hasSize(3);
        }
    }

    @Test
    void floodOfThirtyAlarmsInTwoMinutesSendsOneFloodNoticePerContact() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, ROSTER.replace("- notify: [on-call]\n  flood",
                        "- notify: [cryo-team]\n  flood"), receiver.url(), Optional.empty())) {
            Instant first = night.time.wallNow();
            for (int i = 1; i <= 30; i++) {
                night.raise(String.format("rack-%02d-temp-high", i), "high", "rack " + i + " temperature high");
                if (i == 11) {
                    // EEMUA 191: more than 10 alarms in 10 minutes is a flood; the engine says so at the 11th.
                    night.floodStarted(11, "rack-01-temp-high", first);
                }
                night.pass(Duration.ofSeconds(4), Duration.ofSeconds(1)); // 30 alarms in 2 minutes
            }
            night.pass(Duration.ofMinutes(20), Duration.ofSeconds(10));

            for (String contact : List.of("ines", "tomas")) {
                List<String> kinds = receiver.calls().stream().map(c -> json(c.text()))
                        .filter(j -> j.path("contact").asText().equals(contact))
                        .map(j -> j.path("kind").asText()).toList();
                // The first alarm pages at once (nobody knows a flood follows); the flood notice covers the rest.
                assertThat(kinds).as(contact).containsExactly("alarm", "flood");
            }
            JsonNode flood = receiver.calls().stream().map(c -> json(c.text()))
                    .filter(j -> j.path("kind").asText().equals("flood")).findFirst().orElseThrow();
            assertThat(flood.path("count").asInt()).isEqualTo(11);
            assertThat(flood.path("first_out").asText()).isEqualTo("rack-01-temp-high");
        }
    }

    @Test
    void quietHoursHoldNonCriticalNoticesUntilTheirEndButCriticalOnesGoAtOnce() throws Exception {
        String roster = ROSTER.replace("""
                      - {sender: lab-mail, to: ines.okafor@harbour-hall.example}
                """, """
                      - {sender: lab-mail, to: ines.okafor@harbour-hall.example}
                    quiet_hours: {from: "21:30", to: "06:30"}
                """);
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, roster, receiver.url(), Optional.empty())) {
            // 22:00 UTC: inside Ines's quiet hours (21:30-06:30, roster zone UTC).
            night.raise("ovc-vacuum-poor", "high", "insulating vacuum 2e-3 mbar above 1e-4 mbar");
            night.pass(Duration.ofMinutes(5), Duration.ofMinutes(1));
            assertThat(calls(receiver)).isEmpty();
            night.raise("o2-east-low", "critical", "oxygen 18.9 %vol below 19.5 %vol");
            assertThat(calls(receiver)).containsExactly("a101.s1.ines ines alarm");
            night.acknowledge("o2-east-low", "critical", "Ines Okafor");
            // Until 06:29 nothing more; at 06:30 the held high-priority page goes.
            night.pass(Duration.ofHours(8).plusMinutes(24), Duration.ofMinutes(1));
            assertThat(calls(receiver)).containsExactly("a101.s1.ines ines alarm");
            night.pass(Duration.ofMinutes(2), Duration.ofMinutes(1));
            assertThat(calls(receiver)).containsExactly("a101.s1.ines ines alarm", "a100.s1.ines ines alarm");
            assertThat(night.time.wallNow()).isAfterOrEqualTo(java.time.Instant.parse("2025-11-15T06:30:00Z"));
        }
    }

    @Test
    void unacknowledgedAlarmGoesToTheFallbackAfterItsRemindersAndThenStops() throws Exception {
        String roster = ROSTER.replace("""
                      - {after: 10min, notify: [tomas]}
                    repeat: {every: 15min, times: 1}
                """, """
                    repeat: {every: 5min, times: 1}
                    fallback: {after: 5min, notify: [tomas]}
                """);
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, roster.replace("pacing: 1min", "pacing: 0s"),
                        receiver.url(), Optional.empty())) {
            night.raise("o2-east-low", "critical", "oxygen 18.9 %vol below 19.5 %vol");
            night.pass(Duration.ofMinutes(4), Duration.ofSeconds(10));
            assertThat(calls(receiver)).containsExactly("a100.s1.ines ines alarm");
            night.pass(Duration.ofMinutes(2), Duration.ofSeconds(10));
            assertThat(calls(receiver)).containsExactly("a100.s1.ines ines alarm", "a100.s2.ines ines reminder");
            night.pass(Duration.ofMinutes(5), Duration.ofSeconds(10));
            assertThat(calls(receiver)).containsExactly("a100.s1.ines ines alarm", "a100.s2.ines ines reminder",
                    "a100.s3.tomas tomas alarm");
            JsonNode fallback = json(receiver.calls().get(2).text());
            assertThat(fallback.path("reason").asText()).isEqualTo("fallback: nobody acknowledged in 10min");
            night.pass(Duration.ofHours(1), Duration.ofMinutes(1));
            assertThat(receiver.calls()).hasSize(3);
        }
    }

    @Test
    void escalationInProgressCarriesOnAfterARestart() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, ROSTER, receiver.url(), Optional.empty())) {
            night.recordEvents();
            night.raise("o2-east-low", "critical", "oxygen 18.9 %vol below 19.5 %vol");
            night.pass(Duration.ofMinutes(4), Duration.ofSeconds(10));
            night.restart(); // 22:04: the daemon restarts with the alarm still unacknowledged
            night.pass(Duration.ofMinutes(26), Duration.ofSeconds(10));

            // The roster's critical policy: on-call at once, tomas after 10 min, one reminder to both 15 min later.
            assertThat(calls(receiver)).containsExactly(
                    "a1.s1.ines ines alarm",
                    "a1.s2.tomas tomas alarm",
                    "a1.s3.ines ines reminder",
                    "a1.s3.tomas tomas reminder");
            assertThat(json(receiver.calls().get(1).text()).path("reason").asText())
                    .isEqualTo("not acknowledged 10min after it was raised");
        }
    }

    @Test
    void stepThatFellDueWhileTheDaemonWasDownGoesAtTheRestartAndTheFirstPageIsNotRepeated() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, ROSTER, receiver.url(), Optional.empty())) {
            night.recordEvents();
            night.raise("o2-east-low", "critical", "oxygen 18.9 %vol below 19.5 %vol");
            night.pass(Duration.ofMinutes(4), Duration.ofSeconds(10));
            night.time.advance(Duration.ofMinutes(8)); // down from 22:04 to 22:12, past the 22:10 step
            night.restart();
            night.pass(Duration.ofSeconds(10), Duration.ofSeconds(10));
            assertThat(calls(receiver)).containsExactly("a1.s1.ines ines alarm", "a1.s2.tomas tomas alarm");

            night.acknowledge("o2-east-low", "critical", "Tomas Reyes");
            night.pass(Duration.ofMinutes(30), Duration.ofSeconds(10));
            assertThat(calls(receiver)).containsExactly("a1.s1.ines ines alarm", "a1.s2.tomas tomas alarm",
                    "a1.taken.ines ines taken");
        }
    }

    @Test
    void alarmAcknowledgedBeforeARestartIsNotEscalatedAfterIt() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, ROSTER, receiver.url(), Optional.empty())) {
            night.recordEvents();
            night.raise("o2-east-low", "critical", "oxygen 18.9 %vol below 19.5 %vol");
            night.pass(Duration.ofMinutes(2), Duration.ofSeconds(10));
            night.acknowledge("o2-east-low", "critical", "Ines Okafor");
            night.pass(Duration.ofMinutes(1), Duration.ofSeconds(10));
            night.restart();
            night.pass(Duration.ofMinutes(40), Duration.ofSeconds(10));

            assertThat(calls(receiver)).containsExactly("a1.s1.ines ines alarm");
            assertThat(night.service.depth("pager-hook")).isZero();
        }
    }

    @Test
    void watchdogStallOfTheProcessThatDiedEndsAtTheRestartAndWhoeverWasPagedIsTold() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, ROSTER, receiver.url(), Optional.empty())) {
            night.recordEvents();
            night.stalled("engine", "the rule engine did not answer a probe for 30s");
            night.pass(Duration.ofMinutes(3), Duration.ofSeconds(10));
            night.restart();
            night.pass(Duration.ofMinutes(40), Duration.ofSeconds(10));

            assertThat(calls(receiver)).containsExactly("a1.s1.ines ines alarm", "a1.recovered.ines ines recovered");
        }
    }

    @Test
    void pagingGoesOnWhileTheJournalCannotWriteAndNothingIsSentTwice() throws Exception {
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, ROSTER, receiver.url(), Optional.empty());
                ImmutableFiles journalFiles = new ImmutableFiles()) {
            receiver.down.set(true);
            night.raise("n2-trap-low", "high", "cold trap level 12 % below 20 %");
            night.pass(Duration.ofSeconds(20), Duration.ofSeconds(5)); // queued in the journal, not yet delivered
            journalFiles.freeze(folder); // the journal turns read-only (chattr +i on its folder and files)
            receiver.down.set(false);
            night.raise("lhe-dewar-2-low", "high", "helium level 9 % below 10 %");
            night.pass(Duration.ofMinutes(3), Duration.ofSeconds(5));

            // In order: the notice queued before is delivered once although its delivery cannot be recorded, then
            // the new one, which the journal could not queue, from memory.
            assertThat(calls(receiver)).containsExactly("a100.s1.ines ines alarm", "a101.s1.ines ines alarm");
            journalFiles.close(); // writable again: the remembered delivery is recorded, nothing is resent
            night.pass(Duration.ofMinutes(3), Duration.ofSeconds(5));
            assertThat(calls(receiver)).containsExactly("a100.s1.ines ines alarm", "a101.s1.ines ines alarm");
            assertThat(night.service.depth("pager-hook")).isZero();
            assertThat(night.service.held("pager-hook")).isZero();
        }
    }

    @Test
    void signatureHeaderIsTheHmacSha256OfTheBody() throws Exception {
        // RFC 4231 section 4.3, test case 2: key "Jefe", data "what do ya want for nothing?".
        assertThat(hmacHex("Jefe".getBytes(StandardCharsets.US_ASCII),
                "what do ya want for nothing?".getBytes(StandardCharsets.US_ASCII)))
                .isEqualTo("5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843");
        try (WebhookReceiver receiver = new WebhookReceiver();
                NightHarness night = new NightHarness(folder, ROSTER, receiver.url(), Optional.empty())) {
            night.raise("o2-east-low", "critical", "oxygen 18.9 %vol below 19.5 %vol");
            WebhookReceiver.Call call = receiver.calls().get(0);
            assertThat(call.signature()).isEqualTo("sha256=" + hmacHex(
                    NightHarness.SECRET.getBytes(StandardCharsets.UTF_8), call.body()));
            assertThat(json(call.text()).path("id").asText()).isEqualTo(call.id());
        }
    }

    private static List<String> calls(WebhookReceiver receiver) {
        return receiver.calls().stream().map(c -> json(c.text())).map(j -> j.path("id").asText() + " "
                + j.path("contact").asText() + " " + j.path("kind").asText()).toList();
    }

    private static JsonNode json(String text) {
        try {
            return NightHarness.JSON.readTree(text);
        } catch (java.io.IOException e) {
            throw new AssertionError(e);
        }
    }

    private static String hmacHex(byte[] key, byte[] data) throws Exception {
        Mac mac = Mac.getInstance("HmacSHA256");
        mac.init(new SecretKeySpec(key, "HmacSHA256"));
        return HexFormat.of().formatHex(mac.doFinal(data));
    }
}
