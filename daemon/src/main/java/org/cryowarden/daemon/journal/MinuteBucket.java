package org.cryowarden.daemon.journal;

import java.sql.PreparedStatement;
import java.sql.SQLException;
import java.sql.Types;
import org.cryowarden.rules.Reading;

/** The readings of one channel in one minute, held in memory until the minute is written. Not thread-safe. */
final class MinuteBucket {

    private long good;
    private long total;
    private double min = Double.POSITIVE_INFINITY;
    private double max = Double.NEGATIVE_INFINITY;
    private double sum;

    void add(Reading reading) {
        total++;
        if (reading.quality().isGood()) {
            good++;
            min = Math.min(min, reading.value());
            max = Math.max(max, reading.value());
            sum += reading.value();
        }
    }

    void bind(PreparedStatement upsert, String channel, long minuteMs) throws SQLException {
        upsert.setString(1, channel);
        upsert.setLong(2, minuteMs);
        upsert.setLong(3, good);
        upsert.setLong(4, total);
        if (good == 0) {
            upsert.setNull(5, Types.REAL);
            upsert.setNull(6, Types.REAL);
            upsert.setNull(7, Types.REAL);
        } else {
            upsert.setDouble(5, min);
            upsert.setDouble(6, max);
            upsert.setDouble(7, sum);
        }
    }
}
