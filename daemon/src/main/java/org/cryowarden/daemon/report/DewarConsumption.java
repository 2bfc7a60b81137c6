package org.cryowarden.daemon.report;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import org.cryowarden.daemon.journal.MinuteAggregate;
import org.cryowarden.rules.Reading;
import org.cryowarden.rules.Unit;
import org.cryowarden.rules.trend.LiquidConsumption;

/**
 * Liquid used by one dewar over the period: the mean level of each recorded minute, turned into litres through
 * the site's probe and vessel geometry, with refills left out ({@link LiquidConsumption}).
 *
 * @param refillRiseLitres the rise taken as a refill: 2 % of the dewar's full contents (a choice of ours, well
 *                         above level-probe noise and well below any real refill)
 */
public record DewarConsumption(DewarGaugeChain dewar, LiquidConsumption.Consumption consumption,
                               double refillRiseLitres) {

    static final double REFILL_SHARE = 0.02;

    public DewarConsumption {
        Objects.requireNonNull(dewar, "dewar");
        Objects.requireNonNull(consumption, "consumption");
    }

    static DewarConsumption of(DewarGaugeChain dewar, List<MinuteAggregate> levelMinutes) {
        List<Reading> readings = new ArrayList<>();
        for (MinuteAggregate minute : levelMinutes) {
            if (minute.mean().isEmpty()) {
                continue;
            }
            double percent = minute.mean().getAsDouble();
            if (percent < 0 || percent > 100) {
                continue;
            }
            readings.add(Reading.good(dewar.levelChannel(), percent, Unit.PERCENT, minute.minute()));
        }
        double rise = REFILL_SHARE * dewar.fullLitres();
        return new DewarConsumption(dewar, LiquidConsumption.of(readings, dewar.gauge()::litres, rise), rise);
    }
}
