package dev.winnow.app.seed;

import java.io.IOException;
import java.io.Writer;
import java.nio.file.Path;
import java.time.LocalDate;
import java.time.YearMonth;
import java.util.List;
import java.util.function.IntToDoubleFunction;

/**
 * Writes the invented demo market: a monthly security panel ({@value #PANEL_FILE}), the list of its fictional
 * companies ({@value #COMPANIES_FILE}) and four external monthly series, all from one seed, byte for byte the same on
 * every run. The return model and its planted premia are described in {@link DemoMarket} and {@link PlantedPremia}.
 *
 * <p>Run as {@code java -cp service/target/winnow.jar dev.winnow.app.seed.DemoScenarioGenerator seed-data}.
 */
public final class DemoScenarioGenerator {

    public static final String PANEL_FILE = "demo-market.csv.gz";
    public static final String COMPANIES_FILE = "companies.csv";
    public static final String RISK_FREE_FILE = "risk_free.csv";
    public static final String TERM_SPREAD_FILE = "term_spread.csv";
    public static final String CREDIT_SPREAD_FILE = "credit_spread.csv";
    public static final String INFLATION_SURPRISE_FILE = "inflation_surprise.csv";

    /** Every file {@link #generate} writes. */
    public static final List<String> FILES = List.of(PANEL_FILE, COMPANIES_FILE, RISK_FREE_FILE, TERM_SPREAD_FILE,
            CREDIT_SPREAD_FILE, INFLATION_SURPRISE_FILE);

    /**
     * Size and seed of a scenario.
     *
     * @param companies  number of fictional companies over the whole sample
     * @param firstMonth month of the first published month-end
     * @param months     number of published month-ends
     * @param seed       seed of every random draw
     */
    public record Config(int companies, YearMonth firstMonth, int months, long seed) {

        /** The committed demo: 300 companies, month-ends 2000-01 through 2024-12. */
        public static final Config DEMO = new Config(300, YearMonth.of(2000, 1), 300, 20_000_131L);

        public Config {
            if (companies < 1) {
                throw new IllegalArgumentException("companies must be at least 1, got " + companies);
            }
            if (firstMonth == null) {
                throw new IllegalArgumentException("firstMonth is required, e.g. 2000-01");
            }
            if (months < DemoCompanies.MINIMUM_LIFE + 2) {
                throw new IllegalArgumentException("months must be at least " + (DemoCompanies.MINIMUM_LIFE + 2) + ", got " + months);
            }
        }
    }

    private DemoScenarioGenerator() {
    }

    /** Writes every file of {@link #FILES} into {@code directory} (created if needed) with the planted demo premia. */
    public static void generate(Path directory, Config config) throws IOException {
        SeededDraws root = new SeededDraws(config.seed());
        SeededDraws companyDraws = root.split();
        SeededDraws macroDraws = root.split();
        SeededDraws shockDraws = root.split();
        SeededDraws gapDraws = root.split();
        int burnIn = DemoMarket.BURN_IN;
        List<DemoCompany> companies = DemoCompanies.draw(config.companies(), burnIn, config.months(), companyDraws);
        DemoMacro macro = DemoMacro.draw(burnIn + config.months(), PanelLayout.SECTORS.size(), macroDraws);
        List<LocalDate> dates = BusinessCalendar.monthEnds(config.firstMonth(), config.months());

        try (Writer panel = PanelLayout.openWriter(directory.resolve(PANEL_FILE))) {
            new DemoMarket(companies, macro, dates, PlantedPremia.DEMO, shockDraws, gapDraws).run(panel);
        }
        writeCompanies(directory.resolve(COMPANIES_FILE), companies, dates);
        writeSeries(directory.resolve(RISK_FREE_FILE), dates, m -> macro.riskFree(m + burnIn));
        writeSeries(directory.resolve(TERM_SPREAD_FILE), dates, m -> macro.termSpread(m + burnIn));
        writeSeries(directory.resolve(CREDIT_SPREAD_FILE), dates, m -> macro.creditSpread(m + burnIn));
        writeSeries(directory.resolve(INFLATION_SURPRISE_FILE), dates, m -> macro.inflationSurprise(m + burnIn));
    }

    private static void writeCompanies(Path file, List<DemoCompany> companies, List<LocalDate> dates) throws IOException {
        try (Writer out = PanelLayout.openWriter(file)) {
            out.write("security,name,sector,listing_tier,first_date,last_date\n");
            for (DemoCompany c : companies) {
                out.write(c.security() + "," + c.name() + "," + c.sector() + "," + c.tier() + ","
                        + dates.get(Math.max(0, c.firstMonth())) + "," + dates.get(c.lastMonth()) + "\n");
            }
        }
    }

    private static void writeSeries(Path file, List<LocalDate> dates, IntToDoubleFunction valueOfMonth) throws IOException {
        try (Writer out = PanelLayout.openWriter(file)) {
            out.write("date,return\n");
            StringBuilder line = new StringBuilder(32);
            for (int m = 0; m < dates.size(); m++) {
                line.setLength(0);
                line.append(dates.get(m)).append(',');
                PanelLayout.appendNumber(line, valueOfMonth.applyAsDouble(m));
                out.append(line).append('\n');
            }
        }
    }

    /** {@code DemoScenarioGenerator <output directory>}: writes the committed demo scenario. */
    public static void main(String[] args) throws IOException {
        if (args.length != 1) {
            System.err.println("usage: java -cp winnow.jar dev.winnow.app.seed.DemoScenarioGenerator <output directory>");
            System.exit(2);
        }
        Path directory = Path.of(args[0]);
        generate(directory, Config.DEMO);
        System.out.println("wrote " + FILES + " to " + directory.toAbsolutePath().normalize());
    }
}
