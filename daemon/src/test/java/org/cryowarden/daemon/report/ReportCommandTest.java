package org.cryowarden.daemon.report;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assumptions.assumeThat;

import java.awt.image.BufferedImage;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.InetAddress;
import java.net.ServerSocket;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.sql.Connection;
import java.sql.DriverManager;
import java.sql.ResultSet;
import java.sql.Statement;
import java.time.Duration;
import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import javax.imageio.ImageIO;
import org.cryowarden.daemon.cli.Main;
import org.cryowarden.daemon.demo.DemoNight;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

/**
 * The morning report of the demo's quench night: 26 simulated minutes (the quench at 00:20, the scripted operator
 * acknowledging three minutes after each alarm and resetting the ventilation interlock) run in-process with its
 * journal, then {@code report} over it. Every figure checked here is recomputed in the test straight from the
 * journal's rows with SQL, not through the report's classes.
 */
class ReportCommandTest {

    private static final DateTimeFormatter TIME =
            DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm:ss", Locale.ROOT).withZone(ZoneOffset.UTC);

    @TempDir
    static Path folder;

    static Path journal;
    static Path site;
    static Path rules;
    static String page;
    static String progress;

    @BeforeAll
    static void quenchNightAndItsReport() throws Exception {
        journal = folder.resolve("night.db");
        int port;
        try (ServerSocket probe = new ServerSocket(0, 1, InetAddress.getLoopbackAddress())) {
            port = probe.getLocalPort();
        }
        DemoNight.Settings settings = new DemoNight.Settings("quench", Double.POSITIVE_INFINITY, port, false,
                Optional.empty(), Optional.of(journal), Optional.of(Duration.ofMinutes(26)), false);
        new DemoNight(settings, new PrintWriter(new StringWriter())).run();

        // The example site, with its journal: section pointing at the night's journal.
        Path examples = Files.createDirectories(folder.resolve("config-examples"));
        site = examples.resolve("harbour-hall-site.yaml");
        rules = examples.resolve("harbour-hall-rules.yaml");
        String siteText = Files.readString(Path.of("..", "config-examples", "harbour-hall-site.yaml"));
        assertThat(siteText).contains("  path: /var/lib/cryowarden/harbour-hall.db");
        Files.writeString(site, siteText.replace("  path: /var/lib/cryowarden/harbour-hall.db", "  path: " + journal));
        Files.copy(Path.of("..", "config-examples", "harbour-hall-rules.yaml"), rules);

        Path out = folder.resolve("morning.html");
        Run run = report("--site", site.toString(), "--rules", rules.toString(), "--out", out.toString());
        assertThat(run.exit).as(run.err).isZero();
        page = Files.readString(out, StandardCharsets.UTF_8);
        Files.copy(out, Path.of("target", "morning-report.html"), java.nio.file.StandardCopyOption.REPLACE_EXISTING);
        progress = run.err;
    }

    @Test
    void pageHasEverySectionAndTheCautionAndNeedsNothingFromOutside() {
        assertThat(page).contains("<h1>Morning report: Harbour Hall low-temperature lab</h1>");
        assertThat(page).contains("id=\"timeline\"", "id=\"acknowledgement\"", "id=\"rate\"", "id=\"trips\"",
                "id=\"completeness\"", "id=\"consumption\"", "id=\"channels\"");
        assertThat(page).contains("ANSI/ISA-18.2-2016 (IEC 62682)", "(the EEMUA 191 benchmark)");
        assertThat(page).contains("not a certified safety system");
        // Self-contained: no script, no linked style sheet, font or frame; every image is embedded.
        assertThat(page).doesNotContain("<script", "<link", "<iframe", "src=\"", "@import", "href=\"http");
        assertThat(page).doesNotContainPattern("url\\(");
        assertThat(page).doesNotContainPattern("src='(?!data:image/png;base64,)");
        assertThat(progress).contains("report: plotting channel 1 of 17", "report: plotting channel 17 of 17",
                "report: wrote ");
    }

