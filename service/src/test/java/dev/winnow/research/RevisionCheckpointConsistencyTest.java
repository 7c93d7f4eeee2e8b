package dev.winnow.research;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import dev.winnow.construct.BuildResult;
import dev.winnow.construct.CheckpointedBuild;
import dev.winnow.construct.ConstructionFixtures;
import dev.winnow.construct.CrossSection;
import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.construct.FactorEngine;
import dev.winnow.construct.FormingThreads;
import dev.winnow.construct.FactorObservation;
import dev.winnow.stats.ReturnSeries;
import dev.winnow.store.Database;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.Leg;
import dev.winnow.store.FactorStore.StoredCheckpoint;
import dev.winnow.store.FactorStore.StoredReturn;
import dev.winnow.store.FactorStore.StoredTurnover;
import dev.winnow.store.JobStore;
import dev.winnow.store.JsonText;
import dev.winnow.store.LoadingsTestStore;
import dev.winnow.store.PanelStore;
import dev.winnow.store.TestDatabase;
import dev.winnow.store.SecurityDictionary;
import java.time.LocalDate;
import java.time.temporal.ChronoUnit;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Random;
import java.util.TreeSet;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.function.ToDoubleFunction;
import java.util.stream.Stream;
import org.junit.jupiter.api.DynamicTest;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.TestFactory;

/**
 * Consistency checks of revisions resumed from stored checkpoints ({@link FactorBuilds#rebuildFrom}): after a
 * revision, every stored series (spread, legs, net), the turnover, the end state, the checkpoints and the build
 * report's counts must equal, to the last bit, a full {@link FactorEngine} build over the revised panel. The engine
 * itself is checked against the independent pandas implementation in {@code ConstructionFixtureTest}; this test checks
 * that resuming from a checkpoint and replacing only the tail in the store changes nothing.
 *
 * <p>The fixture definitions that the wire format can store (every method, calendar, lag 1 and 2, costs, risk_free;
 * the three that restrict the universe to a size half or a segment are left out: those options exist only for the
 * breadth evidence's in-memory rebuilds, so a stored definition drops them) on the fixture panel and on a
 * longer generated panel, with small checkpoint spacings so that several checkpoints precede each revision: changed
 * returns, changed signals, a security added and one removed at a date, a date inserted in the middle, a revision
 * before the first checkpoint (a full rebuild), and a revision of the risk-free series.
 */
class RevisionCheckpointConsistencyTest {
    private static final int FIXTURE_SPACING = 9;
    private static final int LONG_SPACING = 20;
    private static final Map<String, FactorDefinition> DEFINITIONS = withRecipes(storable(ConstructionFixtures.definitions()));
    private static final AtomicInteger STORES = new AtomicInteger();

    private static Map<String, FactorDefinition> storable(Map<String, FactorDefinition> definitions) {
        Map<String, FactorDefinition> out = new LinkedHashMap<>();
        definitions.forEach((name, def) -> {
            FactorDefinition stored = DefinitionJson.read(DefinitionJson.toCanonicalString(def)).definition();
            if (stored.constructionKey().equals(def.constructionKey())) {
                out.put(name, def);
            }
        });
        assertEquals(19, out.size(), "storable fixture definitions");
        return out;
    }

    /** The recipe fixture definitions too (signal recipes, within, control, rank_weighted), each stored and built alike. */
    private static Map<String, FactorDefinition> withRecipes(Map<String, FactorDefinition> definitions) {
        Map<String, FactorDefinition> out = new LinkedHashMap<>(definitions);
        ConstructionFixtures.recipeDefinitions().forEach((name, def) -> {
            assertEquals(def.constructionKey(), DefinitionJson.read(DefinitionJson.toCanonicalString(def)).definition().constructionKey());
            out.put(name, def);
        });
        assertEquals(19 + 12, out.size(), "storable fixture definitions with the recipe ones");
        return out;
    }

    /** A revised panel and the cross-sections its revise upload carries. */
    private record Revision(String name, List<CrossSection> revised, List<CrossSection> upload) {
        LocalDate earliest() {
            return upload.stream().map(CrossSection::date).min(LocalDate::compareTo).orElseThrow();
        }
    }

