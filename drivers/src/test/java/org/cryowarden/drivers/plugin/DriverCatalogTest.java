package org.cryowarden.drivers.plugin;

import static org.assertj.core.api.Assertions.assertThat;

import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import java.util.Optional;
import java.util.jar.JarEntry;
import java.util.jar.JarOutputStream;
import javax.tools.JavaCompiler;
import javax.tools.ToolProvider;
import java.nio.file.attribute.PosixFilePermissions;
import java.nio.file.attribute.UserPrincipal;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

class DriverCatalogTest {

    private static final String SERVICES = "META-INF/services/org.cryowarden.drivers.spi.DriverFactory";

    @TempDir
    Path folder;

    @Test
    void builtInDriversAreFoundThroughServiceLoaderLikeAnyPlugin() {
        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.empty());

        assertThat(catalog.ids()).containsExactly("modbus-rtu", "scpi", "line");
        assertThat(catalog.failures()).isEmpty();
        assertThat(catalog.drivers()).allSatisfy(d -> assertThat(d.source()).endsWith("classes"));
    }

    @Test
    void pluginJarInTheFolderIsLoadedAndNamesItsJar() throws Exception {
        Path jar = pluginJar("vacuum-gauge.jar", "demo.VacuumGaugeFactory", factorySource("demo", "VacuumGaugeFactory",
                "vacuum-gauge", "constructor-ok"));

        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.of(folder));

        assertThat(catalog.ids()).containsExactly("modbus-rtu", "scpi", "line", "vacuum-gauge");
        DriverCatalog.LoadedDriver plugin = catalog.drivers().get(3);
        assertThat(plugin.source()).isEqualTo(jar.toString());
        assertThat(plugin.version()).isEqualTo("2.4.1");
        assertThat(catalog.find("vacuum-gauge")).isPresent();
    }

    @Test
    void brokenPluginIsReportedByNameAndTheOthersStillLoad() throws Exception {
        Path jar = pluginJar("broken.jar", "demo.Missing\ndemo.ThrowingFactory\ndemo.GoodFactory",
                factorySource("demo", "ThrowingFactory", "never", "throw"),
                factorySource("demo", "GoodFactory", "level-probe", "constructor-ok"));

        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.of(folder));

        assertThat(catalog.ids()).contains("level-probe");
        assertThat(catalog.failures()).extracting(DriverCatalog.LoadFailure::name)
                .containsExactly("demo.Missing (" + jar + ")", "demo.ThrowingFactory (" + jar + ")");
        assertThat(catalog.failures().get(0).reason()).contains("demo.Missing not found");
        assertThat(catalog.failures().get(1).reason()).contains("could not be instantiated");
    }

    @Test
    void secondDriverClaimingAnIdIsIgnoredAndReported() throws Exception {
        Path jar = pluginJar("impostor.jar", "demo.ScpiAgain", factorySource("demo", "ScpiAgain", "scpi", "constructor-ok"));

        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.of(folder));

        assertThat(catalog.ids()).containsExactly("modbus-rtu", "scpi", "line");
        assertThat(catalog.failures()).singleElement().satisfies(failure -> {
            assertThat(failure.name()).isEqualTo("demo.ScpiAgain (" + jar + ")");
            assertThat(failure.reason()).startsWith("driver id 'scpi' is already provided by "
                    + "org.cryowarden.drivers.builtin.ScpiDriverFactory (");
            assertThat(failure.reason()).endsWith("); this one is ignored");
        });
    }

    @Test
    void fileThatIsNotAJarIsReported() throws Exception {
        Path notAJar = Files.writeString(folder.resolve("notes.jar"), "not a zip");
        Files.writeString(folder.resolve("readme.txt"), "ignored");

        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.of(folder));

        assertThat(catalog.failures()).singleElement().satisfies(failure -> {
            assertThat(failure.name()).isEqualTo(notAJar.toString());
            assertThat(failure.reason()).startsWith("not a readable jar: ");
        });
    }

    @Test
    void missingPluginsFolderIsNotAnError() {
        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.of(folder.resolve("none")));

        assertThat(catalog.failures()).isEmpty();
        assertThat(catalog.ids()).hasSize(3);
    }

    @Test
    void jarWritableByOtherUsersIsRefusedWithTheChmodFix() throws Exception {
        Path jar = pluginJar("open.jar", "demo.OpenFactory", factorySource("demo", "OpenFactory", "open-gauge",
                "constructor-ok"));
        Files.setPosixFilePermissions(jar, PosixFilePermissions.fromString("rw-rw-rw-"));

        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.of(folder));

        assertThat(catalog.ids()).doesNotContain("open-gauge");
        assertThat(catalog.failures()).singleElement().satisfies(failure -> {
            assertThat(failure.name()).isEqualTo(jar.toString());
            assertThat(failure.reason()).isEqualTo("plugin refused: the file is writable by other users; "
                    + "fix with: chmod go-w " + jar);
        });
    }

    @Test
    void jarWritableByItsGroupIsRefused() throws Exception {
        Path jar = pluginJar("group.jar", "demo.GroupFactory", factorySource("demo", "GroupFactory", "group-gauge",
                "constructor-ok"));
        Files.setPosixFilePermissions(jar, PosixFilePermissions.fromString("rw-rw-r--"));

        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.of(folder));

        assertThat(catalog.ids()).doesNotContain("group-gauge");
        assertThat(catalog.failures()).singleElement().extracting(DriverCatalog.LoadFailure::reason)
                .isEqualTo("plugin refused: the file is writable by its group; fix with: chmod go-w " + jar);
    }

    @Test
    void folderWritableByOtherUsersIsRefusedAndNothingLoadsFromIt() throws Exception {
        pluginJar("fine.jar", "demo.FineFactory", factorySource("demo", "FineFactory", "fine-gauge", "constructor-ok"));
        Files.setPosixFilePermissions(folder, PosixFilePermissions.fromString("rwxrwxrwx"));

        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.of(folder));

        assertThat(catalog.ids()).containsExactly("modbus-rtu", "scpi", "line");
        assertThat(catalog.failures()).singleElement().satisfies(failure -> {
            assertThat(failure.name()).isEqualTo(folder.toString());
            assertThat(failure.reason()).isEqualTo("plugins folder refused, no plugin loaded from it: the folder is "
                    + "writable by other users; fix with: chmod go-w " + folder.toRealPath());
        });
    }

    @Test
    void jarOwnedByAnotherUserIsRefused() throws Exception {
        Path jar = pluginJar("theirs.jar", "demo.TheirFactory", factorySource("demo", "TheirFactory", "their-gauge",
                "constructor-ok"));
        UserPrincipal nobody;
        try {
            nobody = folder.getFileSystem().getUserPrincipalLookupService().lookupPrincipalByName("nobody");
            Files.setOwner(jar, nobody);
        } catch (IOException e) {
            Assumptions.abort("cannot give a file to user nobody here (needs root): " + e);
            return;
        }

        DriverCatalog catalog = DriverCatalog.discover(getClass().getClassLoader(), Optional.of(folder));

        assertThat(catalog.ids()).doesNotContain("their-gauge");
        assertThat(catalog.failures()).singleElement().extracting(DriverCatalog.LoadFailure::reason)
                .isEqualTo("plugin refused: the file belongs to 'nobody', not to the daemon's user '"
                        + System.getProperty("user.name") + "' or root; fix with: chown "
                        + System.getProperty("user.name") + " " + jar);
    }

    /** A minimal plugin factory; {@code behaviour} "throw" makes its constructor fail. */
    private static Map.Entry<String, String> factorySource(String pkg, String name, String id, String behaviour) {
        String constructor = behaviour.equals("throw")
                ? "public " + name + "() { throw new IllegalStateException(\"no licence file\"); }"
                : "public " + name + "() { }";
        String source = "package " + pkg + ";\n"
                + "import java.util.List;\n"
                + "import org.cryowarden.drivers.spi.*;\n"
                + "import org.cryowarden.rules.ConfigProblem;\n"
                + "import org.cryowarden.rules.model.InstrumentDef;\n"
                + "public final class " + name + " implements DriverFactory {\n"
                + "  " + constructor + "\n"
                + "  public String id() { return \"" + id + "\"; }\n"
                + "  public String version() { return \"2.4.1\"; }\n"
                + "  public String description() { return \"test plugin\"; }\n"
                + "  public List<ConfigProblem> validate(InstrumentDef i, DriverContext c) { return List.of(); }\n"
                + "  public InstrumentDriver create(InstrumentDef i, DriverContext c) { throw new UnsupportedOperationException(); }\n"
                + "}\n";
        return Map.entry(pkg + "." + name, source);
    }

    @SafeVarargs
    private Path pluginJar(String jarName, String services, Map.Entry<String, String>... sources) throws IOException {
        Path src = Files.createDirectories(folder.resolve("src-" + jarName));
        Path classes = Files.createDirectories(folder.resolve("classes-" + jarName));
        String[] args = new String[sources.length + 4];
        args[0] = "-d";
        args[1] = classes.toString();
        args[2] = "-cp";
        args[3] = System.getProperty("java.class.path");
        for (int i = 0; i < sources.length; i++) {
            Path file = src.resolve(sources[i].getKey().replace('.', '/') + ".java");
            Files.createDirectories(file.getParent());
            Files.writeString(file, sources[i].getValue());
            args[4 + i] = file.toString();
        }
        JavaCompiler compiler = ToolProvider.getSystemJavaCompiler();
        assertThat(compiler.run(null, null, null, args)).isZero();
        Path jar = folder.resolve(jarName);
        Files.createDirectories(folder.resolve("build-" + jarName + ".jar")); // a folder named like a jar is skipped
        try (JarOutputStream out = new JarOutputStream(Files.newOutputStream(jar))) {
            out.putNextEntry(new JarEntry(SERVICES));
            out.write((services + "\n").getBytes(StandardCharsets.UTF_8));
            out.closeEntry();
            try (var files = Files.walk(classes)) {
                for (Path file : files.filter(Files::isRegularFile).toList()) {
                    out.putNextEntry(new JarEntry(classes.relativize(file).toString().replace('\\', '/')));
                    copy(file, out);
                    out.closeEntry();
                }
            }
        }
        return jar;
    }

    private static void copy(Path file, OutputStream out) throws IOException {
        out.write(Files.readAllBytes(file));
    }
}
