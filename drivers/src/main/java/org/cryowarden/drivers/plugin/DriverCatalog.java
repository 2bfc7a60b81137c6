package org.cryowarden.drivers.plugin;

import java.io.IOException;
import java.net.MalformedURLException;
import java.net.URL;
import java.net.URLClassLoader;
import java.nio.file.DirectoryStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.CodeSource;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Objects;
import java.util.Optional;
import java.util.ServiceConfigurationError;
import java.util.ServiceLoader;
import java.util.jar.JarFile;
import org.cryowarden.drivers.spi.DriverFactory;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Every driver the program can use: those on the class path (the built-in ones, registered in
 * {@code META-INF/services} like any plugin) and those in the jars of a plugins folder, each jar in its own class
 * loader. Discovery is defensive: a provider that fails to load or to answer is reported by name with the reason
 * and skipped; of two drivers claiming one id the first found wins and the other is reported. A plugins folder
 * or jar that other users could write, or that another user owns, is refused ({@link PluginFileTrust}).
 */
public final class DriverCatalog {

    private static final Logger LOG = LoggerFactory.getLogger(DriverCatalog.class);

    private final List<LoadedDriver> drivers;
    private final List<LoadFailure> failures;

    private DriverCatalog(List<LoadedDriver> drivers, List<LoadFailure> failures) {
        this.drivers = List.copyOf(drivers);
        this.failures = List.copyOf(failures);
    }

    /** A driver found, with where it came from (a jar path, or a class folder during development). */
    public record LoadedDriver(DriverFactory factory, String id, String version, String description, String source) {
        public LoadedDriver {
            Objects.requireNonNull(factory, "factory");
        }
    }

    /** A plugin that could not be used: the provider class or jar, and why. */
    public record LoadFailure(String name, String reason) {
    }

    /**
     * Discovers the drivers visible to {@code classLoader} and, when {@code pluginFolder} is given and exists, those
     * in its jars. A missing folder is not an error (most sites have no plugins).
     */
    public static DriverCatalog discover(ClassLoader classLoader, Optional<Path> pluginFolder) {
        List<LoadedDriver> drivers = new ArrayList<>();
        List<LoadFailure> failures = new ArrayList<>();
        load(ServiceLoader.load(DriverFactory.class, classLoader), null, "", drivers, failures);
        if (pluginFolder.isPresent() && Files.isDirectory(pluginFolder.get())) {
            PluginFileTrust trust = new PluginFileTrust(System.getProperty("user.name"));
            Path folder = pluginFolder.get();
            Optional<String> folderRefusal = trust.refusal(realPath(folder));
            if (folderRefusal.isPresent()) {
                failures.add(new LoadFailure(folder.toString(), "plugins folder refused, no plugin loaded from it: "
                        + folderRefusal.get()));
                LOG.warn("plugins folder {} refused: {}", folder, folderRefusal.get());
            } else {
                for (Path jar : jars(folder, failures)) {
                    Optional<String> jarRefusal = trust.refusal(jar);
                    if (jarRefusal.isPresent()) {
                        failures.add(new LoadFailure(jar.toString(), "plugin refused: " + jarRefusal.get()));
                        LOG.warn("plugin {} refused: {}", jar, jarRefusal.get());
                    } else {
                        loadJar(jar, classLoader, drivers, failures);
                    }
                }
            }
        }
        return new DriverCatalog(drivers, failures);
    }

    public List<LoadedDriver> drivers() {
        return drivers;
    }

    public List<LoadFailure> failures() {
        return failures;
    }

    public Optional<DriverFactory> find(String id) {
        return drivers.stream().filter(d -> d.id().equals(id)).map(LoadedDriver::factory).findFirst();
    }

    public List<String> ids() {
        return drivers.stream().map(LoadedDriver::id).toList();
    }

    /** The configured folder may be a link (to a versioned install, say); its target is what must be trusted. */
    private static Path realPath(Path folder) {
        try {
            return folder.toRealPath();
        } catch (IOException e) {
            return folder;
        }
    }

    private static List<Path> jars(Path folder, List<LoadFailure> failures) {
        List<Path> jars = new ArrayList<>();
        try (DirectoryStream<Path> listing = Files.newDirectoryStream(folder, "*.jar")) {
            listing.forEach(path -> {
                if (Files.isRegularFile(path) || Files.isSymbolicLink(path)) {
                    jars.add(path);
                }
            });
        } catch (IOException e) {
            failures.add(new LoadFailure(folder.toString(), "cannot list the plugins folder: " + e.getMessage()));
        }
        jars.sort(null);
        return jars;
    }

