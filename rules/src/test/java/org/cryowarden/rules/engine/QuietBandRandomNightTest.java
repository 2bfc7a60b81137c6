package org.cryowarden.rules.engine;

import static org.assertj.core.api.Assertions.assertThat;
import static org.cryowarden.rules.engine.Site.at;
import static org.cryowarden.rules.engine.Site.q;

import java.lang.reflect.Field;
import java.time.Duration;
import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.List;
import java.util.Optional;
import java.util.Random;
import org.cryowarden.rules.Quality;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.model.AlarmOptions;
import org.cryowarden.rules.model.DeviationRule;
import org.cryowarden.rules.model.Direction;
import org.cryowarden.rules.model.LimitRule;
import org.cryowarden.rules.model.Priority;
import org.cryowarden.rules.model.StaleRule;
import org.cryowarden.rules.model.ValueRange;
import org.cryowarden.rules.model.VoteRule;
import org.junit.jupiter.api.Test;

/**
 * Random nights with the quiet bands on and off: two engines of the same invented site get the same readings,
 * silences, ticks and restarts; one skips each rule whose band holds a GOOD reading, the other evaluates every
 * reading (test code switches it). They must emit the same events and show the same alarm list after every step,
 * values on the list included.
 */
class QuietBandRandomNightTest {

    private static final long SEED = 20261204L;
    private static final int STEPS = 6000;
    /** Three oxygen heads of one room and a cold-head pair read in two units, so one deviation converts. */
    private static final List<String> OXYGEN = List.of("o2_a", "o2_b", "o2_c");

    @Test
    void skippingRulesInsideTheirBandsEmitsWhatEvaluatingEveryReadingEmits() {
        Random random = new Random(SEED);
        Side skipping = new Side(true);
        Side everyReading = new Side(false);
        ArrayDeque<String> recent = new ArrayDeque<>();
        int events = 0;
        for (int step = 0; step < STEPS; step++) {
            String action = randomStep(random, skipping, everyReading);
            recent.addLast(step + ": " + action);
            if (recent.size() > 25) {
                recent.removeFirst();
            }
            assertThat(skipping.lines).as("step %d, recent steps:%n%s", step, String.join("\n", recent))
                    .containsExactlyElementsOf(everyReading.lines);
            assertThat(skipping.site.engine().alarms().toString()).as("alarm list at step %d", step)
                    .isEqualTo(everyReading.site.engine().alarms().toString());
            events = (int) everyReading.lines.stream().filter(line -> !line.equals("[]")).count();
        }
        assertThat(events).as("steps with events: the night must move the alarms often").isGreaterThan(300);
        assertThat(skipping.site.engine().alarms()).extracting(AlarmStatus::id).hasSize(9);
    }

    @Test
    void aSteadyNightSkipsTheLimitVoteStaleAndDeviationRules() throws ReflectiveOperationException {
        Side side = new Side(true);
        for (int second = 0; second < 30; second++) {
            side.lines.addAll(side.site.tickFor(Duration.ofSeconds(1)));
            for (String channel : OXYGEN) {
                side.read(channel, 20.9, Quality.GOOD);
            }
            side.read("cold_k", 40.0, Quality.GOOD);
            side.read("cold_c", 40.0 - 273.15, Quality.GOOD);
        }
        Core core = (Core) field(Engine.class, "core").get(side.site.engine());
        ChannelNode a = core.channels.get("o2_a");
        // Every rule of o2_a (low limit, stale, vote, deviation) names a band around 20.9 %vol.
        for (int i = 0; i < a.rules.length; i++) {
            assertThat(a.quiet[2 * i]).as("%s low end", a.rules[i].alarm.id).isLessThan(20.9);
            assertThat(a.quiet[2 * i + 1]).as("%s high end", a.rules[i].alarm.id).isGreaterThan(20.9);
        }
        // The deviation across two units names none: its band would be in the first channel's unit only.
        ChannelNode kelvin = core.channels.get("cold_k");
        int deviation = List.of(kelvin.rules).indexOf(core.alarms.get("cold_pair_deviation").evaluator);
        assertThat(kelvin.quiet[2 * deviation]).isNaN();
        assertThat(side.lines).as("a steady night changes nothing").allMatch(line -> line.equals("[]"));
    }

    private static String randomStep(Random random, Side one, Side two) {
        int roll = random.nextInt(100);
        if (roll < 3) {
            one.restart();
            two.restart();
            return "restart";
        }
        if (roll < 25) {
            long seconds = 1 + random.nextInt(roll < 5 ? 12 : 2);
            boolean tick = random.nextBoolean();
            one.advance(seconds, tick);
            two.advance(seconds, tick);
            return "+" + seconds + "s" + (tick ? "" : " (no tick)");
        }
        boolean oxygen = roll < 80;
        String channel = oxygen ? OXYGEN.get(random.nextInt(3)) : random.nextBoolean() ? "cold_k" : "cold_c";
        int kind = random.nextInt(100);
        Quality quality = kind < 80 ? Quality.GOOD : kind < 88 ? Quality.UNCERTAIN : kind < 94 ? Quality.BAD
                : Quality.STALE;
        double value;
        if (oxygen) {
            // Mostly near the 19.5 %vol limit and the 0.3 %vol deadband, now and then far off or out of range.
            value = random.nextInt(40) == 0 ? 35 : 19.5 + random.nextGaussian() * (random.nextBoolean() ? 0.4 : 1.5);
        } else {
            double kelvin = 40 + random.nextGaussian() * 1.2;
            value = channel.equals("cold_k") ? kelvin : kelvin - 273.15;
        }
        one.read(channel, value, quality);
        two.read(channel, value, quality);
        return channel + " " + value + " " + quality;
    }