    @Test
    void onePlotPerChannelOfTheJournalEmbeddedAsAnImage() throws Exception {
        List<String> channels = strings("SELECT DISTINCT channel FROM minute_aggregate ORDER BY channel");
        // 12 measured and 5 derived channels in the example site (config-examples/harbour-hall-site.yaml).
        assertThat(channels).hasSize(17);
        for (String channel : channels) {
            Matcher section = Pattern.compile("<section class=\"channel\" id=\"channel-" + Pattern.quote(channel)
                    + "\">(.*?)</section>", Pattern.DOTALL).matcher(page);
            assertThat(section.find()).as(channel).isTrue();
            assertThat(section.group(1)).contains("<img id='ch", "src='data:image/png;base64,");
        }
        assertThat(count(page, "<section class=\"channel\"")).isEqualTo(17);
        // 17 channel plots, the timeline and the rate chart, each embedded.
        assertThat(count(page, "<img ")).isEqualTo(19);
        assertThat(page).contains("<img id='ch0'", "<img id='ch16'", "<img id='timeline'", "<img id='rate'");
    }

    @Test
    void limitsOfTheRulesAreDrawnOnTheirChannels() {
        // harbour-hall-rules.yaml: the 2oo3 oxygen vote below 19.5 %vol, bath pressure above 30 kPa(g).
        assertThat(section("o2-magnet-hall-east")).contains("o2-magnet-hall-low below 19.5 %vol");
        assertThat(section("bath-pressure")).contains("bath-pressure-high above 30 kPa(g)");
    }

    @Test
    void tripIsListedWithWhoResetItAndWhen() throws Exception {
        List<Map<String, String>> tripped = rows("SELECT at_ms, subject, operator FROM event"
                + " WHERE kind = 'interlock.tripped' ORDER BY seq");
        List<Map<String, String>> reset = rows("SELECT at_ms, subject, operator FROM event"
                + " WHERE kind = 'interlock.reset' ORDER BY seq");
        assertThat(tripped).hasSize(1);
        assertThat(reset).hasSize(1);
        String expected = "<tr class=\"trip\"><td>magnet-hall-ventilation</td><td>" + at(tripped.get(0))
                + "</td><td>o2-magnet-hall-low</td><td>" + at(reset.get(0)) + "</td><td>" + reset.get(0).get("operator")
                + "</td>";
        // The demo's lab lead resets: the supervisor of config-examples/harbour-hall-site.yaml.
        assertThat(reset.get(0).get("operator")).isEqualTo("lab-lead");
        assertThat(page).contains(expected);
    }

    @Test
    void medianTimeToAcknowledgeIsThatOfTheJournalRows() throws Exception {
        // By hand: each alarm.raised from normal, to the next alarm.acknowledged of the same alarm.
        List<Map<String, String>> events = rows("SELECT kind, subject, at_ms, payload FROM event"
                + " WHERE kind IN ('alarm.raised', 'alarm.acknowledged') ORDER BY seq");
        Map<String, Long> raisedAt = new HashMap<>();
        List<Long> waits = new ArrayList<>();
        for (Map<String, String> e : events) {
            long at = Long.parseLong(e.get("at_ms"));
            if (e.get("kind").equals("alarm.raised") && e.get("payload").contains("\"from\":\"normal\"")) {
                raisedAt.put(e.get("subject"), at);
            } else if (e.get("kind").equals("alarm.acknowledged") && raisedAt.containsKey(e.get("subject"))) {
                waits.add(at - raisedAt.remove(e.get("subject")));
            }
        }
        // The two pressure alarms, the two oxygen alarms and the warm magnet.
        assertThat(waits).hasSize(5);
        List<Long> sorted = waits.stream().sorted().toList();
        long median = sorted.get(2);
        assertThat(page).contains("Median time to acknowledge: <b>" + seconds(median) + "</b>");
        assertThat(page).contains(" over 5 acknowledged alarms.");
        for (long wait : waits) {
            assertThat(page).contains("<td class=\"n\">" + seconds(wait) + "</td></tr>");
        }
    }