    @TestFactory
    Stream<DynamicTest> fixturePanelRevisionsResumeToTheSameBits() {
        List<CrossSection> base = renumber(ConstructionFixtures.sections());
        ReturnSeries rf = ConstructionFixtures.riskFree();
        return Stream.of(
                        returnsChanged(base, 50), signalsChanged(base, 50), membersChanged(base, 50), dateInserted(base, 50),
                        returnsChanged(base, 4))
                .map(rev -> DynamicTest.dynamicTest(rev.name(), () -> checkRevision(base, base.size(), rev, rf, FIXTURE_SPACING)));
    }

    @TestFactory
    Stream<DynamicTest> longPanelRevisionsResumeToTheSameBits() {
        List<LocalDate> dates = LoadingsTestStore.weekdays(LocalDate.of(2019, 1, 2), 520);
        List<CrossSection> base = generatedPanel(dates, 30, new Random(20190102));
        ReturnSeries rf = generatedRiskFree(dates);
        // built on the first 400 dates, then extended by appending the rest, then revised
        return Stream.of(
                        returnsChanged(base, 333), signalsChanged(base, 333), membersChanged(base, 333), dateInserted(base, 333),
                        signalsChanged(base, 470))
                .map(rev -> DynamicTest.dynamicTest(rev.name(), () -> checkRevision(base, 400, rev, rf, LONG_SPACING)));
    }

    @Test
    void riskFreeRevisionResumesDependentsToTheSameBits() throws FactorBuilds.FactorBuildException {
        List<CrossSection> base = renumber(ConstructionFixtures.sections());
        ReturnSeries rf = ConstructionFixtures.riskFree();
        double[] values = rf.values().clone();
        values[40] += 0.0003;
        values[60] -= 0.0002;
        ReturnSeries revisedRf = new ReturnSeries(rf.dates(), values);
        try (Store s = new Store(FIXTURE_SPACING)) {
            s.defineRiskFree(rf);
            s.upload(base, "append");
            s.buildAll();
            FactorVersionRecord rfVersion = s.factors.current("rf").orElseThrow();
            s.factors.saveExternal(rfVersion.factorId(), rfVersion.version(), List.of(
                    external(revisedRf, 40), external(revisedRf, 60)), true);
            int dependents = 0;
            for (var e : DEFINITIONS.entrySet()) {
                if (e.getValue().riskFree() == null) {
                    continue;
                }
                dependents++;
                BuildReport report = s.builds.rebuildFrom(s.current(e.getKey()), rf.date(40));
                int kept = keptDates(s.panels.dates(s.panelId), rf.date(40), FIXTURE_SPACING);
                assertTrue(kept > 0, "the test needs a checkpoint before the revised date");
                assertEquals(base.get(kept - 1).date(), report.revision().rebuiltFrom());
                assertSameAsFullBuild(s, e.getKey(), e.getValue(), base, revisedRf, FIXTURE_SPACING);
            }
            assertEquals(2, dependents);
        }
    }

    private static StoredReturn external(ReturnSeries series, int i) {
        return new StoredReturn(series.date(i), series.value(i), Double.NaN, Double.NaN, Double.NaN);
    }

