package org.cryowarden.drivers.contract;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.assertThatThrownBy;

import java.io.IOException;
import java.time.Instant;
import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import java.util.ServiceLoader;
import org.cryowarden.drivers.spi.DriverContext;
import org.cryowarden.drivers.spi.DriverFactory;
import org.cryowarden.drivers.spi.InstrumentDriver;
import org.cryowarden.drivers.testing.ScriptedTransport;
import org.cryowarden.rules.ConfigProblem;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.SourcePosition;
import org.cryowarden.rules.VirtualTimeSource;
import org.cryowarden.rules.config.ConfigNode;
import org.cryowarden.rules.model.InstrumentDef;
import org.cryowarden.rules.model.PointDef;
import org.junit.jupiter.api.Test;

/**
 * What every driver, built-in or from a plugin jar, must do. A driver's test extends this class (it ships in the
 * drivers test-jar) and supplies a factory, a valid sample instrument with its site context, and a healthy
 * device; the contract then checks registration, naming, positioned validation, one reading per channel,
 * silence, garbage and a lost transport.
 */
public abstract class DriverContract {

    protected final VirtualTimeSource time = new VirtualTimeSource(Instant.parse("2026-02-03T01:30:00Z"));

    /** The factory under test, as the plugin registers it. */
    protected abstract DriverFactory factory();

    /** An instrument of this driver that validates against {@link #context()}, with at least one input channel. */
    protected abstract InstrumentDef sampleInstrument();

    /** The site's channels and outputs for the sample, on {@link #time}. */
    protected abstract DriverContext context();

    /** A device that answers every query of the sample so that each channel reads GOOD. */
    protected abstract ScriptedTransport.Responder healthyDevice();

    @Test
    void factoryIsRegisteredForServiceLoader() {
        List<Class<?>> registered = new ArrayList<>();
        ServiceLoader.load(DriverFactory.class).stream().forEach(provider -> registered.add(provider.type()));

        assertThat(registered).contains(factory().getClass());
    }

    @Test
    void idIsLowerCaseWithDashesAndVersionAndDescriptionAreGiven() {
        assertThat(factory().id()).matches("[a-z][a-z0-9-]*");
        assertThat(factory().version()).isNotBlank();
        assertThat(factory().description()).isNotBlank();
    }

    @Test
    void sampleInstrumentValidates() {
        assertThat(factory().validate(sampleInstrument(), context())).isEmpty();
    }

    @Test
    void unknownInstrumentKeyIsReportedAtTheKey() {
        InstrumentDef sample = sampleInstrument();
        SourcePosition keyPosition = new SourcePosition("contract.yaml", 41, 5);
        InstrumentDef typo = new InstrumentDef(sample.id(), sample.driver(), withKey(sample.settings(), keyPosition),
                sample.points(), sample.position());

        List<ConfigProblem> problems = factory().validate(typo, context());

        assertThat(problems).anySatisfy(problem -> {
            assertThat(problem.position()).isEqualTo(keyPosition);
            assertThat(problem.message()).contains("'bogus_key'");
        });
    }

    @Test
    void unknownPointKeyIsReportedAtTheKey() {
        InstrumentDef sample = sampleInstrument();
        PointDef first = sample.points().get(0);
        SourcePosition keyPosition = new SourcePosition("contract.yaml", 52, 9);
        List<PointDef> points = new ArrayList<>(sample.points());
        points.set(0, new PointDef(first.channel(), first.output(), withKey(first.settings(), keyPosition),
                first.position()));

        List<ConfigProblem> problems = factory().validate(new InstrumentDef(sample.id(), sample.driver(),
                sample.settings(), points, sample.position()), context());

        assertThat(problems).anySatisfy(problem -> {
            assertThat(problem.position()).isEqualTo(keyPosition);
            assertThat(problem.message()).contains("'bogus_key'");
        });
    }

    @Test
    void pointNamingAChannelTheSiteLacksIsReported() {
        DriverContext empty = new DriverContext(java.util.Map.of(), java.util.Map.of(), time);

        assertThat(factory().validate(sampleInstrument(), empty)).isNotEmpty();
    }

