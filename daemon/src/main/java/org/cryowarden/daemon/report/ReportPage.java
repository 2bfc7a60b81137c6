package org.cryowarden.daemon.report;

import java.time.Duration;
import java.time.Instant;
import java.time.ZoneId;
import java.time.format.DateTimeFormatter;
import java.util.List;
import java.util.Locale;
import java.util.function.Consumer;
import org.cryowarden.daemon.journal.JournalEvent;
import org.cryowarden.daemon.journal.MinuteAggregate;
import org.cryowarden.daemon.replay.FloodPeriod;

/**
 * Writes a {@link MorningReport} as one self-contained HTML page: inline CSS, plots as embedded PNG images, no script and no
 * external resource, so it can be mailed or archived as one file.
 */
public final class ReportPage {

    /** The caution every report ends with. */
    public static final String CAUTION = "cryowarden is a supervisory and alerting layer, not a certified safety"
            + " system. It never replaces hardwired oxygen-deficiency monitoring, relief valves, burst discs or what"
            + " local codes require; the facility's safety officer and local codes decide what a reading means.";

    private static final String STYLE = """
            body{font-family:"DejaVu Sans",Helvetica,Arial,sans-serif;color:#2b2f3a;background:#f4f4f1;margin:0}
            main{max-width:1240px;margin:0 auto;padding:18px 24px 8px;background:#fff}
            h1{font-size:24px;margin:4px 0 2px}h2{font-size:18px;margin:26px 0 8px;border-bottom:2px solid #3d5a80;
            padding-bottom:3px}p.meta{color:#5d6270;margin:2px 0}
            table{border-collapse:collapse;font-size:13px;margin:6px 0}th,td{padding:3px 10px;text-align:left;
            border-bottom:1px solid #e2e3e7}th{background:#eef0f3}td.n{text-align:right;font-variant-numeric:tabular-nums}
            .tiles{display:flex;flex-wrap:wrap;gap:10px;margin:12px 0}.tile{border:1px solid #d5d8de;padding:8px 12px;
            min-width:150px}.tile b{display:block;font-size:20px}.note{color:#5d6270;font-size:13px}
            figure{margin:10px 0 16px}figure img{width:100%;height:auto;display:block}figcaption{font-size:12px;color:#555}
            footer{max-width:1240px;margin:0 auto;padding:12px 24px 24px;background:#fff;border-top:2px solid #a66a1e;
            font-size:13px}.low{color:#8a2d2d;font-weight:bold}
            """;

    private final MorningReport report;
    private final DateTimeFormatter time;
    private final ZoneId zone;

    public ReportPage(MorningReport report) {
        this.report = report;
        this.zone = report.site().zone();
        this.time = DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm:ss", Locale.ROOT).withZone(zone);
    }