    /**
     * Builds every definition on the panel's first {@code builtDates} dates, extends them over the rest, checks the
     * extension (checkpoints included) against a full build, revises, resumes each from its checkpoint and checks again.
     */
    private static void checkRevision(List<CrossSection> base, int builtDates, Revision revision, ReturnSeries rf, int spacing)
            throws FactorBuilds.FactorBuildException {
        try (Store s = new Store(spacing)) {
            s.defineRiskFree(rf);
            s.upload(base.subList(0, builtDates), "append");
            s.buildAll();
            if (builtDates < base.size()) {
                s.upload(base.subList(builtDates, base.size()), "append");
                for (String name : DEFINITIONS.keySet()) {
                    s.builds.extend(s.current(name));
                    assertSameAsFullBuild(s, name, DEFINITIONS.get(name), base, rf, spacing);
                }
            }
            s.upload(revision.upload(), "revise");
            List<LocalDate> grid = revision.revised().stream().map(CrossSection::date).toList();
            assertEquals(grid, s.panels.dates(s.panelId), "the store holds the revised grid");
            int kept = keptDates(grid, revision.earliest(), spacing);
            for (Map.Entry<String, FactorDefinition> e : DEFINITIONS.entrySet()) {
                String where = revision.name() + " " + e.getKey();
                FactorVersionRecord before = s.current(e.getKey());
                BuildReport report = s.builds.rebuildFrom(before, revision.earliest());
                if (kept == 0) {
                    assertNull(report.revision().rebuiltFrom(), where);
                } else {
                    assertEquals(grid.get(kept - 1), report.revision().rebuiltFrom(), where);
                }
                assertEquals(grid.size() - kept, report.revision().recomputedDates(), where);
                BuildResult want = FactorEngine.build(e.getValue(), ConstructionFixtures.inMemory(revision.revised()),
                        rfFor(e.getValue(), rf), null);
                long tail = kept == 0 ? want.observations().size()
                        : want.observations().stream().filter(o -> o.date().isAfter(grid.get(kept - 1))).count();
                assertEquals((int) tail, report.newObservations(), where + ": only the tail is recomputed");
                assertSameAsFullBuild(s, e.getKey(), e.getValue(), revision.revised(), rf, spacing);
                assertTrue(s.current(e.getKey()).dataVersion() > before.dataVersion(), where + ": data version bumps");
            }
        }
    }

    /** Grid dates covered by the latest checkpoint before {@code earliest}: a multiple of the spacing. */
    private static int keptDates(List<LocalDate> grid, LocalDate earliest, int spacing) {
        int before = (int) grid.stream().filter(d -> d.isBefore(earliest)).count();
        return before / spacing * spacing;
    }

    private static ReturnSeries rfFor(FactorDefinition def, ReturnSeries rf) {
        return def.riskFree() == null ? null : rf;
    }

    /** Everything stored for the factor against a full build of the panel by the engine, bit for bit. */
    private static void assertSameAsFullBuild(Store s, String name, FactorDefinition def, List<CrossSection> panel,
                                              ReturnSeries rf, int spacing) {
        FactorVersionRecord v = s.current(name);
        BuildResult want = FactorEngine.build(def, ConstructionFixtures.inMemory(panel), rfFor(def, rf), null);
        assertSeries(want.observations(), FactorObservation::spread, s.factors.series(v.factorId(), v.version(), Leg.SPREAD), name + " spread");
        assertSeries(want.observations(), FactorObservation::longLeg, s.factors.series(v.factorId(), v.version(), Leg.LONG), name + " long");
        assertSeries(want.observations(), FactorObservation::shortLeg, s.factors.series(v.factorId(), v.version(), Leg.SHORT), name + " short");
        assertSeries(want.observations(), FactorObservation::net, s.factors.series(v.factorId(), v.version(), Leg.NET), name + " net");
        List<StoredTurnover> turnover = s.factors.turnover(v.factorId(), v.version());
        assertEquals(want.formations().size(), turnover.size(), name + " formations");
        for (int i = 0; i < turnover.size(); i++) {
            assertEquals(want.formations().get(i).date(), turnover.get(i).formationDate(), name + " formation " + i);
            assertEquals(Double.doubleToRawLongBits(want.formations().get(i).turnover()),
                    Double.doubleToRawLongBits(turnover.get(i).turnover()), name + " turnover at " + turnover.get(i).formationDate());
        }
        assertArrayEquals(want.endState().toBytes(), s.factors.engineState(v.factorId(), v.version()), name + " end state");
        Map<String, Object> report = JsonText.readMap(v.buildReport());
        assertEquals(want.observations().size(), report.get("observations"), name + " observations");
        assertEquals(want.periodsWithoutReturn(), report.get("periods_without_return"), name + " periods without return");

        List<CheckpointedBuild.Checkpoint> wantCheckpoints = CheckpointedBuild.run(def, ConstructionFixtures.inMemory(panel),
                rfFor(def, rf), null, 0, 0, spacing, FormingThreads.NONE).checkpoints();
        List<StoredCheckpoint> checkpoints = s.factors.checkpoints(v.factorId(), v.version());
        assertEquals(panel.size() / spacing, checkpoints.size(), name + " checkpoints");
        assertEquals(wantCheckpoints.size(), checkpoints.size(), name + " checkpoints");
        for (int i = 0; i < checkpoints.size(); i++) {
            CheckpointedBuild.Checkpoint w = wantCheckpoints.get(i);
            StoredCheckpoint got = checkpoints.get(i);
            String where = name + " checkpoint " + i;
            assertEquals(w.state().processedDates(), got.processedDates(), where);
            assertEquals(w.state().lastProcessedDate(), got.lastDate(), where);
            assertEquals(w.observations(), got.observations(), where);
            assertEquals(w.periodsWithoutReturn(), got.periodsWithoutReturn(), where);
            assertArrayEquals(w.state().toBytes(), got.state(), where);
        }
    }

