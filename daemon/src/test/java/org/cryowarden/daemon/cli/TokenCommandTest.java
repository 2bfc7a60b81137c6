package org.cryowarden.daemon.cli;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.cryowarden.daemon.access.TokenHash;
import org.junit.jupiter.api.Test;
import picocli.CommandLine;

class TokenCommandTest {

    @Test
    void newTokenPrintsATokenAndTheSiteFileLineWithItsHash() {
        StringWriter out = new StringWriter();
        CommandLine line = Main.commandLine();
        line.setOut(new PrintWriter(out));

        int exit = line.execute("token", "new", "--operator", "ada", "--role", "supervisor");

        assertThat(exit).isZero();
        String[] lines = out.toString().split("\n");
        String token = lines[1].strip();
        Matcher entry = Pattern.compile("  ada: \\{role: supervisor, token_hash: \"(sha256:[A-Za-z0-9_-]{43})\"}")
                .matcher(lines[3]);
        assertThat(entry.matches()).as(lines[3]).isTrue();
        assertThat(TokenHash.parse(entry.group(1)).matches(token)).isTrue();
    }

    @Test
    void unknownRoleIsRefused() {
        CommandLine line = Main.commandLine();
        line.setErr(new PrintWriter(new StringWriter()));
        assertThat(line.execute("token", "new", "--operator", "ada", "--role", "boss")).isEqualTo(2);
    }
}