    /** The page; {@code progress} hears of each plot as it is drawn. */
    public String html(Instant generatedAt, Consumer<String> progress) {
        StringBuilder page = new StringBuilder(256 * 1024);
        ReportWindow window = report.night().window();
        String title = "Morning report" + report.site().siteName().map(n -> ": " + n).orElse("");
        page.append("<!DOCTYPE html>\n<html lang=\"en\"><head><meta charset=\"utf-8\"><title>").append(esc(title))
                .append("</title><style>").append(STYLE).append("</style></head><body><main>\n");
        page.append("<h1>").append(esc(title)).append("</h1>\n");
        page.append("<p class=\"meta\">Period ").append(time.format(window.from())).append(" to ")
                .append(time.format(window.until())).append(" (").append(esc(zoneName())).append(", ")
                .append(Numbers.duration(window.length())).append(")</p>\n");
        page.append("<p class=\"meta\">Journal ").append(esc(report.night().journalFile().toString()))
                .append("; generated ").append(time.format(generatedAt)).append("</p>\n");
        tiles(page);

        progress.accept("drawing the alarm timeline");
        page.append("<h2 id=\"timeline\">Alarm timeline</h2>\n");
        if (report.analysis().alarms().isEmpty()) {
            page.append("<p class=\"note\">No alarm was annunciated in the period.</p>\n");
        } else {
            int height = 110 + 30 * report.analysis().alarms().size();
            figure(page, Charts.image(Charts.timeline(report.analysis().alarms(), window, zone), height, "timeline",
                    "Alarm timeline: one row per alarm, active periods coloured by priority"), "");
        }
        acknowledgements(page);
        progress.accept("drawing the alarm rate");
        rate(page);
        trips(page);
        completeness(page);
        consumption(page);

        page.append("<h2 id=\"channels\">Channels</h2>\n<p class=\"note\">Each plot: the mean of each minute's GOOD"
                + " readings (line) within that minute's lowest and highest (band); dashed lines are the rules'"
                + " setpoints; shaded spans are periods in which an alarm on the channel was active.</p>\n");
        List<ChannelInfo> channels = report.channels();
        for (int i = 0; i < channels.size(); i++) {
            ChannelInfo channel = channels.get(i);
            progress.accept("plotting channel " + (i + 1) + " of " + channels.size() + " (" + channel.id() + ")");
            List<MinuteAggregate> minutes = report.night().aggregates().get(channel.id());
            page.append("<section class=\"channel\" id=\"channel-").append(esc(channel.id())).append("\">");
            if (!channel.description().isEmpty()) {
                page.append("<p class=\"note\">").append(esc(channel.description())).append("</p>");
            }
            String limits = limitsText(channel);
            figure(page, Charts.image(Charts.channel(channel, minutes, report.analysis().alarms(),
                    report.alarmLinks().getOrDefault(channel.id(), java.util.Set.of()), window, zone), 300,
                    "ch" + i, "Plot of " + channel.id() + (limits.isEmpty() ? "" : "; " + limits)), limits);
            page.append("</section>\n");
        }
        page.append("</main>\n<footer><p><b>Caution.</b> ").append(esc(CAUTION)).append("</p>")
                .append("<p class=\"note\">Made by cryowarden from the journal's event log and minute aggregates.</p>")
                .append("</footer>\n</body></html>\n");
        return page.toString();
    }

    private String zoneName() {
        return zone.normalized().equals(java.time.ZoneOffset.UTC) ? "UTC" : zone.getId();
    }

    private void tiles(StringBuilder page) {
        page.append("<div class=\"tiles\">");
        tile(page, "alarms annunciated", Integer.toString(report.alarmCount()));
        long acknowledged = report.acknowledgements().stream().filter(a -> a.acknowledgedAt().isPresent()).count();
        tile(page, "acknowledged", acknowledged + " of " + report.acknowledgements().size());
        tile(page, "median time to acknowledge", report.medianAcknowledgement().map(Numbers::duration).orElse("-"));
        tile(page, "interlock trips", Integer.toString(report.trips().size()));
        tile(page, "alarm floods", Integer.toString(report.analysis().floods().size()));
        page.append("</div>\n");
    }

    private void acknowledgements(StringBuilder page) {
        page.append("<h2 id=\"acknowledgement\">Time to acknowledge</h2>\n<p class=\"note\">From the moment an alarm"
                + " began to await acknowledgement to the operator's acknowledgement: the time-to-acknowledge"
                + " performance measure of ANSI/ISA-18.2-2016 (IEC 62682) alarm monitoring.</p>\n");
        if (report.acknowledgements().isEmpty()) {
            page.append("<p class=\"note\">No alarm awaited acknowledgement in the period.</p>\n");
            return;
        }
        page.append("<table><tr><th>alarm</th><th>priority</th><th>raised</th><th>acknowledged</th><th>by</th>"
                + "<th>time to acknowledge</th></tr>\n");
        for (AcknowledgementTime ack : report.acknowledgements()) {
            page.append("<tr><td>").append(esc(ack.alarmId())).append("</td><td>").append(ack.priority().word())
                    .append("</td><td>").append(time.format(ack.raisedAt())).append("</td><td>")
                    .append(ack.acknowledgedAt().map(time::format).orElse("not acknowledged")).append("</td><td>")
                    .append(esc(ack.operator().orElse(""))).append("</td><td class=\"n\">")
                    .append(ack.timeToAcknowledge().map(ReportPage::seconds).orElse("-")).append("</td></tr>\n");
        }
        page.append("</table>\n<p id=\"median-acknowledgement\">Median time to acknowledge: <b>")
                .append(report.medianAcknowledgement().map(ReportPage::seconds).orElse("-")).append("</b>")
                .append(report.medianAcknowledgement().map(d -> " (" + Numbers.duration(d) + ")").orElse(""))
                .append(" over ").append(report.acknowledgements().stream().filter(a -> a.timeToAcknowledge().isPresent()).count())
                .append(" acknowledged alarms.</p>\n");
    }

