package org.cryowarden.daemon.cli;

import ch.qos.logback.classic.LoggerContext;
import ch.qos.logback.classic.joran.JoranConfigurator;
import ch.qos.logback.core.joran.spi.JoranException;
import java.net.URL;
import org.slf4j.LoggerFactory;

/** Switches Logback to another of our configurations at the start of a long-running command. */
final class Logging {

    private Logging() {
    }

    /** Loads {@code resource} from the class path in place of the default (warnings to stderr) configuration. */
    static void use(String resource) {
        if (!(LoggerFactory.getILoggerFactory() instanceof LoggerContext context)) {
            return;
        }
        URL url = Logging.class.getResource(resource);
        if (url == null) {
            return;
        }
        context.reset();
        JoranConfigurator configurator = new JoranConfigurator();
        configurator.setContext(context);
        try {
            configurator.doConfigure(url);
        } catch (JoranException e) {
            System.err.println("cannot configure logging from " + resource + ": " + e.getMessage());
        }
    }
}