    @Test
    void createRefusesAnInstrumentThatDoesNotValidate() {
        InstrumentDef sample = sampleInstrument();
        InstrumentDef typo = new InstrumentDef(sample.id(), sample.driver(),
                withKey(sample.settings(), SourcePosition.NONE), sample.points(), sample.position());

        assertThatThrownBy(() -> factory().create(typo, context())).isInstanceOf(IllegalArgumentException.class);
    }

    @Test
    void healthyDeviceGivesOneGoodReadingPerChannelStampedByTheClock() throws IOException {
        ScriptedTransport transport = open(healthyDevice());
        InstrumentDriver driver = factory().create(sampleInstrument(), context());
        driver.connect(transport);

        List<Reading> readings = driver.poll(inputChannels(), transport);

        assertThat(readings).extracting(Reading::channel).containsExactlyElementsOf(inputChannels());
        assertThat(readings).allSatisfy(reading -> {
            assertThat(reading.quality()).as(reading.reason()).isEqualTo(Quality.GOOD);
            assertThat(reading.timestamp()).isEqualTo(time.wallNow());
            assertThat(reading.unit()).isEqualTo(context().channels().get(reading.channel()).unit());
        });
        assertThat(driver.counters().values().stream().mapToLong(Long::longValue).sum()).isPositive();
    }

    @Test
    void silentDeviceGivesOneNonGoodReadingPerChannelWithAReason() throws IOException {
        ScriptedTransport transport = open(written -> new byte[0]);
        InstrumentDriver driver = factory().create(sampleInstrument(), context());
        driver.connect(transport);

        List<Reading> readings = driver.poll(inputChannels(), transport);

        assertThat(readings).hasSize(inputChannels().size()).allSatisfy(reading -> {
            assertThat(reading.quality()).isIn(Quality.STALE, Quality.BAD);
            assertThat(reading.reason()).isNotBlank();
        });
    }

    @Test
    void garbageNeverEscapesAsAnExceptionAndEveryReadingHasAReason() throws IOException {
        Random random = new Random(43);
        ScriptedTransport transport = open(written -> {
            byte[] garbage = new byte[random.nextInt(300)];
            random.nextBytes(garbage);
            return garbage;
        });
        InstrumentDriver driver = factory().create(sampleInstrument(), context());
        driver.connect(transport);

        for (int round = 0; round < 300; round++) {
            List<Reading> readings = driver.poll(inputChannels(), transport);
            assertThat(readings).hasSize(inputChannels().size());
            for (Reading reading : readings) {
                assertThat(reading.quality().isGood() || !reading.reason().isBlank()).isTrue();
            }
        }
    }

    @Test
    void lostTransportSurfacesAsIoExceptionForThePoller() throws IOException {
        ScriptedTransport transport = open(healthyDevice());
        InstrumentDriver driver = factory().create(sampleInstrument(), context());
        driver.connect(transport);
        transport.unplug("adapter unplugged");

        assertThatThrownBy(() -> driver.poll(inputChannels(), transport)).isInstanceOf(IOException.class)
                .hasMessage("adapter unplugged");
    }

    /** The input channels of the sample, in point order. */
    protected List<String> inputChannels() {
        return sampleInstrument().points().stream().filter(p -> !p.output()).map(PointDef::channel).toList();
    }

    private static ScriptedTransport open(ScriptedTransport.Responder device) throws IOException {
        ScriptedTransport transport = new ScriptedTransport(device, java.util.OptionalInt.of(115200));
        transport.reopen();
        return transport;
    }

    private static ConfigNode.Mapping withKey(ConfigNode.Mapping settings, SourcePosition keyPosition) {
        List<ConfigNode.Entry> entries = new ArrayList<>(settings.entries());
        entries.add(new ConfigNode.Entry("bogus_key", keyPosition, new ConfigNode.Scalar("1", false, keyPosition)));
        return new ConfigNode.Mapping(entries, settings.position());
    }
}
