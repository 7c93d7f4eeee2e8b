package dev.winnow.app.seed;

import java.io.IOException;
import java.io.Writer;
import java.nio.file.Path;
import java.time.LocalDate;
import java.util.Locale;

/**
 * Streams a large synthetic daily panel in the demo panel's column layout, for benchmarks: {@code securities} securities
 * on {@code dates} consecutive business days from 2000-01-03, every security on every day, written row by row so that
 * memory stays bounded by the number of securities (plus a 252-day return window each), never by the panel.
 * The same arguments give the same bytes on every run.
 *
 * <p>Daily model: r = rf + beta * mkt + sector shock + sum_k (lambda_k / 21) * x_k + sigma * e, with x_k the latent
 * AR(1) state of each characteristic (daily persistence phi_month^(1/21)), lambda_k the demo's monthly premia and e
 * unit-variance Student t(5) noise. {@code momentum_12_1} is the compounded return over trading days t-251..t-21
 * (twelve months less the latest one at 21 trading days a month). About 2% of characteristic cells and 0.2% of
 * market caps are missing.
 *
 * <p>{@link Columns#NARROW} writes the same model with only seven columns ({@value #NARROW_HEADER}): the layout the
 * comparison benchmark loads into both Winnow and an embedded analytical database.
 *
 * <p>Run as {@code java -cp winnow.jar dev.winnow.app.seed.SyntheticPanelWriter <out.csv[.gz]> <securities> <dates> [seed] [narrow]};
 * the benchmark size is 3000 securities by 6300 dates (about 19 million rows).
 */
public final class SyntheticPanelWriter {

    public static final long DEFAULT_SEED = 6_300L;
    public static final String NARROW_HEADER = "date,security,return,market_cap,book_to_price,momentum_12_1,sector";

    /** Which columns to write: the demo panel's full layout, or the seven-column one. */
    public enum Columns { ALL, NARROW }

    private static final int DAYS_PER_MONTH = 21;
    private static final int WINDOW = 252;
    private static final int SKIPPED = DAYS_PER_MONTH;
    private static final double MISSING_CHARACTERISTIC = 0.02;
    private static final double MISSING_MARKET_CAP = 0.002;
    private static final LocalDate FIRST_DATE = LocalDate.of(2000, 1, 3);

    private final int securities;
    private final SeededDraws draws;
    private final String[] codes;
    private final int[] sector;
    private final boolean[] main;
    private final double[] beta;
    private final double[] volatility;
    private final double[] marketCap;
    private final double[][] latent;
    /** Ring of the last {@link #WINDOW} daily log returns per security, and the running sum of the momentum window. */
    private final double[][] logReturns;
    private final double[] momentumLogSum;
    private final Characteristic[] characteristics = Characteristic.values();
    private final double[] persistence;
    private final double[] dailyPremia;
    private double annualRate = 0.04;

    private SyntheticPanelWriter(int securities, long seed) {
        this.securities = securities;
        this.draws = new SeededDraws(seed);
        codes = new String[securities];
        sector = new int[securities];
        main = new boolean[securities];
        beta = new double[securities];
        volatility = new double[securities];
        marketCap = new double[securities];
        latent = new double[securities][characteristics.length];
        logReturns = new double[securities][WINDOW];
        momentumLogSum = new double[securities];
        persistence = new double[characteristics.length];
        dailyPremia = new double[characteristics.length];
        double[] monthlyPremia = PlantedPremia.DEMO.perCharacteristic();
        for (int k = 0; k < characteristics.length; k++) {
            persistence[k] = characteristics[k].persistence(DAYS_PER_MONTH);
            dailyPremia[k] = monthlyPremia[characteristics[k].columnIndex()] / DAYS_PER_MONTH;
        }
        int width = Math.max(5, Integer.toString(securities).length());
        for (int i = 0; i < securities; i++) {
            codes[i] = String.format(Locale.ROOT, "SY%0" + width + "d", i + 1);
            sector[i] = draws.integer(0, PanelLayout.SECTORS.size() - 1);
            main[i] = draws.chance(DemoCompanies.MAIN_SHARE);
            beta[i] = Math.min(1.8, Math.max(0.4, 1.0 + 0.25 * draws.gaussian()));
            volatility[i] = (main[i] ? 0.011 : 0.019) * StrictMath.exp(0.2 * draws.gaussian());
            marketCap[i] = StrictMath.exp(main[i] ? StrictMath.log(4000.0) + 0.7 * draws.gaussian()
                    : StrictMath.log(700.0) + 0.8 * draws.gaussian());
            for (int k = 0; k < characteristics.length; k++) {
                latent[i][k] = draws.gaussian();
            }
        }
    }

    /** Writes the header and {@code securities * dates} rows to {@code out}, date by date, securities in code order. */
    public static void write(Writer out, int securities, int dates, long seed) throws IOException {
        write(out, securities, dates, seed, Columns.ALL);
    }

    /** As {@link #write(Writer, int, int, long)}, with the given columns; the values do not depend on the choice. */
    public static void write(Writer out, int securities, int dates, long seed, Columns columns) throws IOException {
        if (securities < 1 || dates < 1) {
            throw new IllegalArgumentException("securities and dates must both be at least 1, got " + securities + " and " + dates);
        }
        new SyntheticPanelWriter(securities, seed).writeRows(out, dates, columns);
    }

