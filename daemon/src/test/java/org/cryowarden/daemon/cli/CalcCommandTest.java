package org.cryowarden.daemon.cli;

import static org.assertj.core.api.Assertions.assertThat;
import static org.assertj.core.api.Assertions.within;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.cryowarden.rules.physics.Helium4VapourPressure;
import org.cryowarden.rules.physics.PlatinumResistanceThermometer;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import picocli.CommandLine;

class CalcCommandTest {

    private static final ObjectMapper JSON = new ObjectMapper();

    @TempDir
    Path folder;

    // --- he4-temperature -------------------------------------------------------------------------------

    @Test
    void he4TemperatureAtOneAtmosphereIsTheNormalBoilingPoint() throws IOException {
        // ITS-90 (Preston-Thomas, Metrologia 27 (1990)): 101 325 Pa -> 4.2221 K
        JsonNode json = json("calc", "he4-temperature", "1 atm", "--json");
        assertThat(keys(json)).containsExactly("temperature_K", "phase");
        assertThat(json.get("temperature_K").asDouble()).isCloseTo(4.2221, within(0.00005));
        assertThat(json.get("phase").asText()).isEqualTo("He I");
        Result human = run("calc", "he4-temperature", "101.325kPa");
        assertThat(human.out()).isEqualTo("4.2221 K (He I) at 101.325 kPa, ITS-90 helium-4 vapour pressure\n");
    }

    @Test
    void he4TemperatureBelowTheLambdaPointIsHeliumTwo() throws IOException {
        // ITS-90: below 5.04 kPa (2.1768 K) the bath is superfluid
        JsonNode json = json("calc", "he4-temperature", "30 torr", "--json");
        assertThat(json.get("phase").asText()).isEqualTo("He II");
        assertThat(json.get("temperature_K").asDouble()).isLessThan(2.1768);
    }

    @Test
    void he4TemperatureOfAGaugeReadingAddsTheStatedAmbient() throws IOException {
        double expected = Helium4VapourPressure.temperature(0.2e5 + 101_325).temperatureKelvin();
        assertThat(json("calc", "he4-temperature", "0.2 bar(g)", "--json").get("temperature_K").asDouble())
                .isCloseTo(expected, within(1e-12));
        double atAltitude = Helium4VapourPressure.temperature(0.2e5 + 85_000).temperatureKelvin();
        assertThat(json("calc", "he4-temperature", "0.2 bar(g)", "--ambient", "850mbar", "--json")
                .get("temperature_K").asDouble()).isCloseTo(atAltitude, within(1e-12));
        assertThat(run("calc", "he4-temperature", "0.2 bar(g)").out())
                .contains("at 121.325 kPa (gauge reading + ambient 101.325 kPa)");
    }

    @Test
    void he4TemperatureAcceptsBothEndsOfTheRangeExactly() throws IOException {
        assertThat(json("calc", "he4-temperature", Helium4VapourPressure.MIN_PASCAL + "Pa", "--json")
                .get("temperature_K").asDouble()).isCloseTo(1.25, within(1e-9));
        assertThat(json("calc", "he4-temperature", Helium4VapourPressure.MAX_PASCAL + "Pa", "--json")
                .get("temperature_K").asDouble()).isCloseTo(5.0, within(1e-9));
    }

    @Test
    void he4TemperatureOutsideTheRangeOrInTheWrongUnitExitsTwo() {
        String range = " is outside the ITS-90 helium-4 vapour-pressure range 114.73 Pa to 196.017 kPa (1.25 K to 5.0 K)";
        assertBadInput(run("calc", "he4-temperature", "114.7Pa"), "calc he4-temperature: pressure 114.70 Pa" + range);
        assertBadInput(run("calc", "he4-temperature", "196.1kPa"), "calc he4-temperature: pressure 196.100 kPa" + range);
        assertBadInput(run("calc", "he4-temperature", "1bar(g)"), "calc he4-temperature: pressure 201.325 kPa" + range);
        assertBadInput(run("calc", "he4-temperature", "4.2K"), "calc he4-temperature: expected a pressure (Pa, kPa, "
                + "MPa, mbar, bar(a), bar(g), psi, torr, atm), got '4.2K' which is a temperature (K, mK, °C)");
        assertBadInput(run("calc", "he4-temperature", "100 kpa"),
                "calc he4-temperature: unknown unit 'kpa' in '100 kpa': did you mean 'kPa'?");
        assertBadInput(run("calc", "he4-temperature", "100"),
                "calc he4-temperature: '100' has no unit: write the unit after the number, e.g. 100 kPa");
        assertBadInput(run("calc", "he4-temperature", "0.2bar(g)", "--ambient", "20C"),
                "calc he4-temperature: expected a pressure (Pa, kPa, MPa, mbar, bar(a), bar(g), psi, torr, atm), "
                        + "got '20C' which is a temperature (K, mK, °C)");
    }