    private static void assertSeries(List<FactorObservation> want, ToDoubleFunction<FactorObservation> column,
                                     ReturnSeries got, String what) {
        List<FactorObservation> present = want.stream().filter(o -> !Double.isNaN(column.applyAsDouble(o))).toList();
        assertEquals(present.size(), got.size(), what + ": number of values");
        for (int i = 0; i < got.size(); i++) {
            assertEquals(present.get(i).date(), got.date(i), what);
            assertEquals(Double.doubleToRawLongBits(column.applyAsDouble(present.get(i))), Double.doubleToRawLongBits(got.value(i)),
                    what + " at " + got.date(i));
        }
    }

    // ---- revisions ----

    /** Returns at two dates changed: every third security's moved by 0.4%, missing ones filled. */
    private static Revision returnsChanged(List<CrossSection> base, int at) {
        List<CrossSection> revised = new ArrayList<>(base);
        List<CrossSection> upload = new ArrayList<>();
        for (int t : new int[] {at, at + 3}) {
            CrossSection cs = base.get(t);
            double[] returns = cs.returns().clone();
            for (int i = 0; i < returns.length; i++) {
                if (Double.isNaN(returns[i])) {
                    returns[i] = 0.001;
                } else if (i % 3 == 0) {
                    returns[i] += 0.004;
                }
            }
            CrossSection changed = new CrossSection(cs.date(), cs.securityIds(), returns, cs.marketCaps(), cs.numbers(), cs.labels());
            revised.set(t, changed);
            upload.add(changed);
        }
        return new Revision("returns changed at #" + at, revised, upload);
    }

    /** Signals at one date changed: bm reversed for every second security, score shifted. */
    private static Revision signalsChanged(List<CrossSection> base, int at) {
        CrossSection cs = base.get(at);
        double[] bm = cs.numbers().get("bm").clone();
        double[] score = cs.numbers().get("score").clone();
        for (int i = 0; i < bm.length; i++) {
            if (i % 2 == 0) {
                bm[i] = -bm[i] + 0.01;
            }
            score[i] = (score[i] + i) % 10;
        }
        CrossSection changed = new CrossSection(cs.date(), cs.securityIds(), cs.returns(), cs.marketCaps(),
                Map.of("bm", bm, "score", score), cs.labels());
        List<CrossSection> revised = new ArrayList<>(base);
        revised.set(at, changed);
        return new Revision("signals changed at #" + at, revised, List.of(changed));
    }

