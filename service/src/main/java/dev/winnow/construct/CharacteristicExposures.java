package dev.winnow.construct;

import dev.winnow.stats.CrossSectionalZScore;

import java.util.List;

/**
 * Characteristic exposures at one date: each numeric characteristic's cross-sectional z-score across the securities
 * with a row, winsorised at 3 standard deviations and then standardised ({@link CrossSectionalZScore}; winsorising
 * before standardising is common practice in fundamental risk models). Missing values stay NaN.
 */
public final class CharacteristicExposures {

    private CharacteristicExposures() {
    }

    /**
     * {@code result[c][i]} is the z-score of column {@code columns.get(c)} for row i of the cross-section.
     * A column absent at the date reads as all missing, so its scores are NaN.
     */
    public static double[][] zScores(CrossSection cs, List<String> columns) {
        if (columns == null || columns.isEmpty()) {
            throw new IllegalArgumentException("columns must name at least one numeric characteristic");
        }
        double[][] scores = new double[columns.size()][];
        for (int c = 0; c < scores.length; c++) {
            scores[c] = CrossSectionalZScore.winsorisedZScores(finiteOrNaN(cs.numberColumn(columns.get(c))));
        }
        return scores;
    }

    private static double[] finiteOrNaN(double[] values) {
        double[] copy = values.clone();
        for (int i = 0; i < copy.length; i++) {
            if (Double.isInfinite(copy[i])) {
                copy[i] = Double.NaN;
            }
        }
        return copy;
    }
}