    // --- he4-pressure ----------------------------------------------------------------------------------

    @Test
    void he4PressureAtTheLambdaPointIsAboutFivePointZeroFourKilopascal() throws IOException {
        // ITS-90: lambda point 2.1768 K at about 5.04 kPa
        JsonNode json = json("calc", "he4-pressure", "2176.8mK", "--json");
        assertThat(keys(json)).containsExactly("pressure_Pa");
        assertThat(json.get("pressure_Pa").asDouble()).isCloseTo(5040, within(5.0));
        // ITS-90: 4.2221 K is the normal boiling point, 101 325 Pa
        assertThat(json("calc", "he4-pressure", "4.2221K", "--json").get("pressure_Pa").asDouble())
                .isCloseTo(101_325, within(15.0));
    }

    @Test
    void he4PressureRangeEndsAndOutsideThem() throws IOException {
        assertThat(json("calc", "he4-pressure", "1.25K", "--json").get("pressure_Pa").asDouble())
                .isCloseTo(Helium4VapourPressure.MIN_PASCAL, within(1e-9));
        assertThat(json("calc", "he4-pressure", "5K", "--json").get("pressure_Pa").asDouble())
                .isCloseTo(Helium4VapourPressure.MAX_PASCAL, within(1e-6));
        assertBadInput(run("calc", "he4-pressure", "1.2K"),
                "calc he4-pressure: temperature 1.2 K is outside the ITS-90 helium-4 vapour-pressure range 1.25 K to 5.0 K");
        assertBadInput(run("calc", "he4-pressure", "5.01K"),
                "calc he4-pressure: temperature 5.01 K is outside the ITS-90 helium-4 vapour-pressure range 1.25 K to 5.0 K");
        assertBadInput(run("calc", "he4-pressure", "1 atm"), "calc he4-pressure: expected a temperature (K, mK, °C), "
                + "got '1 atm' which is a pressure (Pa, kPa, MPa, mbar, bar(a), bar(g), psi, torr, atm)");
    }

    // --- prt-temperature / prt-resistance --------------------------------------------------------------

    @Test
    void prtTemperatureMatchesTheStandardTable() throws IOException {
        // IEC 60751:2008 table, R0 = 100 ohm: 60.26 ohm at -100 °C (0.01 ohm is about 0.03 K)
        JsonNode json = json("calc", "prt-temperature", "60.26ohm", "--json");
        assertThat(keys(json)).containsExactly("temperature_C", "temperature_K");
        assertThat(json.get("temperature_C").asDouble()).isCloseTo(-100, within(0.03));
        assertThat(json.get("temperature_K").asDouble()).isCloseTo(173.15, within(0.03));
        // IEC 60751: 138.51 ohm at 100 °C, so a Pt1000 reads 1385.1 ohm there
        assertThat(json("calc", "prt-temperature", "1.3851kohm", "--r0", "1000ohm", "--json")
                .get("temperature_C").asDouble()).isCloseTo(100, within(0.03));
    }

    @Test
    void prtTemperatureRangeEndsAndOutsideThem() throws IOException {
        PlatinumResistanceThermometer pt100 = PlatinumResistanceThermometer.pt100();
        assertThat(json("calc", "prt-temperature", pt100.minOhm() + "ohm", "--json").get("temperature_C").asDouble())
                .isCloseTo(-200, within(1e-9));
        assertThat(json("calc", "prt-temperature", pt100.maxOhm() + "ohm", "--json").get("temperature_C").asDouble())
                .isCloseTo(850, within(1e-9));
        String range = " is outside the IEC 60751 range 18.5201 ohm to 390.4811 ohm (-200 °C to 850 °C) for R0 = 100 ohm";
        assertBadInput(run("calc", "prt-temperature", "18.52ohm"), "calc prt-temperature: resistance 18.52 ohm" + range);
        assertBadInput(run("calc", "prt-temperature", "390.49ohm"), "calc prt-temperature: resistance 390.49 ohm" + range);
        assertBadInput(run("calc", "prt-temperature", "100ohm", "--r0", "0ohm"),
                "calc prt-temperature: R0 must be greater than 0 ohm, got 0 ohm");
        assertBadInput(run("calc", "prt-temperature", "100V"), "calc prt-temperature: expected a resistance (ohm, kohm), "
                + "got '100V' which is a voltage (mV, V)");
    }