    private static void loadJar(Path jar, ClassLoader parent, List<LoadedDriver> drivers, List<LoadFailure> failures) {
        try (JarFile check = new JarFile(jar.toFile())) {
            if (check.getEntry("META-INF/services/" + DriverFactory.class.getName()) == null) {
                failures.add(new LoadFailure(jar.toString(), "no META-INF/services/" + DriverFactory.class.getName()
                        + " in the jar, so it registers no driver"));
                return;
            }
        } catch (IOException e) {
            failures.add(new LoadFailure(jar.toString(), "not a readable jar: " + e.getMessage()));
            return;
        }
        URL url;
        try {
            url = jar.toUri().toURL();
        } catch (MalformedURLException e) {
            failures.add(new LoadFailure(jar.toString(), "bad path: " + e.getMessage()));
            return;
        }
        // Kept open for the life of the program: the plugin's classes load lazily from it.
        URLClassLoader loader = new URLClassLoader("plugin " + jar.getFileName(), new URL[] {url}, parent);
        load(ServiceLoader.load(DriverFactory.class, loader), loader, " (" + jar + ")", drivers, failures);
    }

    /**
     * @param only   when not null, keep only providers defined by this loader (not the parent's again)
     * @param origin appended to failure names: " (/path/plugin.jar)", or empty for the class path
     */
    private static void load(ServiceLoader<DriverFactory> loader, ClassLoader only, String origin,
            List<LoadedDriver> drivers, List<LoadFailure> failures) {
        Iterator<DriverFactory> providers = loader.iterator();
        while (true) {
            DriverFactory factory;
            try {
                if (!providers.hasNext()) {
                    return;
                }
                factory = providers.next();
            } catch (ServiceConfigurationError | LinkageError e) {
                String message = e.getMessage() == null ? e.toString() : e.getMessage();
                failures.add(new LoadFailure(providerName(message) + origin, message
                        + (e.getCause() != null ? " (" + e.getCause() + ")" : "")));
                LOG.warn("driver plugin failed to load: {}", message);
                continue;
            }
            if (only != null && factory.getClass().getClassLoader() != only) {
                continue;
            }
            add(factory, drivers, failures);
        }
    }

    private static void add(DriverFactory factory, List<LoadedDriver> drivers, List<LoadFailure> failures) {
        String type = factory.getClass().getName();
        String source = source(factory.getClass());
        String id;
        String version;
        String description;
        try {
            id = factory.id();
            version = factory.version();
            description = factory.description();
        } catch (RuntimeException | LinkageError e) {
            failures.add(new LoadFailure(type + " (" + source + ")", "failed to name itself: " + e));
            return;
        }
        if (id == null || !id.matches("[a-z][a-z0-9-]*")) {
            failures.add(new LoadFailure(type + " (" + source + ")", "driver id must be lower case letters, digits "
                    + "and dashes, got '" + id + "'"));
            return;
        }
        for (LoadedDriver existing : drivers) {
            if (existing.id().equals(id)) {
                String reason = "driver id '" + id + "' is already provided by " + existing.factory().getClass().getName()
                        + " (" + existing.source() + "); this one is ignored";
                failures.add(new LoadFailure(type + " (" + source + ")", reason));
                LOG.warn("duplicate driver: {}", reason);
                return;
            }
        }
        String shownVersion = version == null || version.isBlank() ? "unknown" : version;
        drivers.add(new LoadedDriver(factory, id, shownVersion, description == null ? "" : description, source));
        LOG.info("driver '{}' version {} from {}", id, shownVersion, source);
    }

    private static String source(Class<?> type) {
        CodeSource code = type.getProtectionDomain().getCodeSource();
        if (code == null || code.getLocation() == null) {
            return "(unknown source)";
        }
        try {
            return Path.of(code.getLocation().toURI()).toString();
        } catch (Exception e) {
            return code.getLocation().toString();
        }
    }

    private static String providerName(String message) {
        int start = message.indexOf("Provider ");
        if (start >= 0) {
            String rest = message.substring(start + "Provider ".length());
            int end = rest.indexOf(' ');
            return end < 0 ? rest : rest.substring(0, end);
        }
        return "(unnamed provider)";
    }
}