    /** At one date the first security's row is gone and a security never seen before appears, with the largest cap. */
    private static Revision membersChanged(List<CrossSection> base, int at) {
        CrossSection cs = base.get(at);
        int newId = base.stream().flatMapToInt(c -> Arrays.stream(c.securityIds())).max().orElse(0) + 1;
        int n = cs.securityIds().length;
        int[] ids = new int[n];
        double[] returns = new double[n];
        double[] caps = new double[n];
        Map<String, double[]> numbers = new HashMap<>();
        Map<String, String[]> labels = new HashMap<>();
        cs.numbers().keySet().forEach(k -> numbers.put(k, new double[n]));
        cs.labels().keySet().forEach(k -> labels.put(k, new String[n]));
        for (int i = 1; i < n; i++) {
            ids[i - 1] = cs.securityIds()[i];
            returns[i - 1] = cs.returns()[i];
            caps[i - 1] = cs.marketCaps()[i];
            for (String k : numbers.keySet()) {
                numbers.get(k)[i - 1] = cs.numbers().get(k)[i];
            }
            for (String k : labels.keySet()) {
                labels.get(k)[i - 1] = cs.labels().get(k)[i];
            }
        }
        ids[n - 1] = newId;
        returns[n - 1] = 0.012;
        caps[n - 1] = Arrays.stream(cs.marketCaps()).filter(c -> !Double.isNaN(c)).max().orElse(1) * 2;
        numbers.get("bm")[n - 1] = 0.5;
        numbers.get("score")[n - 1] = 9;
        labels.get("sector")[n - 1] = "A";
        labels.get("listing")[n - 1] = "main";
        CrossSection changed = new CrossSection(cs.date(), ids, returns, caps, numbers, labels);
        List<CrossSection> revised = new ArrayList<>(base);
        revised.set(at, changed);
        return new Revision("security added and removed at #" + at, revised, List.of(changed));
    }

    /** A new date between two grid dates at or after {@code at}: the next date's rows with halved returns. */
    private static Revision dateInserted(List<CrossSection> base, int at) {
        int t = at;
        while (ChronoUnit.DAYS.between(base.get(t - 1).date(), base.get(t).date()) < 2) {
            t++;
        }
        CrossSection next = base.get(t);
        double[] returns = next.returns().clone();
        for (int i = 0; i < returns.length; i++) {
            returns[i] /= 2;
        }
        CrossSection inserted = new CrossSection(base.get(t - 1).date().plusDays(1), next.securityIds(), returns,
                next.marketCaps(), next.numbers(), next.labels());
        List<CrossSection> revised = new ArrayList<>(base);
        revised.add(t, inserted);
        return new Revision("date inserted before #" + t, revised, List.of(inserted));
    }

    // ---- panels ----

    /** The same cross-sections with security ids renumbered 1..n in their order, as a store assigns them. */
    private static List<CrossSection> renumber(List<CrossSection> sections) {
        TreeSet<Integer> all = new TreeSet<>();
        sections.forEach(cs -> Arrays.stream(cs.securityIds()).forEach(all::add));
        Map<Integer, Integer> rank = new HashMap<>();
        for (int id : all) {
            rank.put(id, rank.size() + 1);
        }
        return sections.stream().map(cs -> new CrossSection(cs.date(),
                Arrays.stream(cs.securityIds()).map(rank::get).toArray(), cs.returns(), cs.marketCaps(),
                cs.numbers(), cs.labels())).toList();
    }

    /** Invented data: securities 1..n with persistent bm and score, drifting caps, sectors, listings, gaps. */
    private static List<CrossSection> generatedPanel(List<LocalDate> dates, int securities, Random random) {
        double[] cap = new double[securities];
        double[] bm = new double[securities];
        for (int s = 0; s < securities; s++) {
            cap[s] = 100 + random.nextInt(2000);
            bm[s] = random.nextGaussian();
        }
        String[] sectors = {"A", "B", "C", "D"};
        String[] listings = {"main", "main", "alt", "pilot"};
        List<CrossSection> sections = new ArrayList<>();
        for (int t = 0; t < dates.size(); t++) {
            List<Integer> present = new ArrayList<>();
            for (int s = 0; s < securities; s++) {
                boolean listed = !(s == 6 && t < 60) && !(s == 11 && t > 300);
                if (listed && random.nextDouble() >= 0.02) {
                    present.add(s);
                }
            }
            int n = present.size();
            int[] ids = new int[n];
            double[] returns = new double[n];
            double[] caps = new double[n];
            double[] bms = new double[n];
            double[] scores = new double[n];
            String[] sector = new String[n];
            String[] listing = new String[n];
            for (int i = 0; i < n; i++) {
                int s = present.get(i);
                double r = 0.0003 * (s % 5 - 2) + 0.012 * random.nextGaussian();
                cap[s] *= 1 + r;
                bm[s] = 0.98 * bm[s] + 0.2 * random.nextGaussian();
                ids[i] = s + 1;
                returns[i] = random.nextDouble() < 0.02 ? Double.NaN : r;
                caps[i] = random.nextDouble() < 0.01 ? Double.NaN : cap[s];
                bms[i] = random.nextDouble() < 0.02 ? Double.NaN : bm[s];
                scores[i] = (s * 7 + t / 15) % 10;
                sector[i] = sectors[s % 4];
                listing[i] = listings[(s / 4) % 4];
            }
            sections.add(new CrossSection(dates.get(t), ids, returns, caps, Map.of("bm", bms, "score", scores),
                    Map.of("sector", sector, "listing", listing)));
        }
        return sections;
    }

