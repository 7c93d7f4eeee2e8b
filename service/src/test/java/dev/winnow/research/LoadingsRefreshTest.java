package dev.winnow.research;

import dev.winnow.construct.CrossSection;
import dev.winnow.construct.LoadingsSpec;
import dev.winnow.construct.LoadingsTable;
import dev.winnow.construct.SecurityLoadings;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.LoadingsFactors;
import dev.winnow.store.LoadingsStore;
import dev.winnow.store.LoadingsTestStore;
import dev.winnow.store.StorePanelSource;
import org.junit.jupiter.api.AfterEach;
import org.junit.jupiter.api.BeforeEach;
import org.junit.jupiter.api.Test;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Optional;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

/**
 * Stored loadings against loadings computed on the fly from the same store (bit for bit), through the history job,
 * an append, a revision of panel data and a revision of factor data. The reference is SecurityLoadings.at, checked
 * itself against NIST Longley and numpy in the construct tests.
 */
class LoadingsRefreshTest {
    private static final int SECURITIES = 25;
    private static final int DATES = 70;
    private static final LoadingsSpec SPEC = new LoadingsSpec(List.of("mkt", "value", "carry"), 30, 15);

    private LoadingsTestStore store;
    private List<LocalDate> dates;
    private double[][] f;
    private List<CrossSection> slices;
    private long panelId;
    private LoadingsRefresh refresh;

    @BeforeEach
    void setUp() {
        store = new LoadingsTestStore();
        dates = LoadingsTestStore.weekdays(LocalDate.of(2024, 1, 1), DATES + 1);
        f = LoadingsTestStore.factorReturns(11, 3, DATES + 1);
        f[2][12] = Double.NaN;
        slices = LoadingsTestStore.slices(12, SECURITIES, dates, f, 0, DATES);
        panelId = store.upload("harbor-equities", SECURITIES, slices.subList(0, DATES), true);
        for (int j = 0; j < 3; j++) {
            store.factor(SPEC.factors().get(j), dates, LoadingsTestStore.prefix(f[j], DATES));
        }
        refresh = new LoadingsRefresh(store.panels, store.factors, store.loadings);
    }

    @AfterEach
    void tearDown() {
        store.close();
    }

    @Test
    void historyJobStoresExactlyWhatIsComputedOnTheFly() {
        store.loadings.saveConfig(panelId, SPEC);
        List<Double> progress = new ArrayList<>();
        LoadingsHistory report = new LoadingsRefresh(store.panels, store.factors, store.loadings).computeHistory(panelId, progress::add);
        assertEquals(DATES, report.computedDates());
        assertEquals(1.0, progress.get(progress.size() - 1));
        assertStoredEqualsOnTheFly(DATES);
    }

    @Test
    void appendComputesTheNewDateAndRestampsTheRest() {
        store.loadings.saveConfig(panelId, SPEC);
        new LoadingsRefresh(store.panels, store.factors, store.loadings).computeHistory(panelId, p -> { });
        store.upload("harbor-equities", SECURITIES, slices.subList(DATES, DATES + 1), false);
        for (int j = 0; j < 3; j++) {
            store.extendFactor(SPEC.factors().get(j), dates, f[j], DATES, null);
        }
        LoadingsUpdate report = refresh.afterUpload(panelId, List.of(dates.get(DATES)), false);
        assertEquals(LoadingsUpdate.Outcome.REFRESHED, report.loadings(), report.toString());
        assertEquals(1, report.computedDates());
        assertEquals(DATES, report.restampedDates());
        assertStoredEqualsOnTheFly(DATES + 1);
    }

    @Test
    void panelRevisionRecomputesEveryStoredDateWhoseWindowHoldsIt() {
        store.loadings.saveConfig(panelId, SPEC);
        new LoadingsRefresh(store.panels, store.factors, store.loadings).computeHistory(panelId, p -> { });
        int revised = 35;
        CrossSection old = slices.get(revised);
        double[] returns = old.returns().clone();
        for (int i = 0; i < returns.length; i++) {
            returns[i] = returns[i] * 3 + 0.01;
        }
        CrossSection changed = new CrossSection(old.date(), old.securityIds(), returns, old.marketCaps(), old.numbers(), old.labels());
        LoadingsTable before = storedAt(34);
        store.upload("harbor-equities", SECURITIES, List.of(changed), false);
        LoadingsUpdate report = refresh.afterUpload(panelId, List.of(old.date()), true);
        assertEquals(SPEC.window(), report.computedDates(), "dates 35..64 hold the revised date in their window");
        assertEquals(dates.get(revised), report.firstComputed());
        assertEquals(dates.get(revised + SPEC.window() - 1), report.lastComputed());
        assertEquals(before, storedAt(34), "a date before the revision keeps its row");
        assertStoredEqualsOnTheFly(DATES);
    }

    @Test
    void factorRevisionRecomputesOnlyWindowsWhoseFactorReturnsChanged() {
        store.loadings.saveConfig(panelId, SPEC);
        new LoadingsRefresh(store.panels, store.factors, store.loadings).computeHistory(panelId, p -> { });
        double[] revised = LoadingsTestStore.prefix(f[1], DATES);
        for (int t = 60; t < DATES; t++) {
            revised[t] += 0.002;
        }
        store.extendFactor("value", dates, revised, 60, dates.get(60));
        LoadingsUpdate report = refresh.afterUpload(panelId, List.of(), false);
        assertEquals(DATES - 60, report.computedDates());
        assertEquals(60, report.restampedDates());
        assertStoredEqualsOnTheFly(DATES);
    }

    @Test
    void withoutConfigTheHookSkipsAndAConfigChangeDropsStoredRows() {
        assertEquals(LoadingsUpdate.Outcome.SKIPPED, refresh.afterUpload(panelId, List.of(dates.get(5)), false).loadings());
        store.loadings.saveConfig(panelId, SPEC);
        new LoadingsRefresh(store.panels, store.factors, store.loadings).computeHistory(panelId, p -> { });
        assertEquals(DATES, store.loadings.stamps(panelId).size());
        store.loadings.saveConfig(panelId, SPEC);
        assertEquals(DATES, store.loadings.stamps(panelId).size(), "saving the same config keeps the rows");
        store.loadings.saveConfig(panelId, new LoadingsSpec(SPEC.factors(), 40, 20));
        assertTrue(store.loadings.stamps(panelId).isEmpty(), "another config drops the rows");
    }

    private LoadingsTable storedAt(int index) {
        return store.loadings.read(panelId, dates.get(index), fingerprint()).orElseThrow();
    }

    private String fingerprint() {
        return LoadingsStore.fingerprint(SPEC, LoadingsFactors.currentVersions(store.factors, SPEC.factors()));
    }

    private void assertStoredEqualsOnTheFly(int dateCount) {
        StorePanelSource source = store.panels.source(panelId);
        assertEquals(dateCount, source.dates().size());
        List<ReturnSeries> series = SPEC.factors().stream().map(store::series).toList();
        String fingerprint = fingerprint();
        for (int t = 0; t < dateCount; t++) {
            Optional<LoadingsTable> stored = store.loadings.read(panelId, dates.get(t), fingerprint);
            assertTrue(stored.isPresent(), "stored and fresh at " + dates.get(t));
            assertEquals(SecurityLoadings.at(source, series, t, SPEC.window(), SPEC.minObs()), stored.get(), "at " + dates.get(t));
        }
        assertEquals(dateCount, store.loadings.stamps(panelId).size());
    }
}
