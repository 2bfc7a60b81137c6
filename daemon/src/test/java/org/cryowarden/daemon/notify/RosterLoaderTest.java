package org.cryowarden.daemon.notify;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Path;
import java.time.Instant;
import java.util.Map;
import org.cryowarden.daemon.notify.builtin.MailNotifierFactory;
import org.cryowarden.daemon.notify.builtin.WebhookNotifierFactory;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.model.Priority;
import org.junit.jupiter.api.Test;

class RosterLoaderTest {

    private static final Map<String, String> SENDERS = Map.of("pager-hook", "webhook", "lab-mail", "email");

    @Test
    void exampleRosterLoadsAndPutsTheNightShiftOnCall() throws Exception {
        Roster roster = RosterLoader.load(Path.of("../config-examples/harbour-hall-roster.yaml"), SENDERS);
        // 2025-11-13 is a Thursday; 22:00 in Zurich (UTC+1 in November) is inside Ines's 18:00-08:00 shift.
        assertThat(roster.onCall(Instant.parse("2025-11-13T21:00:00Z"))).containsExactly("ines");
        // Saturday 02:00 local belongs to Friday's shift (a shift past midnight belongs to its first day).
        assertThat(roster.onCall(Instant.parse("2025-11-15T01:00:00Z"))).containsExactly("tomas");
        // Thursday noon: nobody's shift, so the schedule's otherwise group.
        assertThat(roster.onCall(Instant.parse("2025-11-13T11:00:00Z"))).containsExactly("cryo-team");
        assertThat(roster.policies().get(Priority.CRITICAL).repeats()).isEqualTo(2);
        assertThat(roster.policies()).doesNotContainKey(Priority.LOW);
    }

    @Test
    void mistakesAreReportedWithFileLineAndColumn() {
        String text = """
                time_zone: Europe/Zurich
                contacts:
                  - id: ines
                    reach:
                      - {sender: pager-hok}
                  - id: tomas
                    rech: []
                escalation:
                  critical:
                    steps:
                      - notify: [on-call]
                      - {after: soon, notify: [tomass]}
                """;
        assertThatThrownBy(() -> RosterLoader.load(text, "lab-roster.yaml", SENDERS))
                .isInstanceOf(ConfigException.class)
                .extracting(e -> ((ConfigException) e).problems().stream().map(Object::toString).toList())
                .asList().containsExactly(
                        "lab-roster.yaml:5:18: sender 'pager-hok' is not defined in the site's notifiers section;"
                                + " did you mean 'pager-hook'?",
                        "lab-roster.yaml:6:5: missing key 'reach' in contact 'tomas'",
                        "lab-roster.yaml:7:5: unknown key 'rech' in contact 'tomas'; did you mean 'reach'?",
                        "lab-roster.yaml:12:17: after in step 2 of the critical escalation: " + durationError("soon"),
                        "lab-roster.yaml:12:32: Step 2 of the critical escalation names 'tomass', which is no"
                                + " contact or group of the roster; did you mean 'tomas'?");
    }

    @Test
    void builtInNotifiersAreFoundLikePlugins() {
        NotifierCatalog catalog = NotifierCatalog.builtIn();
        assertThat(catalog.kinds()).containsExactly("email", "webhook");
        assertThat(catalog.kind("webhook").orElseThrow()).isInstanceOf(WebhookNotifierFactory.class);
        assertThat(catalog.kind("email").orElseThrow()).isInstanceOf(MailNotifierFactory.class);
    }

    private static String durationError(String text) {
        try {
            org.cryowarden.rules.DurationSyntax.parse(text);
            throw new AssertionError("'" + text + "' parsed");
        } catch (IllegalArgumentException e) {
            return e.getMessage();
        }
    }
}
