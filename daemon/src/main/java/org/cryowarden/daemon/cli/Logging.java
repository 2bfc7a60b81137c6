package org.cryowarden.daemon.cli;

import ch.qos.logback.classic.Logger;
import ch.qos.logback.classic.LoggerContext;
import ch.qos.logback.classic.encoder.PatternLayoutEncoder;
import ch.qos.logback.classic.joran.JoranConfigurator;
import ch.qos.logback.classic.spi.ILoggingEvent;
import ch.qos.logback.core.joran.spi.JoranException;
import ch.qos.logback.core.rolling.RollingFileAppender;
import ch.qos.logback.core.rolling.SizeAndTimeBasedRollingPolicy;
import ch.qos.logback.core.util.FileSize;
import java.net.URL;
import java.nio.file.Path;
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

    /**
     * Adds a rolling log file beside the configured output: rolled daily and at 10 MB, 30 days and 1 GB kept, the
     * same one-line format. Called once at the start of {@code run}.
     */
    static void alsoToFile(Path file) {
        if (!(LoggerFactory.getILoggerFactory() instanceof LoggerContext context)) {
            return;
        }
        String base = file.toAbsolutePath().toString();
        PatternLayoutEncoder encoder = new PatternLayoutEncoder();
        encoder.setContext(context);
        encoder.setPattern("%d{yyyy-MM-dd'T'HH:mm:ss.SSSX,UTC} %-5level %logger{1} - %msg%n");
        encoder.start();
        RollingFileAppender<ILoggingEvent> appender = new RollingFileAppender<>();
        appender.setContext(context);
        appender.setName("FILE");
        appender.setFile(base);
        appender.setEncoder(encoder);
        SizeAndTimeBasedRollingPolicy<ILoggingEvent> policy = new SizeAndTimeBasedRollingPolicy<>();
        policy.setContext(context);
        policy.setParent(appender);
        policy.setFileNamePattern(base + ".%d{yyyy-MM-dd}.%i.gz");
        policy.setMaxFileSize(FileSize.valueOf("10MB"));
        policy.setMaxHistory(30);
        policy.setTotalSizeCap(FileSize.valueOf("1GB"));
        policy.start();
        appender.setRollingPolicy(policy);
        appender.start();
        context.getLogger(Logger.ROOT_LOGGER_NAME).addAppender(appender);
    }
}
