package org.cryowarden.daemon.cli;

import com.fasterxml.jackson.core.JsonProcessingException;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.PrintWriter;
import java.nio.file.Path;
import java.time.Duration;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.cryowarden.rules.ConfigException;
import org.cryowarden.rules.Dimension;
import org.cryowarden.rules.DurationSyntax;
import org.cryowarden.rules.PressureReference;
import org.cryowarden.rules.Quantity;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.physics.BoilOff;
import org.cryowarden.rules.physics.Cryogen;
import org.cryowarden.rules.physics.FailureMode;
import org.cryowarden.rules.physics.GasExpansion;
import org.cryowarden.rules.physics.Helium4VapourPressure;
import org.cryowarden.rules.physics.HeliumSaturation;
import org.cryowarden.rules.physics.OdhAssessment;
import org.cryowarden.rules.physics.OdhRoom;
import org.cryowarden.rules.physics.OdhRoomReader;
import org.cryowarden.rules.physics.OxygenDilution;
import org.cryowarden.rules.physics.PlatinumResistanceThermometer;
import org.cryowarden.rules.physics.Ventilation;
import picocli.CommandLine;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * {@code cryowarden calc TOPIC}: the sums a cryogenics engineer does by hand, from the same physics classes the
 * daemon uses. Each topic prints a short answer, or with {@code --json} one JSON object with fixed keys whose
 * names carry the units. Bad input (a value out of an equation's range, a wrong unit) exits 2 with the reason on
 * stderr.
 */
@Command(
        name = "calc",
        description = {"Cryogenic sums: helium vapour pressure, platinum thermometers, boil-off, gas expansion,",
            "oxygen after a release, ODH class of a room."},
        subcommands = {
            CalcCommand.He4Temperature.class,
            CalcCommand.He4Pressure.class,
            CalcCommand.PrtTemperature.class,
            CalcCommand.PrtResistance.class,
            CalcCommand.BoilOffTopic.class,
            CalcCommand.Expansion.class,
            CalcCommand.Oxygen.class,
            CalcCommand.Odh.class
        })
final class CalcCommand implements Runnable {

    static final int BAD_INPUT = 2;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    /**
     * The {@code calc} command tree. Its topics take quantities such as {@code -196C} as positional
     * parameters, so an argument that starts with '-' and is no known option is a parameter, not an error.
     */
    static CommandLine commandLine() {
        CommandLine calc = new CommandLine(new CalcCommand());
        for (CommandLine topic : calc.getSubcommands().values()) {
            topic.setUnmatchedOptionsArePositionalParams(true);
        }
        return calc;
    }

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }

    /** {@code --json} and the output plumbing every topic shares. */
    static final class Output {

        private static final ObjectMapper JSON = new ObjectMapper();

        @Option(names = "--json", description = "Print one JSON object instead of a sentence.")
        boolean json;

        @CommandLine.Spec(CommandLine.Spec.Target.MIXEE)
        CommandLine.Model.CommandSpec spec;

        int print(Map<String, Object> values, String human) {
            PrintWriter out = spec.commandLine().getOut();
            if (json) {
                try {
                    out.println(JSON.writeValueAsString(values));
                } catch (JsonProcessingException e) {
                    throw new IllegalStateException("cannot write JSON", e);
                }
            } else {
                out.println(human);
            }
            out.flush();
            return 0;
        }

        int badInput(String message) {
            PrintWriter err = spec.commandLine().getErr();
            err.println("calc " + spec.name() + ": " + message);
            err.flush();
            return BAD_INPUT;
        }
    }

    /** {@code --r0} and the thermometer it gives, for both platinum-thermometer topics. */
    static final class R0Option {

        @Option(names = "--r0", paramLabel = "RESISTANCE", defaultValue = "100ohm",
                description = "Resistance at 0 °C (default ${DEFAULT-VALUE}).")
        String r0;

        PlatinumResistanceThermometer thermometer() {
            return new PlatinumResistanceThermometer(Quantity.parse(r0, Dimension.RESISTANCE).toBase());
        }
    }

    /** The required {@code --fluid} of the topics about one cryogen's liquid (Oxygen's is optional, for --spill). */
    static final class FluidOption {

        @Option(names = "--fluid", required = true, paramLabel = "FLUID", description = "helium or nitrogen.")
        String fluid;

        Cryogen cryogen() {
            return CalcCommand.cryogen(fluid);
        }
    }

    /** Runs a topic's body and turns bad input (parse errors, out-of-range values) into exit 2. */
    abstract static class Topic implements Callable<Integer> {

        @Mixin
        Output output;

        @Override
        public final Integer call() {
            try {
                return compute();
            } catch (IllegalArgumentException e) {
                return output.badInput(e.getMessage());
            } catch (ConfigException e) {
                return output.badInput("the file has errors:\n" + e.getMessage());
            }
        }

        abstract int compute() throws ConfigException;
    }

    @Command(name = "he4-temperature", description = "Helium-4 bath temperature from its vapour pressure (ITS-90).")
    static final class He4Temperature extends Topic {

        @Parameters(paramLabel = "PRESSURE", description = "Vapour pressure, e.g. 101.325kPa, 760torr, 0.2bar(g).")
        String pressure;

        @Option(names = "--ambient", paramLabel = "PRESSURE", defaultValue = "101.325kPa",
                description = "Ambient pressure for a gauge reading (default ${DEFAULT-VALUE}).")
        String ambient;

        @Override
        int compute() {
            Quantity given = Quantity.parse(pressure, Dimension.PRESSURE);
            double pascal = absolutePascal(given, ambient);
            HeliumSaturation bath = Helium4VapourPressure.temperature(pascal);
            Map<String, Object> values = new LinkedHashMap<>();
            values.put("temperature_K", bath.temperatureKelvin());
            values.put("phase", bath.phase().label());
            return output.print(values, String.format(Locale.ROOT, "%.4f K (%s) at %s%s, ITS-90 helium-4 vapour pressure",
                    bath.temperatureKelvin(), bath.phase().label(), formatPascal(pascal), gaugeNote(given, ambient)));
        }
    }

    @Command(name = "he4-pressure", description = "Helium-4 saturated vapour pressure at a temperature (ITS-90).")
    static final class He4Pressure extends Topic {

        @Parameters(paramLabel = "TEMPERATURE", description = "Bath temperature, e.g. 4.2K or 1800mK.")
        String temperature;

        @Override
        int compute() {
            double kelvin = Quantity.parse(temperature, Dimension.TEMPERATURE).toBase();
            double pascal = Helium4VapourPressure.pressure(kelvin);
            Map<String, Object> values = new LinkedHashMap<>();
            values.put("pressure_Pa", pascal);
            return output.print(values, String.format(Locale.ROOT, "%s at %s K (%s), ITS-90 helium-4 vapour pressure",
                    formatPascal(pascal), significant(kelvin), Helium4VapourPressure.phase(kelvin).label()));
        }
    }

    @Command(name = "prt-temperature", description = "Platinum thermometer temperature from resistance (IEC 60751).")
    static final class PrtTemperature extends Topic {

        @Parameters(paramLabel = "RESISTANCE", description = "Measured resistance, e.g. 138.51ohm.")
        String resistance;

        @Mixin
        R0Option r0;

        @Override
        int compute() {
            PlatinumResistanceThermometer prt = r0.thermometer();
            double ohm = Quantity.parse(resistance, Dimension.RESISTANCE).toBase();
            double celsius = prt.temperature(ohm);
            Map<String, Object> values = new LinkedHashMap<>();
            values.put("temperature_C", celsius);
            values.put("temperature_K", celsius + 273.15);
            return output.print(values, String.format(Locale.ROOT, "%.3f °C (%.3f K) at %s ohm, IEC 60751, R0 = %s ohm",
                    celsius, celsius + 273.15, significant(ohm), significant(prt.r0Ohm())));
        }
    }

    @Command(name = "prt-resistance", description = "Platinum thermometer resistance at a temperature (IEC 60751).")
    static final class PrtResistance extends Topic {

        @Parameters(paramLabel = "TEMPERATURE", description = "Temperature, e.g. -196C or 77K.")
        String temperature;

        @Mixin
        R0Option r0;

        @Override
        int compute() {
            PlatinumResistanceThermometer prt = r0.thermometer();
            double celsius = Quantity.parse(temperature, Dimension.TEMPERATURE).in(Unit.CELSIUS);
            double ohm = prt.resistance(celsius);
            Map<String, Object> values = new LinkedHashMap<>();
            values.put("resistance_ohm", ohm);
            return output.print(values, String.format(Locale.ROOT, "%.4f ohm at %s °C, IEC 60751, R0 = %s ohm",
                    ohm, significant(celsius), significant(prt.r0Ohm())));
        }
    }

    @Command(name = "boiloff", description = "Liquid boiled off and gas produced by a heat load.")
    static final class BoilOffTopic extends Topic {

        @Mixin
        FluidOption fluid;

        @Option(names = "--heat-load", required = true, paramLabel = "POWER", description = "Heat load, e.g. 500mW.")
        String heatLoad;

        @Option(names = "--gas-temperature", paramLabel = "TEMPERATURE", defaultValue = "20C",
                description = "Temperature of the warm gas (default ${DEFAULT-VALUE}).")
        String gasTemperature;

        @Option(names = "--gas-pressure", paramLabel = "PRESSURE", defaultValue = "101.325kPa",
                description = "Absolute pressure of the warm gas (default ${DEFAULT-VALUE}).")
        String gasPressure;

        @Override
        int compute() {
            Cryogen cryogen = fluid.cryogen();
            double watts = Quantity.parse(heatLoad, Dimension.POWER).toBase();
            double kelvin = Quantity.parse(gasTemperature, Dimension.TEMPERATURE).toBase();
            Quantity pressure = Quantity.parse(gasPressure, Dimension.PRESSURE);
            double pascal = absolutePascal(pressure, "101.325kPa");
            double litres = BoilOff.liquidLitresPerHour(cryogen, watts);
            double gas = BoilOff.gasCubicMetresPerHour(cryogen, watts, kelvin, pascal);
            Map<String, Object> values = new LinkedHashMap<>();
            values.put("liquid_L_per_h", litres);
            values.put("gas_m3_per_h", gas);
            return output.print(values, String.format(Locale.ROOT,
                    "%s W boils %s L/h of liquid %s (at its normal boiling point), %s m3/h of gas at %s °C and %s",
                    significant(watts), significant(litres), cryogen.label(), significant(gas),
                    significant(kelvin - 273.15), formatPascal(pascal)));
        }
    }

    @Command(name = "expansion", description = "Gas volume from a volume of boiling liquid.")
    static final class Expansion extends Topic {

        @Mixin
        FluidOption fluid;

        @Option(names = "--liquid", required = true, paramLabel = "VOLUME", description = "Liquid volume, e.g. 100L.")
        String liquid;

        @Option(names = "--gas-temperature", paramLabel = "TEMPERATURE", defaultValue = "20C",
                description = "Temperature of the warm gas, at 101.325 kPa (default ${DEFAULT-VALUE}).")
        String gasTemperature;

        @Override
        int compute() {
            Cryogen cryogen = fluid.cryogen();
            double cubicMetres = Quantity.parse(liquid, Dimension.VOLUME).toBase();
            double kelvin = Quantity.parse(gasTemperature, Dimension.TEMPERATURE).toBase();
            double gas = GasExpansion.gasCubicMetres(cryogen, cubicMetres, kelvin, Quantity.STANDARD_ATMOSPHERE_PA);
            double ratio = GasExpansion.ratio(cryogen, kelvin, Quantity.STANDARD_ATMOSPHERE_PA);
            Map<String, Object> values = new LinkedHashMap<>();
            values.put("gas_m3", gas);
            values.put("ratio", ratio);
            return output.print(values, String.format(Locale.ROOT,
                    "%s L of liquid %s makes %s m3 of gas at %s °C and 101.325 kPa (1:%.0f)",
                    significant(cubicMetres * 1000), cryogen.label(), significant(gas), significant(kelvin - 273.15),
                    ratio));
        }
    }

    @Command(name = "oxygen", description = {"Oxygen in a perfectly mixed room during and after a release",
        "(FESHM 4240). An estimate: it never replaces fixed oxygen monitors."})
    static final class Oxygen extends Topic {

        @Option(names = "--room-volume", required = true, paramLabel = "VOLUME", description = "Free room volume.")
        String roomVolume;

        @Option(names = "--release-rate", paramLabel = "FLOW", description = "Gas release rate at room conditions.")
        String releaseRate;

        @Option(names = "--spill", paramLabel = "VOLUME", description = "Liquid spilled at once (needs --fluid).")
        String spill;

        @Option(names = "--fluid", paramLabel = "FLUID", description = "helium or nitrogen, for --spill.")
        String fluid;

        @Option(names = "--ventilation", paramLabel = "FLOW", description = "Ventilation rate (default none).")
        String ventilation;

        @Option(names = "--fan", paramLabel = "FAN", description = {"supply, exhaust or none (default exhaust with",
            "--ventilation, the more conservative; none without)."})
        String fan;

        @Option(names = "--duration", paramLabel = "TIME", description = "How long the release lasts (default: it goes on).")
        String duration;

        @Option(names = "--at", paramLabel = "TIME", description = "Time of the answer (default: end of the release).")
        String at;

        @Override
        int compute() {
            if ((releaseRate == null) == (spill == null)) {
                throw new IllegalArgumentException("give either --release-rate FLOW or --spill VOLUME with --fluid");
            }
            if (spill != null && fluid == null) {
                throw new IllegalArgumentException("--spill needs --fluid helium|nitrogen");
            }
            if (spill != null && duration != null) {
                throw new IllegalArgumentException("--duration applies to --release-rate, not to an instantaneous --spill");
            }
            if (releaseRate != null && fluid != null) {
                throw new IllegalArgumentException("--fluid applies to --spill; --release-rate is already gas at room "
                        + "conditions");
            }
            double room = Quantity.parse(roomVolume, Dimension.VOLUME).toBase();
            double q = ventilation == null ? 0 : Quantity.parse(ventilation, Dimension.FLOW).toBase();
            Ventilation mode = fan == null ? (q > 0 ? Ventilation.EXHAUST : Ventilation.NONE) : fan(fan);
            if (mode != Ventilation.NONE && ventilation == null) {
                throw new IllegalArgumentException("--fan " + mode.label() + " needs --ventilation FLOW");
            }
            OxygenDilution dilution;
            String what;
            if (spill != null) {
                Cryogen cryogen = cryogen(fluid);
                double liquid = Quantity.parse(spill, Dimension.VOLUME).toBase();
                double gas = GasExpansion.gasCubicMetres(cryogen, liquid, 293.15, Quantity.STANDARD_ATMOSPHERE_PA);
                dilution = OxygenDilution.spill(room, gas, mode, q);
                what = String.format(Locale.ROOT, "spill of %s L of liquid %s (%s m3 of gas at 20 °C)",
                        significant(liquid * 1000), cryogen.label(), significant(gas));
            } else {
                double r = Quantity.parse(releaseRate, Dimension.FLOW).toBase();
                double seconds = duration == null ? Double.POSITIVE_INFINITY : seconds(duration);
                dilution = OxygenDilution.release(room, r, mode, q, seconds);
                what = String.format(Locale.ROOT, "release of %s m3/s%s", significant(r),
                        duration == null ? " that goes on" : " for " + DurationSyntax.format(DurationSyntax.parse(duration)));
            }
            double atSeconds = at == null ? dilution.timeOfMinimumSeconds() : seconds(at);
            double now = Double.isInfinite(atSeconds) ? dilution.steadyStateFraction().orElseThrow()
                    : dilution.fractionAt(atSeconds);
            Map<String, Object> values = new LinkedHashMap<>();
            values.put("oxygen_percent", now * 100);
            values.put("oxygen_min_percent", dilution.minimumFraction() * 100);
            values.put("steady_state_percent", dilution.steadyStateFraction().isPresent()
                    ? dilution.steadyStateFraction().getAsDouble() * 100 : null);
            String when = Double.isInfinite(dilution.timeOfMinimumSeconds()) ? "approached while the release goes on"
                    : "reached at " + DurationSyntax.format(Duration.ofMillis(Math.round(dilution.timeOfMinimumSeconds() * 1000)));
            String atText = at == null ? (Double.isInfinite(atSeconds) ? "in the steady state" : "at the end of the release")
                    : "at " + DurationSyntax.format(DurationSyntax.parse(at));
            return output.print(values, String.format(Locale.ROOT,
                    "%s %% oxygen %s; minimum %s %% %s; %s into %s m3, %s ventilation%s (FESHM 4240, perfect mixing; "
                            + "an estimate, never a substitute for oxygen monitors)",
                    fixed(now * 100, 2), atText, fixed(dilution.minimumFraction() * 100, 2), when, what,
                    significant(room), mode.label(), q > 0 ? " " + significant(q) + " m3/s" : ""));
        }
    }

    @Command(name = "odh", description = {"ODH class of a room from its failure modes (FESHM 4240).",
        "An estimate for the safety officer's review, not a certified safety analysis."})
    static final class Odh extends Topic {

        @Option(names = "--room", required = true, paramLabel = "FILE", description = "The room's YAML file.")
        Path room;

        @Override
        int compute() throws ConfigException {
            OdhRoom parsed = OdhRoomReader.read(room);
            OdhAssessment assessment = parsed.assess();
            Map<String, Object> values = new LinkedHashMap<>();
            values.put("fatality_rate_per_h", assessment.fatalityRatePerHour());
            values.put("odh_class", assessment.odhClass().number());
            List<Map<String, Object>> modes = new ArrayList<>();
            StringBuilder human = new StringBuilder();
            human.append(String.format(Locale.ROOT, "%s: fatality rate %.3g /h, ODH class %d (FESHM 4240)%n",
                    parsed.name(), assessment.fatalityRatePerHour(), assessment.odhClass().number()));
            for (FailureMode mode : assessment.modes()) {
                Map<String, Object> entry = new LinkedHashMap<>();
                entry.put("name", mode.name());
                entry.put("oxygen_min_percent", mode.oxygenMinFraction() * 100);
                entry.put("fatality_factor", mode.fatalityFactor());
                entry.put("rate_per_h", mode.ratePerHour());
                modes.add(entry);
                human.append(String.format(Locale.ROOT, "  O2 min %6.2f %%  F %-9.3g P %-9.3g /h  %s%n",
                        mode.oxygenMinFraction() * 100, mode.fatalityFactor(), mode.ratePerHour(), mode.name()));
            }
            values.put("modes", modes);
            human.append("An estimate for review: it never replaces oxygen monitors, ventilation interlocks or local codes.");
            return output.print(values, human.toString());
        }
    }

    static double absolutePascal(Quantity pressure, String ambientText) {
        if (pressure.unit().pressureReference() != PressureReference.GAUGE) {
            return pressure.toBase();
        }
        double ambient = Quantity.parse(ambientText, Dimension.PRESSURE).toBase();
        return pressure.toAbsoluteBase(ambient);
    }

    static String gaugeNote(Quantity pressure, String ambientText) {
        if (pressure.unit().pressureReference() != PressureReference.GAUGE) {
            return "";
        }
        return " (gauge reading + ambient " + formatPascal(Quantity.parse(ambientText, Dimension.PRESSURE).toBase()) + ")";
    }

    static Cryogen cryogen(String text) {
        return Cryogen.byLabel(text).orElseThrow(
                () -> new IllegalArgumentException("unknown fluid '" + text + "': expected helium or nitrogen"));
    }

    static Ventilation fan(String text) {
        return Ventilation.byLabel(text).orElseThrow(
                () -> new IllegalArgumentException("unknown fan '" + text + "': expected supply, exhaust or none"));
    }

    static double seconds(String text) {
        return DurationSyntax.parse(text).toNanos() / 1e9;
    }

    static String formatPascal(double pascal) {
        return pascal < 1000 ? significant(pascal) + " Pa" : significant(pascal / 1000) + " kPa";
    }

    static String significant(double value) {
        if (value == 0) {
            return "0";
        }
        return new java.math.BigDecimal(value).round(new java.math.MathContext(6)).stripTrailingZeros().toPlainString();
    }

    static String fixed(double value, int decimals) {
        return String.format(Locale.ROOT, "%." + decimals + "f", value);
    }
}
