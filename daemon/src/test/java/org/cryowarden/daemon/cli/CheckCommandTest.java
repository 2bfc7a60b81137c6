package org.cryowarden.daemon.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

class CheckCommandTest {

    private static final String SITE = "../config-examples/harbour-hall-site.yaml";
    private static final String RULES = "../config-examples/harbour-hall-rules.yaml";

    @TempDir
    Path folder;

    private final StringWriter out = new StringWriter();
    private final StringWriter err = new StringWriter();

    @Test
    void validExampleExitsZeroWithAOneLineSummary() {
        int exit = run("check", "--site", SITE, "--rules", RULES);

        assertThat(exit).isEqualTo(0);
        // 20 rules plus the two helium forecast rules of the example rule set (he-dewar-1-empty-by-morning,
        // he-dewar-1-nearly-empty); the interlock is counted on its own.
        assertThat(out.toString()).isEqualTo("valid: site 'Harbour Hall low-temperature lab': 17 channels "
                + "(12 measured, 5 derived), 3 outputs, 22 rules, 1 interlock from 1 rule file; 3 buses, "
                + "5 instruments" + System.lineSeparator());
        assertThat(err.toString()).isEmpty();
    }

    @Test
    void siteWithoutOperatorsIsValidButWarnsThatEveryCommandWillBeRefused() throws IOException {
        Path site = folder.resolve("harbour-hall-site.yaml");
        String text = Files.readString(Path.of(SITE));
        Files.writeString(site, text.replaceFirst("(?m)^operators:\\n(?:  .*\\n?)+", ""));

        int exit = run("check", "--site", site.toString(), "--rules", RULES);

        assertThat(exit).isEqualTo(0);
        assertThat(out.toString()).startsWith("valid: site 'Harbour Hall low-temperature lab'");
        assertThat(err.toString().lines()).containsExactly("warning: the site file has no operators section, so"
                + " every command is refused; list who may command there (e.g. operators: {duty-1: {role:"
                + " operator}}) and make each one's HTTP token with `cryowarden token new --operator ID --role R`");
    }

    @Test
    void invalidFilesExitTwoWithEveryErrorOnStderr() throws IOException {
        Path rules = folder.resolve("night-rules.yaml");
        Files.writeString(rules, "rules:\n"
                + "  - id: o2-low\n"
                + "    limit: {channel: o2-magnet-hall-est, below: 19.5 %vol}\n"
                + "    priority: critical\n"
                + "    message: Oxygen low\n"
                + "    on_delay: soon\n");

        int exit = run("check", "--site", SITE, "--rules", rules.toString());

        assertThat(exit).isEqualTo(2);
        assertThat(out.toString()).isEmpty();
        assertThat(err.toString().lines()).containsExactly(
                rules + ":3:22: unknown channel 'o2-magnet-hall-est' in rule 'o2-low': no such channel in " + SITE
                        + "; did you mean 'o2-magnet-hall-east'?",
                rules + ":6:15: 'on_delay' in rule 'o2-low': 'soon' is not a duration: expected a number and one of "
                        + "ms, s, min, h, d, e.g. 30s, 5min, 2h or 1h30min",
                "2 errors found; nothing was started");
    }

    @Test
    void missingFileExitsTwoWithAClearMessage() {
        Path absent = folder.resolve("absent-site.yaml");

        int exit = run("check", "--site", absent.toString());

        assertThat(exit).isEqualTo(2);
        assertThat(err.toString().lines()).containsExactly(absent + ": file not found",
                "1 error found; nothing was started");
    }

