package dev.winnow.app.seed;

import java.util.SplittableRandom;

/**
 * Random draws from a seeded {@link SplittableRandom}, built only on {@link SplittableRandom#nextDouble()} and
 * {@link StrictMath}, so a seed gives the same numbers on every JVM (the JDK's own Gaussian algorithms are not
 * specified across versions for this generator).
 */
final class SeededDraws {

    private final SplittableRandom random;
    private double spareGaussian = Double.NaN;

    SeededDraws(long seed) {
        this(new SplittableRandom(seed));
    }

    private SeededDraws(SplittableRandom random) {
        this.random = random;
    }

    /** An independent stream for one part of a simulation, so that changing another part leaves it alone. */
    SeededDraws split() {
        return new SeededDraws(random.split());
    }

    /** Uniform on [0, 1). */
    double uniform() {
        return random.nextDouble();
    }

    /** Uniform on [low, high). */
    double uniform(double low, double high) {
        return low + (high - low) * random.nextDouble();
    }

    /** Uniform integer on [low, high] inclusive. */
    int integer(int low, int high) {
        return low + (int) Math.floor(random.nextDouble() * (high - low + 1));
    }

    /** True with probability p. */
    boolean chance(double p) {
        return random.nextDouble() < p;
    }

    /**
     * Standard normal by the Marsaglia polar method: draw (u, v) uniform in the unit disc, s = u^2 + v^2, then
     * u * sqrt(-2 ln s / s) and v * sqrt(-2 ln s / s) are independent N(0, 1) (Marsaglia and Bray, SIAM Review 6, 1964).
     */
    double gaussian() {
        if (!Double.isNaN(spareGaussian)) {
            double value = spareGaussian;
            spareGaussian = Double.NaN;
            return value;
        }
        double u;
        double v;
        double s;
        do {
            u = 2.0 * random.nextDouble() - 1.0;
            v = 2.0 * random.nextDouble() - 1.0;
            s = u * u + v * v;
        } while (s >= 1.0 || s == 0.0);
        double factor = StrictMath.sqrt(-2.0 * StrictMath.log(s) / s);
        spareGaussian = v * factor;
        return u * factor;
    }

    /**
     * Student t with {@code degreesOfFreedom} (> 2) scaled to unit variance: t = Z / sqrt(X / nu) with X a chi-square
     * with nu degrees of freedom drawn as a sum of nu squared normals; Var(t) = nu / (nu - 2) (Johnson, Kotz and
     * Balakrishnan, Continuous Univariate Distributions vol. 2, 1995, ch. 28), so the draw is multiplied by
     * sqrt((nu - 2) / nu).
     */
    double unitStudentT(int degreesOfFreedom) {
        if (degreesOfFreedom <= 2) {
            throw new IllegalArgumentException("degrees of freedom must exceed 2 for a finite variance, got " + degreesOfFreedom);
        }
        double z = gaussian();
        double chiSquare = 0.0;
        for (int i = 0; i < degreesOfFreedom; i++) {
            double g = gaussian();
            chiSquare += g * g;
        }
        double t = z / StrictMath.sqrt(chiSquare / degreesOfFreedom);
        return t * StrictMath.sqrt((degreesOfFreedom - 2.0) / degreesOfFreedom);
    }
}