    private static Site newSite(Site site) {
        site.channel("o2_a", Unit.PERCENT_VOLUME, Duration.ofSeconds(1), Duration.ofSeconds(5),
                        Optional.of(new ValueRange(0, 30)))
                .channel("o2_b", Unit.PERCENT_VOLUME, Duration.ofSeconds(1), Duration.ofSeconds(5),
                        Optional.of(new ValueRange(0, 30)))
                .channel("o2_c", Unit.PERCENT_VOLUME, Duration.ofSeconds(1), Duration.ofSeconds(5),
                        Optional.of(new ValueRange(0, 30)))
                .channel("cold_k", Unit.KELVIN, Duration.ofSeconds(1), Duration.ofSeconds(5), Optional.empty())
                .channel("cold_c", Unit.CELSIUS, Duration.ofSeconds(1), Duration.ofSeconds(5), Optional.empty());
        // 19.5 %vol: the oxygen-deficiency level of common practice.
        site.rule(new LimitRule("o2_a_low", "o2_a", Direction.LOW, q("19.5 %vol"), q("0.3 %vol"),
                        options("o2_a_low", Duration.ofSeconds(2)), at("o2_a_low")))
                .rule(new LimitRule("o2_b_high", "o2_b", Direction.HIGH, q("21.5 %vol"), q("0.2 %vol"),
                        options("o2_b_high", Duration.ZERO), at("o2_b_high")))
                .rule(new StaleRule("o2_a_fault", "o2_a", Optional.empty(), options("o2_a_fault", Duration.ZERO),
                        at("o2_a_fault")))
                .rule(new StaleRule("o2_c_fault", "o2_c", Optional.of(Duration.ofSeconds(8)),
                        options("o2_c_fault", Duration.ZERO), at("o2_c_fault")))
                .rule(new VoteRule("o2_vote", OXYGEN, 2, Direction.LOW, q("19.5 %vol"), q("0.3 %vol"), true,
                        options("o2_vote", Duration.ZERO), at("o2_vote")))
                .rule(new VoteRule("o2_vote_faults_ignored", OXYGEN, 2, Direction.LOW, q("19.0 %vol"),
                        q("0.2 %vol"), false, options("o2_vote_faults_ignored", Duration.ofSeconds(1)),
                        at("o2_vote_faults_ignored")))
                .rule(new DeviationRule("o2_deviation", List.of("o2_a", "o2_b"), q("1 %vol"),
                        options("o2_deviation", Duration.ZERO), at("o2_deviation")))
                .rule(new DeviationRule("cold_pair_deviation", List.of("cold_k", "cold_c"), q("2 K"),
                        options("cold_pair_deviation", Duration.ZERO), at("cold_pair_deviation")))
                .rule(new LimitRule("cold_k_high", "cold_k", Direction.HIGH, q("42 K"), q("0.5 K"),
                        options("cold_k_high", Duration.ZERO), at("cold_k_high")));
        return site;
    }

    private static AlarmOptions options(String id, Duration onDelay) {
        return new AlarmOptions(Priority.HIGH, id, onDelay, Duration.ZERO, false, List.of(), Optional.empty());
    }

    private static Field field(Class<?> type, String name) throws NoSuchFieldException {
        Field field = type.getDeclaredField(name);
        field.setAccessible(true);
        return field;
    }

    /** One engine of the night and every event it emitted, in full. */
    private static final class Side {

        private final boolean skip;
        Site site;
        final List<String> lines = new ArrayList<>();

        Side(boolean skip) {
            this.skip = skip;
            this.site = configured(newSite(new Site()));
        }

        private Site configured(Site fresh) {
            try {
                Core core = (Core) field(Engine.class, "core").get(fresh.engine());
                core.skipQuiet = skip;
            } catch (ReflectiveOperationException e) {
                throw new AssertionError("cannot switch the quiet bands", e);
            }
            return fresh;
        }

        void read(String channel, double value, Quality quality) {
            Unit unit = channel.startsWith("o2") ? Unit.PERCENT_VOLUME
                    : channel.equals("cold_k") ? Unit.KELVIN : Unit.CELSIUS;
            Reading reading = quality == Quality.STALE ? Reading.stale(channel, unit, site.clock.wallNow(), "missed")
                    : new Reading(channel, value, unit, site.clock.wallNow(), quality,
                            quality == Quality.GOOD ? "" : "test " + quality);
            lines.add(site.engine().onReading(reading).toString());
        }

        void advance(long seconds, boolean tick) {
            if (tick) {
                site.clock.advance(Duration.ofSeconds(seconds));
                lines.add(site.engine().tick().toString());
            } else {
                site.clock.advance(Duration.ofSeconds(seconds));
            }
        }

        /** A restart of the daemon: a fresh engine at the same instant, restored from the last one's snapshot. */
        void restart() {
            Site fresh = configured(newSite(new Site(site.clock.wallNow())));
            lines.add(fresh.engine().restore(site.engine().snapshot()).toString());
            site = fresh;
        }
    }
}