    /** A daily risk-free series with one date missing (the market factor has no return there). */
    private static ReturnSeries generatedRiskFree(List<LocalDate> dates) {
        List<LocalDate> days = new ArrayList<>(dates);
        days.remove(77);
        double[] values = new double[days.size()];
        for (int t = 0; t < values.length; t++) {
            values[t] = 0.0001 + 0.000001 * (t % 9);
        }
        return new ReturnSeries(days.toArray(new LocalDate[0]), values);
    }

    // ---- store ----

    /** An in-memory store with one panel, the fixture definitions on it and builds with the given checkpoint spacing. */
    private static final class Store implements AutoCloseable {
        final Database database = Database.open("jdbc:h2:mem:revision-checkpoints-" + STORES.incrementAndGet());
        final PanelStore panels = TestDatabase.panels(database.jdbi());
        final FactorStore factors = new FactorStore(database.jdbi());
        final JobStore jobs = new JobStore(database.jdbi());
        final FactorBuilds builds;
        final long panelId = panels.createPanelIfAbsent("fixture");

        Store(int spacing) {
            builds = new FactorBuilds(panels, factors, ConstructionFixtures.FORMING, spacing);
        }

        void defineRiskFree(ReturnSeries rf) {
            FactorVersionRecord v = factors.define("rf", "{\"method\":\"external\"}", FactorDefinition.Method.EXTERNAL, null).version();
            List<StoredReturn> rows = new ArrayList<>();
            for (int i = 0; i < rf.size(); i++) {
                rows.add(external(rf, i));
            }
            factors.saveExternal(v.factorId(), v.version(), rows, false);
        }

        /** Stages and commits the cross-sections; security i gets code CO-i, so store ids equal the sections' ids. */
        void upload(List<CrossSection> sections, String mode) {
            long uploadId = panels.beginUpload(panelId, jobs.enqueue(dev.winnow.store.JobKind.PANEL_UPLOAD, "{}"), mode);
            SecurityDictionary dictionary = panels.securityDictionary(panelId, uploadId);
            TreeSet<Integer> ids = new TreeSet<>();
            sections.forEach(cs -> Arrays.stream(cs.securityIds()).forEach(ids::add));
            for (int id = 1; id <= ids.last(); id++) {
                assertEquals(id, dictionary.idFor("CO-" + id), "store ids follow the codes' order");
            }
            sections.forEach(cs -> panels.stageSlice(panelId, uploadId, cs));
            panels.commitUpload(panelId, uploadId, Map.of());
        }

        void buildAll() {
            DEFINITIONS.forEach((name, def) -> {
                factors.define(name, DefinitionJson.toCanonicalString(def), def.method(), panelId);
                try {
                    builds.rebuild(current(name));
                } catch (FactorBuilds.FactorBuildException e) {
                    throw new AssertionError(name, e);
                }
            });
        }

        FactorVersionRecord current(String name) {
            return factors.current(name).orElseThrow();
        }

        @Override
        public void close() {
            database.close();
        }
    }
}
