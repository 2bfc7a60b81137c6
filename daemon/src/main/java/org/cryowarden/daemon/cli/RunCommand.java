package org.cryowarden.daemon.cli;

import java.io.PrintWriter;
import java.lang.reflect.InvocationHandler;
import java.lang.reflect.Proxy;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.concurrent.Callable;
import java.util.concurrent.CountDownLatch;
import org.cryowarden.daemon.api.ApiServer;
import org.cryowarden.daemon.run.Daemon;
import org.cryowarden.daemon.run.DaemonSettings;
import org.cryowarden.daemon.run.NightSettings;
import org.cryowarden.daemon.run.SiteSetup;
import org.cryowarden.drivers.plugin.DriverCatalog;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.TimeSource;
import org.cryowarden.rules.config.Configuration;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;

/**
 * {@code cryowarden run --site FILE [--rules FILE...]}: the daemon a lab runs all night. Refuses to start on any
 * problem {@code check} would report (same {@code FILE:LINE:COLUMN} lines, exit 2), then runs until stopped by
 * SIGTERM/SIGINT; SIGHUP reloads the files.
 */
@Command(
        name = "run",
        description = {
            "Run the daemon: poll the site's buses, evaluate the rules, journal and publish on MQTT.",
            "SIGHUP (or `cryowarden reload`) re-reads the files; SIGTERM stops cleanly.",
            "cryowarden is a supervisory layer, not a certified safety system: it never replaces hardwired",
            "oxygen monitoring, relief devices or local codes."
        },
        mixinStandardHelpOptions = true)
final class RunCommand implements Callable<Integer> {

    private static final Logger LOG = LoggerFactory.getLogger(RunCommand.class);

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Option(names = "--site", required = true, paramLabel = "FILE", description = "the site file (*-site.yaml)")
    Path site;

    @Option(names = "--rules", arity = "1..*", paramLabel = "FILE", description = "rule-set files (*-rules.yaml)")
    List<Path> rules = new ArrayList<>();

    @Option(names = "--plugins", paramLabel = "DIR", description = "folder of extra driver plugin jars")
    Optional<Path> plugins = Optional.empty();

    @Option(names = "--journal", paramLabel = "FILE", description = "journal file (overrides the site file)")
    Optional<Path> journal = Optional.empty();

    @Option(names = "--log-file", paramLabel = "FILE",
            description = "also log to this file, rolled daily and at 10 MB, 30 days kept (stdout stays on)")
    Optional<Path> logFile = Optional.empty();

    @Override
    public Integer call() throws Exception {
        PrintWriter err = spec.commandLine().getErr();
        Logging.use("/org/cryowarden/daemon/run-logback.xml");
        if (logFile.isPresent()) {
            Logging.alsoToFile(logFile.get());
        }
        DriverCatalog catalog = DriverCatalog.discover(RunCommand.class.getClassLoader(), plugins);
        Configuration configuration;
        DaemonSettings settings;
        NightSettings night;
        try {
            configuration = SiteSetup.load(site, rules, catalog, TimeSource.system());
            settings = DaemonSettings.read(configuration.site(), folder(site));
            night = NightSettings.read(configuration, folder(site));
        } catch (ConfigException e) {
            return refuse(err, e);
        }
        if (journal.isPresent()) {
            settings = settings.withJournal(journal.get());
        }
        Daemon daemon;
        try {
            daemon = Daemon.start(site, rules, configuration, settings, night, catalog, TimeSource.system(),
                    Daemon.Options.defaults());
        } catch (Daemon.StartException e) {
            err.println("cannot start: " + e.getMessage());
            err.flush();
            return CheckCommand.INVALID;
        }
        Optional<ApiServer> api;
        try {
            api = ApiServer.startIfEnabled(daemon);
        } catch (java.io.IOException e) {
            daemon.close();
            err.println("cannot start the HTTP API: " + e.getMessage());
            err.flush();
            return CheckCommand.INVALID;
        }
        CountDownLatch stopped = new CountDownLatch(1);
        Thread hook = new Thread(() -> {
            api.ifPresent(ApiServer::close);
            daemon.close();
            stopped.countDown();
        }, "shutdown");
        Runtime.getRuntime().addShutdownHook(hook);
        onHangup(() -> new Thread(daemon::reload, "reload").start());
        stopped.await();
        return 0;
    }

    static int refuse(PrintWriter err, ConfigException e) {
        for (ConfigProblem problem : e.problems()) {
            err.println(problem);
        }
        int count = e.problems().size();
        err.println(count + (count == 1 ? " error" : " errors") + " found; nothing was started");
        err.flush();
        return CheckCommand.INVALID;
    }

    static Path folder(Path file) {
        Path parent = file.toAbsolutePath().getParent();
        return parent == null ? Path.of(".") : parent;
    }

    /** Calls {@code action} on SIGHUP where the JVM offers {@code sun.misc.Signal}; elsewhere reload is API-only. */
    static void onHangup(Runnable action) {
        try {
            Class<?> signalClass = Class.forName("sun.misc.Signal");
            Class<?> handlerClass = Class.forName("sun.misc.SignalHandler");
            Object signal = signalClass.getConstructor(String.class).newInstance("HUP");
            InvocationHandler handler = (proxy, method, args) -> {
                if (method.getName().equals("handle")) {
                    LOG.info("SIGHUP: reloading the configuration");
                    action.run();
                }
                return null;
            };
            Object proxy = Proxy.newProxyInstance(handlerClass.getClassLoader(), new Class<?>[] {handlerClass},
                    handler);
            signalClass.getMethod("handle", signalClass, handlerClass).invoke(null, signal, proxy);
        } catch (ReflectiveOperationException | RuntimeException e) {
            LOG.info("SIGHUP is not available here ({}); use `cryowarden reload`", e.toString());
        }
    }
}
