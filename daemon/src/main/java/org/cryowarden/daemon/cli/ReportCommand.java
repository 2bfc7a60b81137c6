package org.cryowarden.daemon.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Instant;
import java.time.ZoneId;
import java.time.ZoneOffset;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.Callable;
import org.cryowarden.daemon.journal.Journal;
import org.cryowarden.daemon.journal.JournalException;
import org.cryowarden.daemon.journal.JournalSettings;
import org.cryowarden.daemon.report.MorningReport;
import org.cryowarden.daemon.report.NightRecord;
import org.cryowarden.daemon.report.ReportPage;
import org.cryowarden.daemon.report.ReportWindow;
import org.cryowarden.daemon.report.SiteKnowledge;
import org.cryowarden.daemon.run.DaemonSettings;
import org.cryowarden.daemon.run.SiteSetup;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.config.Configuration;
import picocli.CommandLine;
import picocli.CommandLine.ArgGroup;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code cryowarden report}: the morning report, one self-contained HTML page from the journal, with the site's
 * units, limits and dewar geometry when the site file is given.
 */
@Command(
        name = "report",
        description = {
            "Write the morning report of a journal as one self-contained HTML page: a plot per channel with its",
            "limits and alarm periods, the alarm timeline, time to acknowledge and its median, alarms per",
            "10 minutes with floods, data completeness, liquid consumed per dewar and the interlock trips.",
            "cryowarden is a supervisory layer, not a certified safety system: it never replaces hardwired",
            "oxygen monitoring, relief devices or local codes."
        },
        mixinStandardHelpOptions = true)
final class ReportCommand implements Callable<Integer> {

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @ArgGroup(exclusive = true, multiplicity = "1")
    Source source;

    static final class Source {
        @Option(names = "--site", paramLabel = "FILE",
                description = "the site file; the journal is the one its journal: section names")
        Path site;

        @Option(names = "--journal", paramLabel = "FILE", description = "a journal file, read without a site file")
        Path journal;
    }

    @Option(names = "--rules", arity = "1..*", paramLabel = "FILE",
            description = "rule-set files, with --site: their limits are drawn on the plots")
    List<Path> rules = new ArrayList<>();

    @Option(names = "--since", paramLabel = "TIME",
            description = "start of the period, e.g. 2025-11-14T22:00 (site time zone, else UTC) or ...Z;"
                    + " default: the first thing recorded")
    String since;

    @Option(names = "--until", paramLabel = "TIME", description = "end of the period; default: the last thing recorded")
    String until;

    @Option(names = "--out", required = true, paramLabel = "FILE.html", description = "where to write the page")
    Path out;

    @Override
    public Integer call() {
        PrintWriter err = spec.commandLine().getErr();
        System.setProperty("java.awt.headless", "true");
        if (source.journal != null && !rules.isEmpty()) {
            err.println("--rules needs --site: the rules' channels are the site's; give --site FILE --rules FILE...");
            err.flush();
            return CheckCommand.INVALID;
        }
        SiteKnowledge site = SiteKnowledge.none();
        Path journalFile = source.journal;
        List<String> channels = List.of();
        if (source.site != null) {
            try {
                DriverCatalog catalog = DriverCatalog.discover(ReportCommand.class.getClassLoader(), Optional.empty());
                Configuration configuration = SiteSetup.load(source.site, rules, catalog, TimeSource.system());
                journalFile = DaemonSettings.read(configuration.site(), RunCommand.folder(source.site)).journalPath();
                site = SiteKnowledge.of(configuration);
                channels = List.copyOf(site.channels().keySet());
            } catch (ConfigException e) {
                return RunCommand.refuse(err, e);
            }
        }
        ZoneId zone = site.zone();
        Optional<Instant> from;
        Optional<Instant> to;
        try {
            from = since == null ? Optional.empty() : Optional.of(ReportWindow.parseTime(since, zone));
            to = until == null ? Optional.empty() : Optional.of(ReportWindow.parseTime(until, zone));
        } catch (IllegalArgumentException e) {
            err.println((since != null && e.getMessage().contains("'" + since + "'") ? "--since: " : "--until: ")
                    + e.getMessage());
            err.flush();
            return CheckCommand.INVALID;
        }
        if (from.isPresent() && to.isPresent() && !to.get().isAfter(from.get())) {
            err.println("--until must be after --since, got " + since + " to " + until);
            err.flush();
            return CheckCommand.INVALID;
        }
        if (!Files.isRegularFile(journalFile)) {
            err.println("cannot read the journal " + journalFile.toAbsolutePath() + ": "
                    + (Files.exists(journalFile) ? "it is not a file" : "there is no such file")
                    + (source.site != null ? " (named by the journal: section of " + source.site + ")" : "")
                    + "; give the file the daemon writes");
            err.flush();
            return CheckCommand.INVALID;
        }
        Progress progress = new Progress(err, System.console() != null);
        try (Journal journal = Journal.open(journalFile, JournalSettings.defaults())) {
            NightRecord night = NightRecord.read(journal, from, to, channels, progress::show);
            progress.show("computing the figures");
            MorningReport report = MorningReport.of(night, site);
            String html = new ReportPage(report).html(Instant.now(), progress::show);
            progress.show("writing " + out);
            Files.writeString(out, html, StandardCharsets.UTF_8);
            progress.done("report: wrote " + out + " (" + report.channels().size() + " channels, "
                    + report.alarmCount() + " alarms, " + report.trips().size() + " interlock trips, "
                    + html.length() / 1024 + " KiB)");
            return 0;
        } catch (JournalException e) {
            progress.done("cannot read the journal: " + e.getMessage());
            return CheckCommand.INVALID;
        } catch (IllegalArgumentException e) {
            progress.done("nothing to report: " + e.getMessage());
            return CheckCommand.INVALID;
        } catch (IOException e) {
            progress.done("cannot write " + out + ": " + e.getMessage());
            return CheckCommand.INVALID;
        }
    }

    /** One progress line on stderr: redrawn in place on a terminal, one line per step otherwise. */
    private static final class Progress {
        private final PrintWriter err;
        private final boolean terminal;
        private int width;

        Progress(PrintWriter err, boolean terminal) {
            this.err = err;
            this.terminal = terminal;
        }

        void show(String step) {
            String line = "report: " + step;
            if (terminal) {
                err.print("\r" + line + " ".repeat(Math.max(0, width - line.length())));
                width = line.length();
            } else {
                err.println(line);
            }
            err.flush();
        }

        void done(String line) {
            if (terminal) {
                err.print("\r" + " ".repeat(width) + "\r");
            }
            err.println(line);
            err.flush();
        }
    }
}