    @Test
    void prtResistanceMatchesTheStandardTableAndTakesNegativeTemperatures() throws IOException {
        // IEC 60751:2008 table, R0 = 100 ohm: 18.52 ohm at -200 °C, 100.00 at 0 °C, 138.51 at 100 °C
        JsonNode json = json("calc", "prt-resistance", "-200C", "--json");
        assertThat(keys(json)).containsExactly("resistance_ohm");
        assertThat(json.get("resistance_ohm").asDouble()).isCloseTo(18.52, within(0.005));
        assertThat(json("calc", "prt-resistance", "0C", "--json").get("resistance_ohm").asDouble()).isEqualTo(100.0);
        assertThat(json("calc", "prt-resistance", "373.15K", "--json").get("resistance_ohm").asDouble())
                .isCloseTo(138.51, within(0.005));
        assertThat(run("calc", "prt-resistance", "100C").out())
                .isEqualTo("138.5055 ohm at 100 °C, IEC 60751, R0 = 100 ohm\n");
        assertThat(json("calc", "prt-resistance", "850C", "--json").get("resistance_ohm").asDouble())
                .isCloseTo(390.4811, within(0.00005));
        assertThat(json("calc", "prt-resistance", "1123.15K", "--json").get("resistance_ohm").asDouble())
                .isCloseTo(390.4811, within(0.00005));
    }

    @Test
    void prtResistanceOutsideTheRangeExitsTwo() {
        assertBadInput(run("calc", "prt-resistance", "-200.1C"),
                "calc prt-resistance: temperature -200.1 °C is outside the IEC 60751 range -200 °C to 850 °C");
        assertBadInput(run("calc", "prt-resistance", "850.1C"),
                "calc prt-resistance: temperature 850.1 °C is outside the IEC 60751 range -200 °C to 850 °C");
    }

    // --- boiloff / expansion ---------------------------------------------------------------------------

    @Test
    void boiloffOfOneWattIsAboutOnePointThreeNineLitresOfHeliumPerHour() throws IOException {
        // Arp & McCarty, NIST TN 1334 (via cryogen data sheets): 1 W boils about 1.39 L/h of liquid helium
        JsonNode json = json("calc", "boiloff", "--fluid", "helium", "--heat-load", "1W", "--json");
        assertThat(keys(json)).containsExactly("liquid_L_per_h", "gas_m3_per_h");
        assertThat(json.get("liquid_L_per_h").asDouble()).isCloseTo(1.39, within(0.005));
        // 1.39 L/h of liquid is about 1.39 * 0.70 m3/h of gas at 0 °C (same source)
        assertThat(json("calc", "boiloff", "--fluid", "helium", "--heat-load", "1W", "--gas-temperature", "0C", "--json")
                .get("gas_m3_per_h").asDouble()).isCloseTo(1.388 * 0.700, within(0.005));
    }

    @Test
    void boiloffOfOneWattIsAboutTwentyTwoMillilitresOfNitrogenPerHour() throws IOException {
        // Jacobsen et al., J. Phys. Chem. Ref. Data 15 (1986) (via cryogen data sheets): about 22 mL/h
        assertThat(json("calc", "boiloff", "--fluid", "nitrogen", "--heat-load", "1000mW", "--json")
                .get("liquid_L_per_h").asDouble()).isCloseTo(0.0224, within(0.0001));
    }

