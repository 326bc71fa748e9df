package org.roundtable.report.chart;

import java.util.LinkedHashMap;
import java.util.Map;
import org.roundtable.report.model.MeasurandSection;

/**
 * Chart data per measurand section, computed once and reused while the same sections are rendered
 * again (the round report and every laboratory report of one evaluation run share the section
 * objects). Keys are the section objects themselves (identity), so a section is never confused with
 * another; the cache keeps the most recently used {@value #CAPACITY} sections.
 *
 * <p>Thread-safe. Meant to live as long as one renderer, e.g. for one issue job.
 */
public final class ChartDataCache {

    static final int CAPACITY = 256;

    private final Map<Identity, MeasurandChartData> entries = new LinkedHashMap<>(64, 0.75f, true) {
        @Override
        protected boolean removeEldestEntry(Map.Entry<Identity, MeasurandChartData> eldest) {
            return size() > CAPACITY;
        }
    };

    /** The chart data of the section, computed on first use. */
    public MeasurandChartData get(MeasurandSection m) {
        Identity key = new Identity(m);
        synchronized (entries) {
            MeasurandChartData data = entries.get(key);
            if (data != null) {
                return data;
            }
        }
        MeasurandChartData data = MeasurandChartData.of(m);
        synchronized (entries) {
            entries.putIfAbsent(key, data);
            return entries.get(key);
        }
    }

    /** A key that compares sections by identity (a record's equals would compare every result). */
    private record Identity(MeasurandSection section) {
        @Override
        public boolean equals(Object o) {
            return o instanceof Identity other && other.section == section;
        }

        @Override
        public int hashCode() {
            return System.identityHashCode(section);
        }
    }
}