    private void rate(StringBuilder page) {
        Duration interval = report.analysis().settings().rateInterval();
        String words = Numbers.duration(interval).replace(" 00 s", "");
        int above = report.analysis().settings().floodAbove();
        page.append("<h2 id=\"rate\">Alarms per ").append(esc(words)).append("</h2>\n<p class=\"note\">An alarm flood"
                + " is more than ").append(above).append(" alarms in ").append(esc(words))
                .append(" (the EEMUA 191 benchmark); flood periods are shaded.</p>\n");
        figure(page, Charts.image(Charts.rate(report.analysis().rate(), report.analysis().floods(), above, words,
                report.night().window(), zone), 300, "rate", "Alarms per " + words + " with flood periods shaded"), "");
        List<FloodPeriod> floods = report.analysis().floods();
        if (floods.isEmpty()) {
            page.append("<p>No alarm flood in the period.</p>\n");
        } else {
            page.append("<table><tr><th>flood from</th><th>to</th><th>alarms</th></tr>\n");
            for (FloodPeriod flood : floods) {
                page.append("<tr><td>").append(time.format(flood.start())).append("</td><td>")
                        .append(time.format(flood.end())).append("</td><td class=\"n\">").append(flood.activations())
                        .append("</td></tr>\n");
            }
            page.append("</table>\n");
        }
        if (!report.floodEvents().isEmpty()) {
            page.append("<p class=\"note\">Flood notices the daemon recorded:</p><table><tr><th>at</th><th>event</th>"
                    + "<th>first-out alarm</th></tr>\n");
            for (JournalEvent event : report.floodEvents()) {
                page.append("<tr><td>").append(time.format(event.at())).append("</td><td>").append(esc(event.kind()))
                        .append("</td><td>").append(esc(event.subject().orElse(""))).append("</td></tr>\n");
            }
            page.append("</table>\n");
        }
    }

    private void trips(StringBuilder page) {
        page.append("<h2 id=\"trips\">Interlock trips</h2>\n");
        if (report.trips().isEmpty()) {
            page.append("<p>No interlock tripped in the period.</p>\n");
            return;
        }
        page.append("<table><tr><th>interlock</th><th>tripped</th><th>by alarm</th><th>reset</th><th>reset by</th>"
                + "<th>tripped for</th></tr>\n");
        for (InterlockTrip trip : report.trips()) {
            page.append("<tr class=\"trip\"><td>").append(esc(trip.interlockId())).append("</td><td>")
                    .append(time.format(trip.trippedAt())).append("</td><td>").append(esc(trip.causeAlarm()))
                    .append("</td><td>").append(trip.resetAt().map(time::format).orElse("still tripped"))
                    .append("</td><td>").append(esc(trip.resetBy().orElse(""))).append("</td><td class=\"n\">")
                    .append(trip.resetAt().map(r -> Numbers.duration(Duration.between(trip.trippedAt(), r)))
                            .orElse("-")).append("</td></tr>\n");
        }
        page.append("</table>\n");
    }

