package org.cryowarden.daemon.access;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Optional;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.config.SiteLoader;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.CsvSource;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class OperatorRosterTest {

    @TempDir
    Path folder;

    private final String adaToken = TokenHash.newToken();
    private final String graceToken = TokenHash.newToken();

    private OperatorRoster roster() {
        return OperatorRoster.of(List.of(
                new OperatorRoster.Operator("alan", Role.VIEWER, Optional.empty()),
                new OperatorRoster.Operator("ada", Role.OPERATOR, Optional.of(TokenHash.of(adaToken))),
                new OperatorRoster.Operator("grace", Role.SUPERVISOR, Optional.of(TokenHash.of(graceToken)))));
    }

    // The customer's access rule: acknowledge, shelve and unshelve need an operator; reset and bypass a supervisor;
    // a viewer gives no command.
    @ParameterizedTest(name = "{0} may {1}: {2}")
    @CsvSource({
        "alan, ack, false", "alan, shelve, false", "alan, unshelve, false", "alan, reset, false", "alan, bypass, false",
        "ada, ack, true", "ada, shelve, true", "ada, unshelve, true", "ada, reset, false", "ada, bypass, false",
        "grace, ack, true", "grace, shelve, true", "grace, unshelve, true", "grace, reset, true", "grace, bypass, true"
    })
    void eachRoleMayGiveOnlyItsCommands(String operator, String verb, boolean allowed) {
        assertThat(roster().refusal(verb, operator).isEmpty()).isEqualTo(allowed);
    }

    @Test
    void refusalSaysWhichRoleIsNeeded() {
        assertThat(roster().refusal("reset", "ada"))
                .contains("operator 'ada' has the role operator; reset needs a supervisor");
        assertThat(roster().refusal("ack", "alan")).contains("operator 'alan' has the role viewer; ack needs an operator or"
                + " supervisor");
        assertThat(roster().refusal("ack", "mallory")).contains("operator 'mallory' is not in the site file's"
                + " operators section");
    }

    @Test
    void siteWithoutOperatorsRefusesEveryCommandSayingHowToListThemAndKnowsNoToken() {
        // Fail closed (common practice): no roster, no command, whatever the verb or the name.
        for (String verb : List.of("ack", "shelve", "unshelve", "reset", "bypass")) {
            assertThat(OperatorRoster.none().refusal(verb, "ada")).hasValueSatisfying(reason -> assertThat(reason)
                    .startsWith("the site file has no operators section, so every command is refused;")
                    .contains("operators: {duty-1: {role: operator}}")
                    .contains("`cryowarden token new --operator ID --role R`"));
        }
        assertThat(OperatorRoster.none().configured()).isFalse();
        assertThat(OperatorRoster.none().identify(adaToken)).isEmpty();
    }

    @Test
    void tokenIdentifiesItsOperatorAndNoOther() {
        assertThat(roster().identify(adaToken)).map(OperatorRoster.Operator::id).contains("ada");
        assertThat(roster().identify(graceToken)).map(OperatorRoster.Operator::id).contains("grace");
        assertThat(roster().identify(adaToken + "x")).isEmpty();
        assertThat(roster().identify("")).isEmpty();
    }

    @Test
    void storedHashRoundTripsAndIsSha256() {
        // SHA-256("abc") from FIPS 180-2 appendix B.1: ba7816bf 8f01cfea 414140de 5dae2223 b00361a3 96177a9c b410ff61 f20015ad
        TokenHash abc = TokenHash.of("abc");
        assertThat(java.util.HexFormat.of().formatHex(abc.digest()))
                .isEqualTo("ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
        assertThat(TokenHash.parse(abc.text())).isEqualTo(abc);
        assertThat(TokenHash.newToken()).hasSize(43).isNotEqualTo(TokenHash.newToken());
    }

    @Test
    void siteFileSectionIsReadWithPositionedErrors() throws Exception {
        String hash = TokenHash.of(adaToken).text();
        Path site = site("""
                operators:
                  ada: {role: operator, token_hash: "%s"}
                  grace: {role: boss}
                  linus: {role: viewer, token_hash: "md5:abc"}
                """.formatted(hash));

        assertThatThrownBy(() -> OperatorRoster.read(SiteLoader.load(site)))
                .isInstanceOfSatisfying(ConfigException.class, e -> assertThat(e.problems())
                        .extracting(ConfigProblem::toString).containsExactly(
                                site + ":" + (offset + 3) + ":17: role of operator grace must be viewer, operator or"
                                        + " supervisor, got 'boss'",
                                site + ":" + (offset + 4) + ":37: operator linus: token hash must start with"
                                        + " 'sha256:' (make one with `cryowarden token new --operator NAME`)"));
    }

    @Test
    void validSectionGivesTheRoster() throws Exception {
        Path site = site("""
                operators:
                  ada: {role: operator, token_hash: "%s"}
                  grace: {role: supervisor}
                """.formatted(TokenHash.of(adaToken).text()));

        OperatorRoster roster = OperatorRoster.read(SiteLoader.load(site));

        assertThat(roster.identify(adaToken)).map(OperatorRoster.Operator::role).contains(Role.OPERATOR);
        assertThat(roster.refusal("bypass", "grace")).isEmpty();
        assertThat(roster.refusal("bypass", "ada")).isPresent();
    }

    private int offset;

    private Path site(String operators) throws Exception {
        String example = Files.readString(Path.of("../config-examples/harbour-hall-site.yaml"));
        String head = example.substring(0, example.indexOf("\nmqtt:") + 1);
        offset = (int) head.lines().count();
        return Files.writeString(folder.resolve("site.yaml"), head + operators);
    }
}
