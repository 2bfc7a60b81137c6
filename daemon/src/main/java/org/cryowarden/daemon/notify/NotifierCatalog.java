package org.cryowarden.daemon.notify;

import java.util.LinkedHashMap;
import java.util.Map;
import java.util.Optional;
import java.util.ServiceConfigurationError;
import java.util.ServiceLoader;
import org.cryowarden.daemon.notify.spi.NotifierFactory;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * The notifier plugins found with {@link ServiceLoader}, built-in ones included. Discovery is defensive: a plugin
 * that fails to load is logged by name and skipped, and of two plugins claiming one kind the first found wins.
 */
public final class NotifierCatalog {

    private static final Logger LOG = LoggerFactory.getLogger(NotifierCatalog.class);

    private final Map<String, NotifierFactory> byKind;

    private NotifierCatalog(Map<String, NotifierFactory> byKind) {
        this.byKind = Map.copyOf(byKind);
    }

    public static NotifierCatalog discover(ClassLoader loader) {
        Map<String, NotifierFactory> found = new LinkedHashMap<>();
        var iterator = ServiceLoader.load(NotifierFactory.class, loader).iterator();
        while (true) {
            NotifierFactory factory;
            try {
                if (!iterator.hasNext()) {
                    break;
                }
                factory = iterator.next();
            } catch (ServiceConfigurationError e) {
                LOG.error("a notifier plugin failed to load and is skipped: {}", e.getMessage());
                continue;
            }
            NotifierFactory earlier = found.putIfAbsent(factory.kind(), factory);
            if (earlier != null) {
                LOG.warn("notifier kind '{}' is claimed by {} and {}; using the first", factory.kind(),
                        earlier.getClass().getName(), factory.getClass().getName());
            } else {
                LOG.debug("notifier plugin '{}' from {}", factory.kind(), factory.getClass().getName());
            }
        }
        return new NotifierCatalog(found);
    }

    public static NotifierCatalog builtIn() {
        return discover(NotifierCatalog.class.getClassLoader());
    }

    public Optional<NotifierFactory> kind(String kind) {
        return Optional.ofNullable(byKind.get(kind));
    }

    public java.util.Set<String> kinds() {
        return new java.util.TreeSet<>(byKind.keySet());
    }
}
