package dev.winnow.stats;

/**
 * Sums of deviations dx = x - a, dy = y - b of paired values from fixed shifts a and b, over the positions where both
 * values are numbers (NaN marks a missing observation), plus whether each side varies at all. The correlation
 * r = (Sxy - Sx Sy / n) / sqrt((Sxx - Sx^2 / n)(Syy - Sy^2 / n)) does not depend on the shifts; shifts near the
 * means keep the subtractions free of cancellation (the shifted-data algorithm: Chan, Golub and LeVeque 1983,
 * "Algorithms for computing the sample variance: analysis and recommendations", The American Statistician 37(3)).
 */
record ShiftedSums(int count, boolean variesX, boolean variesY,
                   double sumX, double sumY, double sumXX, double sumYY, double sumXY) {

    /** Sums over positions [0, length) of x and y, skipping positions where either is NaN. */
    static ShiftedSums over(double[] x, double shiftX, double[] y, double shiftY, int length) {
        int count = 0;
        double firstX = 0.0;
        double firstY = 0.0;
        boolean variesX = false;
        boolean variesY = false;
        double sumX = 0.0;
        double sumY = 0.0;
        double sumXX = 0.0;
        double sumYY = 0.0;
        double sumXY = 0.0;
        for (int u = 0; u < length; u++) {
            double xu = x[u];
            double yu = y[u];
            if (Double.isNaN(xu) || Double.isNaN(yu)) {
                continue;
            }
            if (count++ == 0) {
                firstX = xu;
                firstY = yu;
            }
            variesX |= xu != firstX;
            variesY |= yu != firstY;
            double dx = xu - shiftX;
            double dy = yu - shiftY;
            sumX += dx;
            sumY += dy;
            sumXX += dx * dx;
            sumYY += dy * dy;
            sumXY += dx * dy;
        }
        return new ShiftedSums(count, variesX, variesY, sumX, sumY, sumXX, sumYY, sumXY);
    }

    /** Pearson correlation; NaN with fewer than {@link Correlations#MIN_OBSERVATIONS} pairs or a side without variation. */
    double correlation() {
        if (count < Correlations.MIN_OBSERVATIONS || !variesX || !variesY) {
            return Double.NaN;
        }
        return correlation(count, sumX, sumY, sumXX, sumYY, sumXY);
    }

    /** The correlation formula above from raw shifted sums; NaN when a variance is not positive. */
    static double correlation(int n, double sumX, double sumY, double sumXX, double sumYY, double sumXY) {
        double varianceX = sumXX - sumX * sumX / n;
        double varianceY = sumYY - sumY * sumY / n;
        if (!(varianceX > 0.0 && varianceY > 0.0)) {
            return Double.NaN;
        }
        double r = (sumXY - sumX * sumY / n) / (Math.sqrt(varianceX) * Math.sqrt(varianceY));
        return r > 1.0 ? 1.0 : (r < -1.0 ? -1.0 : r);
    }
}
