package org.cryowarden.daemon.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.image.BufferedImage;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.time.ZoneId;
import java.util.ArrayList;
import java.util.Base64;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import java.util.TimeZone;
import org.cryowarden.daemon.journal.MinuteAggregate;
import org.cryowarden.daemon.replay.AlarmActivation;
import org.cryowarden.daemon.replay.AlarmStatistics;
import org.cryowarden.daemon.replay.FloodPeriod;
import org.cryowarden.daemon.replay.RateInterval;
import org.cryowarden.rules.model.Priority;
import org.jfree.chart.ChartUtils;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.DateAxis;
import org.jfree.chart.axis.LogAxis;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.axis.SymbolAxis;
import org.jfree.chart.axis.ValueAxis;
import org.jfree.chart.plot.IntervalMarker;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.DeviationRenderer;
import org.jfree.chart.renderer.xy.StandardXYBarPainter;
import org.jfree.chart.renderer.xy.XYBarRenderer;
import org.jfree.chart.ui.Layer;
import org.jfree.chart.ui.RectangleAnchor;
import org.jfree.chart.ui.RectangleInsets;
import org.jfree.chart.ui.TextAnchor;
import org.jfree.data.xy.XYIntervalSeries;
import org.jfree.data.xy.XYIntervalSeriesCollection;
import org.jfree.data.xy.YIntervalSeries;
import org.jfree.data.xy.YIntervalSeriesCollection;

/** The report's plots, built with JFreeChart and embedded in the page as PNG images. */
final class Charts {

    static final int WIDTH = 1200;
    private static final Font TITLE = new Font(Font.SANS_SERIF, Font.BOLD, 15);
    private static final Font LABEL = new Font(Font.SANS_SERIF, Font.PLAIN, 12);
    private static final BasicStroke LIMIT_STROKE = new BasicStroke(1.4f, BasicStroke.CAP_BUTT,
            BasicStroke.JOIN_MITER, 10f, new float[] {7f, 4f}, 0f);

    private Charts() {
    }

    /** A channel's minute means with the min-max band, its limits as lines and its alarms' periods shaded. */
    static JFreeChart channel(ChannelInfo channel, List<MinuteAggregate> minutes, List<AlarmStatistics> alarms,
            Set<String> linked, ReportWindow window, ZoneId zone) {
        YIntervalSeries series = new YIntervalSeries("mean of the minute (band: min to max)");
        double low = Double.POSITIVE_INFINITY;
        double high = Double.NEGATIVE_INFINITY;
        for (MinuteAggregate minute : minutes) {
            if (minute.mean().isPresent()) {
                double mid = minute.minute().toEpochMilli() + 30_000.0;
                series.add(mid, minute.mean().getAsDouble(), minute.min().getAsDouble(), minute.max().getAsDouble());
                low = Math.min(low, minute.min().getAsDouble());
                high = Math.max(high, minute.max().getAsDouble());
            }
        }
        YIntervalSeriesCollection data = new YIntervalSeriesCollection();
        data.addSeries(series);
        DeviationRenderer renderer = new DeviationRenderer(true, false);
        renderer.setSeriesPaint(0, Palette.VALUE);
        renderer.setSeriesFillPaint(0, Palette.BAND);
        renderer.setSeriesStroke(0, new BasicStroke(1.6f));
        renderer.setAlpha(0.55f);
        for (ChannelLimit limit : channel.limits()) {
            low = Math.min(low, limit.value());
            high = Math.max(high, limit.value());
        }
        String unit = channel.unit().isEmpty() || channel.unit().equals("1") ? "" : channel.unit();
        ValueAxis range = valueAxis(unit, low, high);
        XYPlot plot = new XYPlot(data, timeAxis(window, zone), range, renderer);
        style(plot);
        for (ChannelLimit limit : channel.limits()) {
            ValueMarker marker = new ValueMarker(limit.value(), Palette.LIMIT, LIMIT_STROKE);
            marker.setLabel(limit.label());
            marker.setLabelFont(LABEL);
            marker.setLabelPaint(Palette.LIMIT);
            marker.setLabelAnchor(RectangleAnchor.TOP_RIGHT);
            marker.setLabelTextAnchor(TextAnchor.BOTTOM_RIGHT);
            marker.setLabelBackgroundColor(Palette.LABEL_BACKGROUND);
            plot.addRangeMarker(marker, Layer.FOREGROUND);
        }
        for (AlarmStatistics alarm : alarms) {
            if (!linked.contains(alarm.alarmId())) {
                continue;
            }
            for (AlarmActivation activation : alarm.activations()) {
                IntervalMarker shade = new IntervalMarker(activation.start().toEpochMilli(),
                        activation.end().orElse(window.until()).toEpochMilli(), Palette.ALARM_SHADE);
                plot.addDomainMarker(shade, Layer.BACKGROUND);
            }
        }
        String title = channel.id() + (unit.isEmpty() ? "" : " (" + unit + ")");
        return chart(title, plot, true);
    }