    @Test
    void boiloffBadInputExitsTwo() {
        assertBadInput(run("calc", "boiloff", "--fluid", "argon", "--heat-load", "1W"),
                "calc boiloff: unknown fluid 'argon': expected helium or nitrogen");
        assertBadInput(run("calc", "boiloff", "--fluid", "helium", "--heat-load", "-1W"),
                "calc boiloff: heat load must not be negative, got -1 W");
        assertBadInput(run("calc", "boiloff", "--fluid", "helium", "--heat-load", "1 L"),
                "calc boiloff: expected a power (mW, W, kW), got '1 L' which is a volume (mL, L, m3)");
        assertBadInput(run("calc", "boiloff", "--fluid", "helium", "--heat-load", "1W", "--gas-temperature", "-60C"),
                "calc boiloff: gas temperature -60 °C is outside the range -50 °C to 60 °C of the room-condition gas "
                        + "properties");
        assertBadInput(run("calc", "boiloff", "--fluid", "helium", "--heat-load", "1W", "--gas-pressure", "3bar"),
                "calc boiloff: gas pressure 300.000 kPa is outside the range 50 kPa to 200 kPa (absolute) of the "
                        + "room-condition gas properties");
        Result missing = run("calc", "boiloff", "--heat-load", "1W");
        assertThat(missing.exit()).isEqualTo(2);
        assertThat(missing.err()).startsWith("Missing required option: '--fluid=FLUID'");
    }

    @Test
    void expansionOfOneLitreOfHeliumIsAboutPointSevenCubicMetresAtZeroCelsius() throws IOException {
        // Arp & McCarty, NIST TN 1334 (via cryogen data sheets): 1 L of liquid -> 0.70 m3 at 0 °C, 0.75 m3 at 21 °C
        JsonNode json = json("calc", "expansion", "--fluid", "helium", "--liquid", "1L", "--gas-temperature", "0C", "--json");
        assertThat(keys(json)).containsExactly("gas_m3", "ratio");
        assertThat(json.get("gas_m3").asDouble()).isCloseTo(0.70, within(0.005));
        assertThat(json.get("ratio").asDouble()).isCloseTo(700, within(5.0));
        assertThat(json("calc", "expansion", "--fluid", "helium", "--liquid", "1L", "--gas-temperature", "21C", "--json")
                .get("gas_m3").asDouble()).isCloseTo(0.75, within(0.005));
        // 1:694 for nitrogen is a 70 °F (21.1 °C) figure (cryogen data sheets from Jacobsen et al. 1986)
        assertThat(json("calc", "expansion", "--fluid", "nitrogen", "--liquid", "1L", "--gas-temperature", "21.1C",
                "--json").get("ratio").asDouble()).isCloseTo(694, within(3.5));
    }

    @Test
    void expansionBadInputExitsTwo() {
        assertBadInput(run("calc", "expansion", "--fluid", "helium", "--liquid", "-1L"),
                "calc expansion: liquid volume must not be negative, got -0.001 m3");
        assertBadInput(run("calc", "expansion", "--fluid", "helium", "--liquid", "1L", "--gas-temperature", "70C"),
                "calc expansion: gas temperature 70 °C is outside the range -50 °C to 60 °C of the room-condition gas "
                        + "properties");
        assertBadInput(run("calc", "expansion", "--fluid", "helium", "--liquid", "1kg"),
                "calc expansion: expected a volume (mL, L, m3), got '1kg' which is a mass (g, kg)");
    }

    // --- oxygen ----------------------------------------------------------------------------------------

    @Test
    void oxygenWithASupplyFanSettlesAtTheClosedFormSteadyState() throws IOException {
        // FESHM 4240: supply fan steady state 0.21 Q / (Q + R)
        JsonNode json = json("calc", "oxygen", "--room-volume", "200m3", "--release-rate", "0.5m3/s",
                "--ventilation", "2m3/s", "--fan", "supply", "--json");
        assertThat(keys(json)).containsExactly("oxygen_percent", "oxygen_min_percent", "steady_state_percent");
        assertThat(json.get("steady_state_percent").asDouble()).isCloseTo(21 * 2.0 / 2.5, within(1e-9));
        assertThat(json.get("oxygen_percent").asDouble()).isCloseTo(21 * 2.0 / 2.5, within(1e-9));
        assertThat(json.get("oxygen_min_percent").asDouble()).isCloseTo(21 * 2.0 / 2.5, within(1e-9));
    }

    @Test
    void oxygenAtOneTimeConstantMatchesTheClosedForm() throws IOException {
        // FESHM 4240 exhaust fan, Q > R: C(t) = 0.21 [1 - (R/Q)(1 - e^(-Q t / V))]; t = V/Q = 100 s
        JsonNode json = json("calc", "oxygen", "--room-volume", "200m3", "--release-rate", "0.5m3/s",
                "--ventilation", "120m3/min", "--fan", "exhaust", "--at", "100s", "--json");
        assertThat(json.get("oxygen_percent").asDouble()).isCloseTo(21 * (1 - 0.25 * (1 - Math.exp(-1))), within(1e-9));
        assertThat(json.get("steady_state_percent").asDouble()).isCloseTo(21 * 0.75, within(1e-9));
    }