    @Test
    void completenessIsGoodReadingsOverOnePerPollPeriod() throws Exception {
        long first = Long.parseLong(strings("SELECT min(at_ms) FROM event").get(0));
        long stop = Long.parseLong(strings("SELECT at_ms FROM event WHERE kind = 'daemon.stopped'").get(0));
        long good = Long.parseLong(strings("SELECT sum(good_count) FROM minute_aggregate"
                + " WHERE channel = 'ovc-pressure'").get(0));
        long recorded = Long.parseLong(strings("SELECT sum(total_count) FROM minute_aggregate"
                + " WHERE channel = 'ovc-pressure'").get(0));
        // ovc-pressure is polled every 1 s (harbour-hall-site.yaml): one reading per second, both ends counted.
        long expected = (stop - first) / 1000 + 1;
        assertThat(expected).isEqualTo(26 * 60 + 1);
        String share = String.format(Locale.ROOT, "%.1f %%", Math.min(1.0, (double) good / expected) * 100);
        assertThat(page).containsPattern("<tr><td>ovc-pressure</td><td class=\"n\">" + good + "</td><td class=\"n\">"
                + recorded + "</td><td class=\"n\">" + expected + "</td><td class=\"n( low)?\">"
                + Pattern.quote(share) + "</td></tr>");
    }

    @Test
    void heliumConsumedMatchesTheLitresTheDaemonDerived() throws Exception {
        // The daemon's own he-dewar-1-litres channel (the engine's litres_hemispherical_bottom over
        // probe_percent_height) against the report's figure from the level channel through DewarGauge. No refill
        // in this night, so the consumption is the first minute's litres less the last's. The 0.08 W heat load
        // boils off about 0.1 L/h (harbour-hall-quench-scenario.yaml), below the probe's 0.05 % steps, so the
        // figure is within the level's noise; what matters is that both paths agree.
        List<String> means = strings("SELECT sum_value / good_count FROM minute_aggregate"
                + " WHERE channel = 'he-dewar-1-litres' ORDER BY minute_ms");
        double used = Double.parseDouble(means.get(0)) - Double.parseDouble(means.get(means.size() - 1));
        Matcher row = Pattern.compile("<tr class=\"dewar\"><td>Liquid helium in storage dewar 1</td>"
                + "<td>he-dewar-1-level</td><td class=\"n\">(-?[0-9.]+)</td><td class=\"n\">0</td>").matcher(page);
        assertThat(row.find()).as("dewar row").isTrue();
        assertThat(Double.parseDouble(row.group(1))).isCloseTo(used, org.assertj.core.data.Offset.offset(0.006));
    }

    @Test
    void journalAloneGivesTheSamePlotsWithoutLimits() throws Exception {
        Path out = folder.resolve("journal-only.html");
        Run run = report("--journal", journal.toString(), "--since", "2025-11-14T22:10:00Z", "--out", out.toString());
        assertThat(run.exit).as(run.err).isZero();
        String html = Files.readString(out);
        assertThat(count(html, "<section class=\"channel\"")).isEqualTo(17);
        assertThat(html).contains("<h1>Morning report</h1>", "Period 2025-11-14 22:10:00 to");
        assertThat(html).doesNotContain("o2-magnet-hall-low below 19.5");
        assertThat(html).contains("Give the site file (--site) to compute the litres used");
        // The start-up alarm of 22:00 is outside the period: five acknowledged alarms remain.
        assertThat(html).contains(" over 5 acknowledged alarms.");
    }

    @Test
    void missingJournalAndBadTimeAreClearErrors() throws Exception {
        Path missing = folder.resolve("nowhere.db");
        Run run = report("--journal", missing.toString(), "--out", folder.resolve("x.html").toString());
        assertThat(run.exit).isEqualTo(2);
        assertThat(run.err).isEqualTo("cannot read the journal " + missing.toAbsolutePath()
                + ": there is no such file; give the file the daemon writes\n");
        run = report("--journal", journal.toString(), "--since", "yesterday", "--out",
                folder.resolve("x.html").toString());
        assertThat(run.exit).isEqualTo(2);
        assertThat(run.err).isEqualTo("--since: 'yesterday' is not a date and time; write it as 2025-11-14T22:00"
                + " (in UTC) or 2025-11-14T22:00:00Z\n");
        assertThat(Files.exists(folder.resolve("x.html"))).isFalse();
    }