    /** One row per alarm, a bar per activation, coloured by priority. */
    static JFreeChart timeline(List<AlarmStatistics> alarms, ReportWindow window, ZoneId zone) {
        List<AlarmStatistics> rows = new ArrayList<>(alarms);
        rows.sort(java.util.Comparator.comparing((AlarmStatistics a) -> a.activations().get(0).start())
                .thenComparing(AlarmStatistics::alarmId));
        XYIntervalSeriesCollection data = new XYIntervalSeriesCollection();
        XYBarRenderer renderer = new XYBarRenderer();
        renderer.setUseYInterval(true);
        renderer.setShadowVisible(false);
        renderer.setBarPainter(new StandardXYBarPainter());
        renderer.setDrawBarOutline(false);
        String[] names = new String[rows.size()];
        for (int i = 0; i < rows.size(); i++) {
            names[i] = rows.get(i).alarmId();
        }
        for (Priority priority : Priority.values()) {
            XYIntervalSeries series = new XYIntervalSeries(priority.word() + " priority");
            for (int i = 0; i < rows.size(); i++) {
                for (AlarmActivation activation : rows.get(i).activations()) {
                    if (activation.priority() != priority) {
                        continue;
                    }
                    double start = activation.start().toEpochMilli();
                    // at least a visible sliver for a fleeting activation
                    double end = Math.max(activation.end().orElse(window.until()).toEpochMilli(),
                            start + window.length().toMillis() / 400.0);
                    series.add(start, start, end, i, i - 0.32, i + 0.32);
                }
            }
            if (series.getItemCount() > 0) {
                renderer.setSeriesPaint(data.getSeriesCount(), Palette.of(priority));
                data.addSeries(series);
            }
        }
        SymbolAxis axis = new SymbolAxis(null, names);
        axis.setTickLabelFont(LABEL);
        axis.setGridBandsVisible(false);
        XYPlot plot = new XYPlot(data, timeAxis(window, zone), axis, renderer);
        style(plot);
        return chart("Alarm timeline (active, acknowledged or not)", plot, true);
    }

    /** Alarms started per interval as bars, the flood benchmark as a line and flood periods shaded. */
    static JFreeChart rate(List<RateInterval> rate, List<FloodPeriod> floods, int floodAbove, String intervalWords,
            ReportWindow window, ZoneId zone) {
        XYIntervalSeries series = new XYIntervalSeries("alarms started per " + intervalWords);
        int highest = floodAbove + 1;
        for (RateInterval interval : rate) {
            double start = interval.start().toEpochMilli();
            double end = interval.end().toEpochMilli();
            series.add((start + end) / 2, start, end, interval.activations(), 0, interval.activations());
            highest = Math.max(highest, interval.activations());
        }
        XYIntervalSeriesCollection data = new XYIntervalSeriesCollection();
        data.addSeries(series);
        XYBarRenderer renderer = new XYBarRenderer(0.08);
        renderer.setShadowVisible(false);
        renderer.setBarPainter(new StandardXYBarPainter());
        renderer.setSeriesPaint(0, Palette.BARS);
        NumberAxis counts = new NumberAxis("alarms");
        counts.setStandardTickUnits(NumberAxis.createIntegerTickUnits());
        counts.setRange(0, highest * 1.15);
        counts.setLabelFont(LABEL);
        XYPlot plot = new XYPlot(data, timeAxis(window, zone), counts, renderer);
        style(plot);
        ValueMarker benchmark = new ValueMarker(floodAbove, Palette.LIMIT, LIMIT_STROKE);
        benchmark.setLabel("flood: more than " + floodAbove + " per " + intervalWords + " (EEMUA 191)");
        benchmark.setLabelFont(LABEL);
        benchmark.setLabelPaint(Palette.LIMIT);
        benchmark.setLabelAnchor(RectangleAnchor.TOP_LEFT);
        benchmark.setLabelTextAnchor(TextAnchor.BOTTOM_LEFT);
        benchmark.setLabelBackgroundColor(Palette.LABEL_BACKGROUND);
        plot.addRangeMarker(benchmark, Layer.FOREGROUND);
        for (FloodPeriod flood : floods) {
            double end = Math.max(flood.end().toEpochMilli(), flood.start().toEpochMilli() + 60_000);
            plot.addDomainMarker(new IntervalMarker(flood.start().toEpochMilli(), end, Palette.FLOOD_SHADE),
                    Layer.BACKGROUND);
        }
        return chart("Alarm rate", plot, true);
    }