    @Test
    void oxygenAfterAFiniteReleaseRecoversAndTheMinimumIsAtItsEnd() throws IOException {
        // FESHM 4240: no ventilation C = 0.21 e^(-R t / V); after the release the exhaust recovers it
        JsonNode end = json("calc", "oxygen", "--room-volume", "100m3", "--release-rate", "1m3/s",
                "--ventilation", "0.5m3/s", "--duration", "100s", "--json");
        assertThat(end.get("oxygen_percent").asDouble()).isCloseTo(21 * Math.exp(-1), within(1e-9));
        assertThat(end.get("oxygen_min_percent").asDouble()).isCloseTo(21 * Math.exp(-1), within(1e-9));
        JsonNode later = json("calc", "oxygen", "--room-volume", "100m3", "--release-rate", "1m3/s",
                "--ventilation", "0.5m3/s", "--duration", "100s", "--at", "300s", "--json");
        double expected = 21 - (21 - 21 * Math.exp(-1)) * Math.exp(-1);
        assertThat(later.get("oxygen_percent").asDouble()).isCloseTo(expected, within(1e-9));
        assertThat(run("calc", "oxygen", "--room-volume", "100m3", "--release-rate", "1m3/s", "--ventilation",
                "0.5m3/s", "--duration", "100s").out())
                .startsWith("7.73 % oxygen at the end of the release; minimum 7.73 % reached at 1min40s; release of "
                        + "1 m3/s for 1min40s into 100 m3, exhaust ventilation 0.5 m3/s");
    }

    @Test
    void oxygenAfterASpillHasNoSteadyState() throws IOException {
        JsonNode json = json("calc", "oxygen", "--room-volume", "150m3", "--spill", "250L", "--fluid", "nitrogen",
                "--json");
        assertThat(keys(json)).containsExactly("oxygen_percent", "oxygen_min_percent", "steady_state_percent");
        assertThat(json.get("steady_state_percent").isNull()).isTrue();
        assertThat(json.get("oxygen_min_percent").asDouble()).isEqualTo(json.get("oxygen_percent").asDouble());
    }

    @Test
    void oxygenBadInputExitsTwo() {
        assertBadInput(run("calc", "oxygen", "--room-volume", "100m3"),
                "calc oxygen: give either --release-rate FLOW or --spill VOLUME with --fluid");
        assertBadInput(run("calc", "oxygen", "--room-volume", "100m3", "--release-rate", "1m3/s", "--spill", "1L"),
                "calc oxygen: give either --release-rate FLOW or --spill VOLUME with --fluid");
        assertBadInput(run("calc", "oxygen", "--room-volume", "100m3", "--spill", "1L"),
                "calc oxygen: --spill needs --fluid helium|nitrogen");
        assertBadInput(run("calc", "oxygen", "--room-volume", "100m3", "--spill", "1L", "--fluid", "helium",
                "--duration", "1min"), "calc oxygen: --duration applies to --release-rate, not to an instantaneous --spill");
        assertBadInput(run("calc", "oxygen", "--room-volume", "100m3", "--release-rate", "1m3/s", "--fan", "supply"),
                "calc oxygen: --fan supply needs --ventilation FLOW");
        assertBadInput(run("calc", "oxygen", "--room-volume", "100m3", "--release-rate", "1m3/s", "--fan", "none",
                "--ventilation", "1m3/s"),
                "calc oxygen: a ventilation rate of 1 m3/s needs a supply or exhaust fan; with no ventilation the rate is 0");
        assertBadInput(run("calc", "oxygen", "--room-volume", "100m3", "--release-rate", "1m3/s", "--fan", "ceiling",
                "--ventilation", "1m3/s"), "calc oxygen: unknown fan 'ceiling': expected supply, exhaust or none");
        assertBadInput(run("calc", "oxygen", "--room-volume", "100m3", "--release-rate", "1m3/s", "--duration", "5m"),
                "calc oxygen: '5m' is not a duration: expected a number and one of ms, s, min, h, d, e.g. 30s, 5min, 2h "
                        + "or 1h30min");
        assertBadInput(run("calc", "oxygen", "--room-volume", "0m3", "--release-rate", "1m3/s"),
                "calc oxygen: room volume must be greater than 0 m3, got 0 m3");
        assertBadInput(run("calc", "oxygen", "--room-volume", "100m3", "--release-rate", "1 L"),
                "calc oxygen: expected a volume flow (L/s, L/min, L/h, m3/s, m3/min, m3/h), got '1 L' which is a volume "
                        + "(mL, L, m3)");
    }