    @Test
    void pageRendersWithItsPlotsInHeadlessChromium() throws Exception {
        Optional<String> chromium = chromium();
        assumeThat(chromium).as("chromium is not installed (apt-get install -y chromium); the page was not"
                + " rendered").isPresent();
        Path html = folder.resolve("render.html");
        Files.writeString(html, page);
        Path png = folder.resolve("render.png");
        Path profile = Files.createTempDirectory(folder, "chromium-profile");
        Process process = new ProcessBuilder(chromium.get(), "--headless", "--no-sandbox", "--disable-gpu",
                "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update",
                "--disable-sync", "--user-data-dir=" + profile, "--screenshot=" + png, "--window-size=1400,4000",
                html.toUri().toString()).redirectErrorStream(true).redirectOutput(folder.resolve("chromium.log").toFile())
                .start();
        assertThat(process.waitFor(60, TimeUnit.SECONDS)).as("chromium finished within 60 s").isTrue();
        assertThat(png).exists();
        BufferedImage image = ImageIO.read(png.toFile());
        assertThat(image.getWidth()).isEqualTo(1400);
        assertThat(image.getHeight()).isEqualTo(4000);
        // A blank or unstyled page is almost all white; the plots' bands, lines and shading are not.
        long coloured = 0;
        long blueish = 0;
        for (int y = 0; y < image.getHeight(); y += 2) {
            for (int x = 0; x < image.getWidth(); x += 2) {
                int rgb = image.getRGB(x, y);
                int r = (rgb >> 16) & 0xff;
                int g = (rgb >> 8) & 0xff;
                int b = rgb & 0xff;
                if (r < 235 || g < 235 || b < 235) {
                    coloured++;
                }
                if (b > r + 40 && b > 120) {
                    blueish++; // the value line and band of the channel plots
                }
            }
        }
        long sampled = (long) (image.getWidth() / 2) * (image.getHeight() / 2);
        assertThat(coloured).as("non-white pixels").isGreaterThan(sampled / 20);
        assertThat(blueish).as("pixels of the plots' value band").isGreaterThan(sampled / 200);
        Files.copy(png, Path.of("target", "morning-report-screenshot.png"),
                java.nio.file.StandardCopyOption.REPLACE_EXISTING);
    }

    // ---- helpers ------------------------------------------------------------------------------------------------

    record Run(int exit, String out, String err) {
    }

    static Run report(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        CommandLine line = Main.commandLine();
        line.setOut(new PrintWriter(out));
        line.setErr(new PrintWriter(err));
        String[] full = new String[args.length + 1];
        full[0] = "report";
        System.arraycopy(args, 0, full, 1, args.length);
        int exit = line.execute(full);
        return new Run(exit, out.toString(), err.toString());
    }

    static String section(String channel) {
        Matcher m = Pattern.compile("<section class=\"channel\" id=\"channel-" + Pattern.quote(channel)
                + "\">(.*?)</section>", Pattern.DOTALL).matcher(page);
        assertThat(m.find()).as(channel).isTrue();
        return m.group(1);
    }

    static String at(Map<String, String> row) {
        return TIME.format(Instant.ofEpochMilli(Long.parseLong(row.get("at_ms"))));
    }

    static String seconds(long millis) {
        return millis % 1000 == 0 ? (millis / 1000) + " s" : String.format(Locale.ROOT, "%.1f s", millis / 1000.0);
    }

    static int count(String text, String part) {
        int n = 0;
        for (int i = text.indexOf(part); i >= 0; i = text.indexOf(part, i + 1)) {
            n++;
        }
        return n;
    }

    static List<String> strings(String sql) throws Exception {
        List<String> values = new ArrayList<>();
        for (Map<String, String> row : rows(sql)) {
            values.add(row.values().iterator().next());
        }
        return values;
    }

    static List<Map<String, String>> rows(String sql) throws Exception {
        List<Map<String, String>> result = new ArrayList<>();
        try (Connection connection = DriverManager.getConnection("jdbc:sqlite:" + journal);
             Statement statement = connection.createStatement();
             ResultSet rows = statement.executeQuery(sql)) {
            int columns = rows.getMetaData().getColumnCount();
            while (rows.next()) {
                Map<String, String> row = new java.util.LinkedHashMap<>();
                for (int i = 1; i <= columns; i++) {
                    row.put(rows.getMetaData().getColumnLabel(i), rows.getString(i));
                }
                result.add(row);
            }
        }
        return result;
    }

    static Optional<String> chromium() {
        for (String name : List.of("chromium", "chromium-browser")) {
            for (String dir : System.getenv().getOrDefault("PATH", "/usr/bin").split(":")) {
                if (Files.isExecutable(Path.of(dir, name))) {
                    return Optional.of(Path.of(dir, name).toString());
                }
            }
        }
        return Optional.empty();
    }
}
