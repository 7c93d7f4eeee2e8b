package dev.winnow.construct;

import dev.winnow.construct.FactorDefinition.Method;
import dev.winnow.stats.ReturnSeries;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;

/**
 * A factor rebuilt inside segments of the market, to see whether its premium is broad or lives in one corner. Each
 * segment's build runs the same definition with its universe further restricted at every formation: to the small
 * or the big half by market_cap ({@link SizeHalf}: at or below, or above, the type-7 median of the eligible), or to
 * the securities whose label in a column equals one value ({@link Universe#segment()}). Breakpoints and weights are
 * then computed inside the segment, as if the segment were the whole market.
 */
public final class SegmentRebuild {

    /** Segment label used for the default size halves. */
    public static final String SIZE_HALVES = "market_cap_half";

    /** One segment's spread series. */
    public record Segment(String value, ReturnSeries spread) {
    }

    private SegmentRebuild() {
    }

    /** True when the method builds from a panel and so can be rebuilt inside segments (sort, size_sort, market). */
    public static boolean supports(FactorDefinition def) {
        return def.method() != null && def.method() != Method.EXTERNAL;
    }

    /**
     * The factor rebuilt in the small and the big half of market_cap at each formation, in that order; each build
     * forms ahead on {@code forming} ({@link FormingThreads#NONE}: on the caller's thread; same bits).
     */
    public static List<Segment> bySizeHalf(FactorDefinition def, PanelSource panel, ReturnSeries riskFree,
                                           FormingThreads forming) {
        List<Segment> out = new ArrayList<>();
        out.add(new Segment("small", spread(def.withUniverse(def.effectiveUniverse().withSizeHalf(SizeHalf.SMALL)), panel, riskFree, forming)));
        out.add(new Segment("big", spread(def.withUniverse(def.effectiveUniverse().withSizeHalf(SizeHalf.BIG)), panel, riskFree, forming)));
        return out;
    }

    /** The factor rebuilt once per given value of a label column, in the order given; forming as {@link #bySizeHalf}. */
    public static List<Segment> byLabel(FactorDefinition def, PanelSource panel, ReturnSeries riskFree, String column,
                                        List<String> values, FormingThreads forming) {
        List<Segment> out = new ArrayList<>();
        for (String value : values) {
            Universe inside = def.effectiveUniverse().withSegment(new LabelEquals(column, value));
            out.add(new Segment(value, spread(def.withUniverse(inside), panel, riskFree, forming)));
        }
        return out;
    }

    /** The distinct non-missing values of a label column over the whole panel, sorted. */
    public static List<String> distinctLabels(PanelSource panel, String column) {
        TreeSet<String> values = new TreeSet<>();
        for (int i = 0; i < panel.dates().size(); i++) {
            for (String label : panel.crossSection(i).labelColumn(column)) {
                if (label != null) {
                    values.add(label);
                }
            }
        }
        return List.copyOf(values);
    }

    private static ReturnSeries spread(FactorDefinition def, PanelSource panel, ReturnSeries riskFree, FormingThreads forming) {
        BuildResult result = FactorEngine.build(def, panel, riskFree, Map.of(), null, forming);
        List<FactorObservation> observations = result.observations();
        LocalDate[] dates = new LocalDate[observations.size()];
        double[] values = new double[observations.size()];
        for (int i = 0; i < dates.length; i++) {
            dates[i] = observations.get(i).date();
            values[i] = observations.get(i).spread();
        }
        return new ReturnSeries(dates, values);
    }
}