    // --- odh -------------------------------------------------------------------------------------------

    @Test
    void odhOfTheExampleRoomListsEveryModeWithExactlyTheDocumentedKeys() throws IOException {
        JsonNode json = json("calc", "odh", "--room", Path.of("..", "config-examples", "magnet-bay-room.yaml").toString(),
                "--json");
        assertThat(keys(json)).containsExactly("fatality_rate_per_h", "odh_class", "modes");
        assertThat(json.get("odh_class").asInt()).isEqualTo(1);
        assertThat(json.get("modes")).hasSize(5);
        for (JsonNode mode : json.get("modes")) {
            assertThat(keys(mode)).containsExactly("name", "oxygen_min_percent", "fatality_factor", "rate_per_h");
        }
        double phi = 0;
        for (JsonNode mode : json.get("modes")) {
            phi += mode.get("rate_per_h").asDouble() * mode.get("fatality_factor").asDouble();
        }
        // FESHM 4240: phi = sum P_i F_i
        assertThat(json.get("fatality_rate_per_h").asDouble()).isCloseTo(phi, within(1e-20));
    }

    @Test
    void odhOfASimpleRoomMatchesTheHandSum() throws IOException {
        Path room = folder.resolve("tiny-room.yaml");
        Files.writeString(room, String.join("\n",
                "room:",
                "  name: tiny store (test)",
                "  volume: 10 m3",
                "modes:",
                "  - name: dewar loss of vacuum",
                "    rate_per_h: 1.0e-6",
                "    oxygen: 15 %vol",
                ""));
        JsonNode json = json("calc", "odh", "--room", room.toString(), "--json");
        // FESHM 4240: F(0.15) = 10^(6.5 - 76 * 0.15) = 10^-4.9; phi = 1e-6 * F -> class 0
        assertThat(json.get("fatality_rate_per_h").asDouble()).isCloseTo(1e-6 * Math.pow(10, -4.9), within(1e-20));
        assertThat(json.get("odh_class").asInt()).isZero();
    }

    @Test
    void odhWithAMissingOrBrokenFileExitsTwoWithPositions() throws IOException {
        Path missing = folder.resolve("missing-room.yaml");
        assertBadInput(run("calc", "odh", "--room", missing.toString()),
                "calc odh: the file has errors:\n" + missing + ": file not found");
        Path broken = folder.resolve("broken-room.yaml");
        Files.writeString(broken, "room:\n  name: x\n  volume: 10 m3\nmodes:\n  - name: leak\n    rate_per_h: often\n"
                + "    oxygen: 15 %vol\n");
        assertBadInput(run("calc", "odh", "--room", broken.toString()),
                "calc odh: the file has errors:\n" + broken + ":6:17: rate_per_h must be a number, got 'often'");
    }

    // --- calc itself -----------------------------------------------------------------------------------

    @Test
    void calcWithoutATopicPrintsTheTopics() {
        Result result = run("calc");
        assertThat(result.exit()).isZero();
        assertThat(result.out()).contains("he4-temperature", "he4-pressure", "prt-temperature", "prt-resistance",
                "boiloff", "expansion", "oxygen", "odh");
    }

    // --- helpers ---------------------------------------------------------------------------------------

    private record Result(int exit, String out, String err) {
    }

    private static Result run(String... args) {
        CommandLine line = Main.commandLine();
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        line.setOut(new PrintWriter(out));
        line.setErr(new PrintWriter(err));
        int exit = line.execute(args);
        return new Result(exit, out.toString(), err.toString());
    }

    private static JsonNode json(String... args) throws IOException {
        Result result = run(args);
        assertThat(result.err()).isEmpty();
        assertThat(result.exit()).isZero();
        return JSON.readTree(result.out());
    }

    private static List<String> keys(JsonNode node) {
        List<String> keys = new ArrayList<>();
        node.fieldNames().forEachRemaining(keys::add);
        return keys;
    }

    private static void assertBadInput(Result result, String message) {
        assertThat(result.exit()).as(result.err()).isEqualTo(2);
        assertThat(result.out()).isEmpty();
        assertThat(result.err()).isEqualTo(message + System.lineSeparator());
    }
}
