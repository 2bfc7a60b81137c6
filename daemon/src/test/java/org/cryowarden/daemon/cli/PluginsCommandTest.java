package org.cryowarden.daemon.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

class PluginsCommandTest {

    @TempDir
    Path folder;

    @Test
    void listsTheBuiltInDriversWithVersionAndSource() {
        StringWriter out = new StringWriter();
        CommandLine line = Main.commandLine();
        line.setOut(new PrintWriter(out, true));

        int exit = line.execute("plugins", "--plugins", folder.toString());

        assertThat(exit).isZero();
        assertThat(out.toString()).containsPattern("(?m)^ID +VERSION +SOURCE / DESCRIPTION$")
                .containsPattern("(?m)^modbus-rtu +development +\\S+")
                .containsPattern("(?m)^scpi +development +\\S+")
                .containsPattern("(?m)^line +development +\\S+");
    }

    @Test
    void brokenPluginJarIsReportedAndExitsTwo() throws Exception {
        Path broken = Files.writeString(folder.resolve("broken.jar"), "not a jar");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        CommandLine line = Main.commandLine();
        line.setOut(new PrintWriter(out, true));
        line.setErr(new PrintWriter(err, true));

        int exit = line.execute("plugins", "--plugins", folder.toString());

        assertThat(exit).isEqualTo(2);
        assertThat(out.toString()).contains("modbus-rtu");
        assertThat(err.toString()).startsWith("failed to load " + broken + ": not a readable jar: ");
    }
}