    private void completeness(StringBuilder page) {
        page.append("<h2 id=\"completeness\">Data completeness</h2>\n<p class=\"note\">GOOD readings as a share of"
                + " those expected: one per poll period over the whole period for a measured channel; of those"
                + " recorded for a derived channel or without a site file.</p>\n");
        page.append("<table><tr><th>channel</th><th>GOOD</th><th>recorded</th><th>expected</th><th>GOOD share</th>"
                + "</tr>\n");
        for (ChannelCompleteness c : report.completeness()) {
            double share = c.goodFraction();
            page.append("<tr><td>").append(esc(c.channel())).append("</td><td class=\"n\">").append(c.good())
                    .append("</td><td class=\"n\">").append(c.recorded()).append("</td><td class=\"n\">")
                    .append(c.expected().isPresent() ? Long.toString(c.expected().getAsLong()) : "-")
                    .append("</td><td class=\"n").append(share < 0.95 ? " low" : "").append("\">")
                    .append(Numbers.percent(share)).append("</td></tr>\n");
        }
        page.append("</table>\n");
    }

    private void consumption(StringBuilder page) {
        page.append("<h2 id=\"consumption\">Liquid consumed per dewar</h2>\n");
        if (report.consumption().isEmpty()) {
            page.append("<p class=\"note\">").append(report.site().siteName().isPresent()
                    ? "The site file gives no dewar geometry (a level channel in % with probe_percent_height and a"
                            + " litres_* channel on it), so no consumption can be computed."
                    : "Give the site file (--site) to compute the litres used from the dewar levels.")
                    .append("</p>\n");
            return;
        }
        page.append("<p class=\"note\">Litres of liquid from the minute means of the level, through the probe and"
                + " vessel geometry of the site file; refills (a rise of more than 2 % of the full contents) are left"
                + " out, not subtracted.</p>\n");
        page.append("<table><tr><th>dewar</th><th>level channel</th><th>consumed (L)</th><th>refills</th>"
                + "<th>refilled (L)</th><th>minutes used</th></tr>\n");
        for (DewarConsumption d : report.consumption()) {
            page.append("<tr class=\"dewar\"><td>").append(esc(d.dewar().description())).append("</td><td>")
                    .append(esc(d.dewar().levelChannel())).append("</td><td class=\"n\">")
                    .append(String.format(Locale.ROOT, "%.2f", d.consumption().consumedLitres()))
                    .append("</td><td class=\"n\">").append(d.consumption().refills()).append("</td><td class=\"n\">")
                    .append(String.format(Locale.ROOT, "%.2f", d.consumption().refilledLitres()))
                    .append("</td><td class=\"n\">").append(d.consumption().readingsUsed()).append("</td></tr>\n");
        }
        page.append("</table>\n");
    }

    private static void tile(StringBuilder page, String label, String value) {
        page.append("<div class=\"tile\"><b>").append(esc(value)).append("</b>").append(esc(label)).append("</div>");
    }

    /** The setpoints drawn on a channel's plot, in words, so they can be read (and searched) without the image. */
    private static String limitsText(ChannelInfo channel) {
        List<String> labels = new java.util.ArrayList<>();
        for (ChannelLimit limit : channel.limits()) {
            labels.add(limit.label());
        }
        return labels.isEmpty() ? "" : "Setpoints: " + String.join("; ", labels);
    }

    private static void figure(StringBuilder page, String image, String caption) {
        page.append("<figure>").append(image);
        if (!caption.isEmpty()) {
            page.append("<figcaption>").append(esc(caption)).append("</figcaption>");
        }
        page.append("</figure>\n");
    }

    /** Whole seconds, e.g. "181 s": the form the acknowledgement figures are compared in. */
    static String seconds(Duration duration) {
        long millis = duration.toMillis();
        return millis % 1000 == 0 ? (millis / 1000) + " s"
                : String.format(Locale.ROOT, "%.1f s", millis / 1000.0);
    }

    static String esc(String text) {
        StringBuilder out = new StringBuilder(text.length());
        for (char c : text.toCharArray()) {
            switch (c) {
                case '<' -> out.append("&lt;");
                case '>' -> out.append("&gt;");
                case '&' -> out.append("&amp;");
                case '"' -> out.append("&quot;");
                default -> out.append(c);
            }
        }
        return out.toString();
    }
}
