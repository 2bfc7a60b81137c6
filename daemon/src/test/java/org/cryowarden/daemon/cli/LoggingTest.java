package org.cryowarden.daemon.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.slf4j.LoggerFactory;

class LoggingTest {

    @TempDir
    Path folder;

    @AfterEach
    void restoreDefaultLogging() {
        Logging.use("/logback.xml");
    }

    @Test
    void runLogLinesAlsoGoToTheRollingFileWhenOneIsGiven() throws Exception {
        Path file = folder.resolve("cryowarden.log");
        Logging.use("/org/cryowarden/daemon/run-logback.xml");
        Logging.alsoToFile(file);

        LoggerFactory.getLogger("org.cryowarden.daemon.run.Daemon").info("alarm.raised o2-magnet-hall-low");

        assertThat(Files.readString(file)).containsPattern(
                "^\\d{4}-\\d\\d-\\d\\dT\\d\\d:\\d\\d:\\d\\d\\.\\d{3}Z INFO  o\\.c\\.d\\.r\\.Daemon - alarm.raised o2-magnet-hall-low\\n$");
    }
}
