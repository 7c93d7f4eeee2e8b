package dev.winnow.store;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;

import dev.winnow.construct.FactorDefinition;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.Replaced;
import dev.winnow.store.FactorStore.StoredBuild;
import dev.winnow.store.FactorStore.StoredPortfolioReturn;

import java.nio.file.Path;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Stored portfolio returns, one packed row per date (V75), against the values saved, compared by their IEEE 754 bit
 * patterns (Double.doubleToRawLongBits, the standard's encoding, not the project's): a build, an append and a
 * revision read back exactly what was saved, and a version whose rows a release before V75 stored one per portfolio
 * and date reads as the union of both layouts until a rebuild replaces them.
 */
class PortfolioStorageTest {
    private static final LocalDate D0 = LocalDate.of(2021, 3, 1);
    private static final String DEFINITION = "{\"panel\":\"p\",\"method\":\"sort\",\"signal\":\"s\",\"buckets\":2}";

    @Test
    void packedRowsReadBackBitForBit() {
        List<StoredPortfolioReturn> day = List.of(new StoredPortfolioReturn(D0, "1", -0.0),
                new StoredPortfolioReturn(D0, "Größe hoch", Double.MIN_VALUE), new StoredPortfolioReturn(D0, "3", -1.0 / 3));
        List<StoredPortfolioReturn> back = FactorStore.unpackPortfolios(D0, FactorStore.packPortfolios(day));
        assertEquals(day.size(), back.size());
        for (int i = 0; i < day.size(); i++) {
            assertEquals(day.get(i).portfolio(), back.get(i).portfolio());
            assertEquals(Double.doubleToRawLongBits(day.get(i).value()), Double.doubleToRawLongBits(back.get(i).value()));
        }
    }

    @Test
    void buildsAppendsAndRevisionsReadBackWhatWasSavedWithRowsOfTheOldLayout(@TempDir Path dir) {
        try (TestDatabase store = TestDatabase.fresh(dir, "jdbc:h2:file:" + dir.resolve("store").toAbsolutePath());
             Database db = Database.open(store.url())) {
            PanelStore panels = TestDatabase.panels(db.jdbi());
            FactorStore factors = new FactorStore(db.jdbi());
            long panelId = panels.createPanelIfAbsent("p");
            FactorVersionRecord v = factors.define("f", DEFINITION, FactorDefinition.Method.SORT, panelId).version();

            // dates 0-2 stored by a release before V75: one row per portfolio and date
            for (int d = 0; d < 3; d++) {
                for (String p : List.of("1", "2")) {
                    int day = d;
                    db.jdbi().useHandle(h -> h.createUpdate("INSERT INTO factor_portfolio_returns (factor_id, version, portfolio, "
                                    + "obs_date, ret) VALUES (:f, :v, :p, :d, :r)")
                            .bind("f", v.factorId()).bind("v", v.version()).bind("p", p).bind("d", D0.plusDays(day))
                            .bind("r", value(p, day, 0)).execute());
                }
            }
            // appended: dates 3-5 in the packed layout; portfolio "2" has no return on date 4
            factors.saveBuild(v.factorId(), v.version(), build(3, 6, 0), Replaced.NOTHING);
            assertPortfolios(factors, v, 0, 6, d -> 0);

            // revised from date 2 on: the old row of date 2 and the packed rows after it are replaced
            factors.saveBuild(v.factorId(), v.version(), build(2, 7, 1), Replaced.onOrAfter(D0.plusDays(2)));
            assertPortfolios(factors, v, 0, 7, d -> d >= 2 ? 1 : 0);

            // rebuilt: nothing of the old layout is left
            factors.saveBuild(v.factorId(), v.version(), build(0, 7, 2), Replaced.EVERYTHING);
            assertPortfolios(factors, v, 0, 7, d -> 2);
            assertEquals(0, count(db, "factor_portfolio_returns"), "rows of the old layout");
            assertEquals(7, count(db, "factor_portfolio_dates"), "one packed row per date");
        }
    }

    private static int count(Database db, String table) {
        return db.jdbi().withHandle(h -> h.createQuery("SELECT COUNT(*) FROM " + table).mapTo(Integer.class).one());
    }

    /** A distinct value per portfolio, date and build, with bits a decimal round trip would not keep. */
    private static double value(String portfolio, int day, int build) {
        return (portfolio.equals("1") ? 1 : -1) * (day + 1) / 7.0 + build * Math.ulp(1.0) * 3;
    }

    /** Portfolio "2" has no return on date 4 (no row, as the engine's NaN is stored). */
    private static boolean missing(String portfolio, int day) {
        return portfolio.equals("2") && day == 4;
    }

    private static StoredBuild build(int from, int to, int build) {
        List<StoredPortfolioReturn> rows = new ArrayList<>();
        for (int d = from; d < to; d++) {
            for (String p : List.of("1", "2")) {
                if (!missing(p, d)) {
                    rows.add(new StoredPortfolioReturn(D0.plusDays(d), p, value(p, d, build)));
                }
            }
        }
        return new StoredBuild(List.of(), List.of(), List.of(), new byte[] {1}, "{}", rows);
    }

    private static void assertPortfolios(FactorStore factors, FactorVersionRecord v, int from, int to,
                                         java.util.function.IntUnaryOperator buildOf) {
        Map<String, ReturnSeries> got = factors.portfolios(v.factorId(), v.version());
        assertEquals(List.of("1", "2"), List.copyOf(got.keySet()));
        for (String p : List.of("1", "2")) {
            List<LocalDate> dates = new ArrayList<>();
            List<Long> bits = new ArrayList<>();
            for (int d = from; d < to; d++) {
                if (!missing(p, d)) {
                    dates.add(D0.plusDays(d));
                    bits.add(Double.doubleToRawLongBits(value(p, d, buildOf.applyAsInt(d))));
                }
            }
            ReturnSeries series = got.get(p);
            assertEquals(dates, List.of(series.dates()), "portfolio " + p);
            assertArrayEquals(bits.stream().mapToLong(Long::longValue).toArray(),
                    java.util.Arrays.stream(series.values()).mapToLong(Double::doubleToRawLongBits).toArray(), "portfolio " + p);
        }
    }
}