    @Test
    void driverSettingsAreCheckedWithTheSameFilePositions() throws IOException {
        Path site = folder.resolve("scratch-site.yaml");
        Files.writeString(site, "site: {name: Scratch}\n"
                + "buses:\n"
                + "  - id: b1\n"
                + "    transport: {kind: serial, port: /dev/ttyUSB9, parity: evn}\n"
                + "    instruments:\n"
                + "      - id: m1\n"
                + "        driver: modbus-rtuu\n"
                + "        settings: {unit: 3}\n"
                + "        channels:\n"
                + "          - {id: c1, unit: kPa, point: {table: input, address: 0}}\n"
                + "      - id: m2\n"
                + "        driver: modbus-rtu\n"
                + "        settings: {unit: 300, timout: 1s}\n"
                + "        channels:\n"
                + "          - {id: c2, unit: kPa, point: {table: inptu, address: 0}}\n");

        int exit = run("check", "--site", site.toString());

        assertThat(exit).isEqualTo(2);
        assertThat(err.toString().lines()).containsExactly(
                site + ":4:59: parity in serial transport must be one of even, none, odd, got 'evn'; did you mean "
                        + "'even'?",
                site + ":6:9: instrument 'm1' uses driver 'modbus-rtuu', which is not installed; did you mean "
                        + "'modbus-rtu'?; installed: modbus-rtu, scpi, line (see cryowarden plugins)",
                site + ":13:26: unit in settings of instrument 'm2' must be 1-247, got 300",
                site + ":13:31: unknown key 'timout' in settings of instrument 'm2'; did you mean 'timeout'?",
                site + ":15:48: table in channel 'c2' of instrument 'm2' must be one of coil, discrete, holding, input, "
                        + "got 'inptu'; did you mean 'input'?",
                "5 errors found; nothing was started");
    }

    @Test
    void missingSiteOptionIsBadInput() {
        assertThat(run("check")).isEqualTo(2);
        assertThat(err.toString()).startsWith("Missing required option: '--site=FILE'");
    }

    @Test
    void notifiersWatchdogAndCommonAlarmMistakesAreReportedWithFileLineAndColumn() throws IOException {
        Path site = folder.resolve("harbour-hall-site.yaml");
        String text = Files.readString(Path.of(SITE))
                .replace("common_alarm: {output: common-alarm, priority: high}",
                        "common_alarm: {output: comon-alarm, priority: urgent}")
                .replace("watchdog: {heartbeat: 10s, engine_stall: 30s, poller_stall: 2min}",
                        "watchdog: {heartbeat: 10s, engine_stall: 30s, poller_stall: 40s}");
        Files.writeString(site, text + """
                notifiers:
                  roster: lab-roster.yaml
                  senders:
                    - {id: pager-hook, kind: webhok, url: "https://pager.example/hook"}
                    - {id: lab-mail, kind: email, host: smtp.example.org, from: cryowarden@example.org,
                       username: cryowarden, password_file: smtp-password}
                """);
        int lines = (int) text.lines().count();

        int exit = run("check", "--site", site.toString(), "--rules", RULES);

        assertThat(exit).isEqualTo(2);
        int common = (int) text.lines().takeWhile(l -> !l.startsWith("common_alarm:")).count() + 1;
        int watchdog = common + 1;
        assertThat(err.toString().lines()).containsExactly(
                // The level meters poll every 30 s, so a poller may be quiet that long between rounds.
                site + ":" + watchdog + ":61: poller_stall 40 s must be longer than twice the longest channel"
                        + " period (30 s), or a quiet bus reads as stalled",
                site + ":" + common + ":47: priority in common_alarm must be one of critical, high, low, medium,"
                        + " got 'urgent'",
                site + ":" + common + ":24: common_alarm output 'comon-alarm' is no output of the site; did you mean"
                        + " 'common-alarm'?",
                site + ":" + (lines + 4) + ":30: sender 'pager-hook' has unknown kind 'webhok'; did you mean"
                        + " 'webhook'?",
                site + ":" + (lines + 6) + ":45: cannot read password_file " + folder.resolve("smtp-password")
                        + ": no such file",
                "5 errors found; nothing was started");
    }

    private int run(String... args) {
        CommandLine line = Main.commandLine();
        line.setOut(new PrintWriter(out, true));
        line.setErr(new PrintWriter(err, true));
        return line.execute(args);
    }
}