    /** Writes the panel to {@code file}, gzip-compressed when the name ends with ".gz". */
    public static void write(Path file, int securities, int dates, long seed) throws IOException {
        write(file, securities, dates, seed, Columns.ALL);
    }

    /** Writes the panel with the given columns to {@code file}, gzip-compressed when the name ends with ".gz". */
    public static void write(Path file, int securities, int dates, long seed, Columns columns) throws IOException {
        try (Writer out = PanelLayout.openWriter(file)) {
            write(out, securities, dates, seed, columns);
        }
    }

    private void writeRows(Writer out, int dates, Columns columns) throws IOException {
        boolean narrow = columns == Columns.NARROW;
        int bookToPriceColumn = PanelLayout.CHARACTERISTICS.indexOf("book_to_price");
        out.write(narrow ? NARROW_HEADER : PanelLayout.HEADER);
        out.write('\n');
        StringBuilder row = new StringBuilder(256);
        double[] values = new double[PanelLayout.CHARACTERISTICS.size()];
        double[] sectorShock = new double[PanelLayout.SECTORS.size()];
        int momentumColumn = PanelLayout.CHARACTERISTICS.indexOf("momentum_12_1");
        LocalDate date = FIRST_DATE;
        for (int day = 0; day < dates; day++) {
            annualRate = Math.min(0.06, Math.max(0.0005, annualRate + 0.01 * (0.03 - annualRate) / DAYS_PER_MONTH
                    + 0.0006 * draws.gaussian()));
            double riskFree = annualRate / 252.0;
            double market = 0.00025 + 0.0095 * draws.unitStudentT(5);
            for (int g = 0; g < sectorShock.length; g++) {
                sectorShock[g] = 0.004 * draws.gaussian();
            }
            String dateText = date.toString();
            for (int i = 0; i < securities; i++) {
                double r = dayReturn(i, riskFree, market, sectorShock[sector[i]]);
                marketCap[i] *= 1.0 + r;
                double momentum = rememberReturn(i, day, r);
                for (int k = 0; k < characteristics.length; k++) {
                    latent[i][k] = Characteristic.step(latent[i][k], persistence[k], draws.gaussian());
                    double value = characteristics[k].fromLatent(latent[i][k]);
                    values[characteristics[k].columnIndex()] = draws.chance(MISSING_CHARACTERISTIC) ? Double.NaN : value;
                }
                values[momentumColumn] = draws.chance(MISSING_CHARACTERISTIC) ? Double.NaN : momentum;
                double cap = draws.chance(MISSING_MARKET_CAP) ? Double.NaN : marketCap[i];
                row.setLength(0);
                if (narrow) {
                    PanelLayout.appendNarrowRow(row, dateText, codes[i], r, cap, values[bookToPriceColumn],
                            values[momentumColumn], PanelLayout.SECTORS.get(sector[i]));
                } else {
                    PanelLayout.appendRow(row, dateText, codes[i], r, cap, values, PanelLayout.SECTORS.get(sector[i]),
                            main[i] ? PanelLayout.MAIN_TIER : PanelLayout.GROWTH_TIER);
                }
                out.append(row);
            }
            date = BusinessCalendar.next(date);
        }
    }

    private double dayReturn(int i, double riskFree, double market, double sectorShock) {
        double r = riskFree + beta[i] * market + sectorShock;
        for (int k = 0; k < characteristics.length; k++) {
            r += dailyPremia[k] * latent[i][k];
        }
        r += volatility[i] * draws.unitStudentT(5);
        return Math.max(-0.9, r);
    }

    /**
     * Stores day {@code day}'s return and returns the momentum known at the end of that day: the compounded return
     * over days day-251..day-21, NaN until that window is complete. The window sum is kept running: each day adds the
     * log return that enters the window and drops the one that leaves it.
     */
    private double rememberReturn(int i, int day, double r) {
        double[] ring = logReturns[i];
        int leaving = day - WINDOW; // shares today's slot, so it leaves before today is stored
        if (leaving >= 0) {
            momentumLogSum[i] -= ring[leaving % WINDOW];
        }
        ring[day % WINDOW] = StrictMath.log1p(r);
        int entering = day - SKIPPED;
        if (entering >= 0) {
            momentumLogSum[i] += ring[entering % WINDOW];
        }
        return day >= WINDOW - 1 ? StrictMath.expm1(momentumLogSum[i]) : Double.NaN;
    }

    /** {@code SyntheticPanelWriter <out.csv[.gz]> <securities> <dates> [seed] [narrow]}. */
    public static void main(String[] args) throws IOException {
        if (args.length < 3 || args.length > 5 || (args.length == 5 && !args[4].equals("narrow"))) {
            System.err.println("usage: java -cp winnow.jar dev.winnow.app.seed.SyntheticPanelWriter <out.csv[.gz]> <securities> <dates> [seed] [narrow]");
            System.exit(2);
        }
        Path file = Path.of(args[0]);
        int securities = Integer.parseInt(args[1]);
        int dates = Integer.parseInt(args[2]);
        long seed = args.length >= 4 ? Long.parseLong(args[3]) : DEFAULT_SEED;
        long start = System.nanoTime();
        write(file, securities, dates, seed, args.length == 5 ? Columns.NARROW : Columns.ALL);
        System.out.printf(Locale.ROOT, "wrote %d rows to %s in %.1f s%n", (long) securities * dates, file,
                (System.nanoTime() - start) / 1e9);
    }
}