    /**
     * The chart drawn as a PNG embedded in an {@code <img>} (a data URI), so the page stays one self-contained
     * file. Drawn at twice the size for sharp text on high-density screens; the page scales it to its width.
     * JFreeChart's own PNG encoder is used: an SVG writer would add a GPL-licensed library to the jar.
     */
    static String image(JFreeChart chart, int height, String id, String description) {
        BufferedImage image = chart.createBufferedImage(WIDTH * 2, height * 2, WIDTH, height, null);
        byte[] png;
        try {
            png = ChartUtils.encodeAsPNG(image, false, 9);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot encode the plot " + id + " as PNG", e);
        }
        return "<img id='" + id + "' width='" + WIDTH + "' height='" + height + "' alt='"
                + description.replace("&", "&amp;").replace("'", "&#39;").replace("<", "&lt;")
                + "' src='data:image/png;base64," + Base64.getEncoder().encodeToString(png) + "'>";
    }

    private static JFreeChart chart(String title, XYPlot plot, boolean legend) {
        JFreeChart chart = new JFreeChart(title, TITLE, plot, legend);
        chart.setBackgroundPaint(Color.WHITE);
        chart.getTitle().setPaint(Palette.INK);
        chart.setAntiAlias(true);
        chart.setPadding(new RectangleInsets(6, 6, 6, 14));
        if (chart.getLegend() != null) {
            chart.getLegend().setItemFont(LABEL);
            chart.getLegend().setFrame(org.jfree.chart.block.BlockBorder.NONE);
        }
        return chart;
    }

    private static void style(XYPlot plot) {
        plot.setBackgroundPaint(Palette.PLOT_BACKGROUND);
        plot.setDomainGridlinePaint(Palette.GRID);
        plot.setRangeGridlinePaint(Palette.GRID);
        plot.setOutlinePaint(Palette.GRID);
        plot.getDomainAxis().setTickLabelFont(LABEL);
        plot.getRangeAxis().setTickLabelFont(LABEL);
    }

    private static DateAxis timeAxis(ReportWindow window, ZoneId zone) {
        DateAxis axis = new DateAxis(null, TimeZone.getTimeZone(zone), Locale.ROOT);
        axis.setRange(window.from().toEpochMilli(), window.until().toEpochMilli());
        axis.setTickLabelFont(LABEL);
        return axis;
    }

    /** A logarithmic axis for positive values spanning more than three decades (a vacuum), linear otherwise. */
    private static ValueAxis valueAxis(String unit, double low, double high) {
        if (low > 0 && Double.isFinite(high) && high / low > 1000) {
            LogAxis axis = new LogAxis(unit.isEmpty() ? null : unit);
            axis.setRange(low / 2, high * 2);
            axis.setLabelFont(LABEL);
            return axis;
        }
        NumberAxis axis = new NumberAxis(unit.isEmpty() ? null : unit);
        axis.setAutoRangeIncludesZero(false);
        if (Double.isFinite(low) && Double.isFinite(high)) {
            double margin = high > low ? (high - low) * 0.08 : Math.max(Math.abs(high) * 0.05, 0.5);
            axis.setRange(low - margin, high + margin);
        }
        axis.setLabelFont(LABEL);
        return axis;
    }
}
