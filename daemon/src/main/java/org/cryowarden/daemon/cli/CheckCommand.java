package org.cryowarden.daemon.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.concurrent.Callable;
import org.cryowarden.daemon.run.NightSettings;
import org.cryowarden.daemon.run.DaemonSettings;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.config.Configuration;
import org.cryowarden.rules.config.ConfigurationLoader;
import org.cryowarden.rules.config.DriverSettingsValidator;
import java.util.Optional;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.drivers.site.SiteDrivers;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.engine.Engine;
import org.cryowarden.rules.engine.EngineConfig;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code cryowarden check --site FILE [--rules FILE...]}: loads a site and its rule sets the way the daemon
 * would and prints either a one-line summary (exit 0) or every problem as {@code FILE:LINE:COLUMN: message}
 * on stderr (exit 2), so an engineer can fix all of them before a night run.
 */
@Command(
        name = "check",
        description = {
            "Check a site file and its rule sets; print a summary, or every error as FILE:LINE:COLUMN: message.",
            "Exit codes: 0 valid, 2 errors found (or a file cannot be read), 1 internal failure."
        },
        mixinStandardHelpOptions = true)
final class CheckCommand implements Callable<Integer> {

    static final int VALID = 0;
    static final int INVALID = 2;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--site", required = true, paramLabel = "FILE", description = "the site file (*-site.yaml)")
    Path site;

    @Option(names = "--rules", arity = "1..*", paramLabel = "FILE",
            description = "rule-set files (*-rules.yaml); repeat the option or list several")
    List<Path> rules = new ArrayList<>();

    @Option(names = "--plugins", paramLabel = "DIR",
            description = "folder of driver plugin jars (default: plugins/ next to the site file)")
    Path plugins;

    private final Optional<DriverSettingsValidator> fixedDrivers;

    /**
     * Checks transports, driver ids, settings and points against the installed drivers (built in, and the plugin
     * jars of the plugins folder), as {@code run} will.
     */
    CheckCommand() {
        this.fixedDrivers = Optional.empty();
    }

    /** With a given driver check, e.g. {@link DriverSettingsValidator#acceptAll()} to test the loader alone. */
    CheckCommand(DriverSettingsValidator drivers) {
        this.fixedDrivers = Optional.of(drivers);
    }

    private DriverSettingsValidator drivers() {
        if (fixedDrivers.isPresent()) {
            return fixedDrivers.get();
        }
        Path folder = plugins != null ? plugins : site.toAbsolutePath().getParent().resolve("plugins");
        DriverCatalog catalog = DriverCatalog.discover(CheckCommand.class.getClassLoader(), Optional.of(folder));
        return parsed -> SiteDrivers.validate(parsed, catalog, TimeSource.system());
    }

    @Override
    public Integer call() {
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        Configuration configuration;
        try {
            configuration = ConfigurationLoader.load(site, rules, drivers());
        } catch (ConfigException e) {
            for (ConfigProblem problem : e.problems()) {
                err.println(problem);
            }
            int count = e.problems().size();
            err.println(count + (count == 1 ? " error" : " errors") + " found; nothing was started");
            err.flush();
            return INVALID;
        }
        DaemonSettings settings;
        try {
            // The daemon's own sections (mqtt, journal, api): TLS files, password files and the like.
            settings = DaemonSettings.read(configuration.site(), RunCommand.folder(site));
        } catch (ConfigException e) {
            for (ConfigProblem problem : e.problems()) {
                err.println(problem);
            }
            int count = e.problems().size();
            err.println(count + (count == 1 ? " error" : " errors") + " found; nothing was started");
            err.flush();
            return INVALID;
        }
        try {
            // The loader should already refuse whatever the engine cannot wire; building it here makes sure that a
            // file `check` accepts is one `run` starts with.
            new Engine(EngineConfig.of(configuration.site(), configuration.rules()), TimeSource.system());
        } catch (IllegalArgumentException refused) {
            err.println(refused.getMessage());
            err.println("1 error found; nothing was started");
            err.flush();
            return INVALID;
        }
        NightSettings night;
        try {
            // The notifiers (roster, secret files), watchdog and common-alarm sections, read as run reads them.
            night = NightSettings.read(configuration, RunCommand.folder(site));
        } catch (ConfigException e) {
            return RunCommand.refuse(err, e);
        }
        for (String warning : settings.warnings()) {
            err.println("warning: " + warning);
        }
        err.flush();
        out.println(summary(configuration) + night.notifiers().map(n -> "; notifiers: " + n.senderIds().size()
                + " senders, " + n.roster().contacts().size() + " contacts on the roster").orElse(""));
        out.flush();
        return VALID;
    }

    static String summary(Configuration configuration) {
        int buses = configuration.site().buses().size();
        int instruments = configuration.instrumentCount();
        int measured = configuration.site().channels().size();
        int derived = configuration.site().derived().size();
        int outputs = configuration.site().outputs().size();
        int rules = configuration.rules().rules().size();
        int interlocks = configuration.rules().interlocks().size();
        int files = configuration.ruleFiles().size();
        return "valid: site '" + configuration.site().name() + "': "
                + count(configuration.channelCount(), "channel") + " (" + measured + " measured, " + derived
                + " derived), " + count(outputs, "output") + ", " + count(rules, "rule") + ", "
                + count(interlocks, "interlock") + " from " + count(files, "rule file") + "; "
                + count(buses, "bus", "buses") + ", " + count(instruments, "instrument");
    }

    private static String count(int n, String noun) {
        return count(n, noun, noun + "s");
    }

    private static String count(int n, String singular, String plural) {
        return n + " " + (n == 1 ? singular : plural);
    }
}
