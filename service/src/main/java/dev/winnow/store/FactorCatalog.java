package dev.winnow.store;

import dev.winnow.store.FactorStore.FactorVersionRecord;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.Optional;

/**
 * Every factor version held in memory for the read paths, so that resolving a name costs no query. The snapshot
 * is reloaded (one query) whenever the {@link ChangeFeed}'s factor version differs from the one it was loaded at.
 * The feed version is read before the query: a commit that lands during the load bumps the feed after committing,
 * so the next lookup loads again and nothing stale is kept. Jobs and writes never read through here.
 */
public final class FactorCatalog {
    private final FactorStore factors;
    private final ChangeFeed feed;
    private volatile Snapshot snapshot;

    private record Snapshot(long feedVersion, Map<String, FactorVersionRecord> current,
                            Map<String, Map<Integer, FactorVersionRecord>> versions, List<FactorVersionRecord> byName) {
    }

    FactorCatalog(FactorStore factors, ChangeFeed feed) {
        this.factors = factors;
        this.feed = feed;
    }

    /** The current version of a factor (retired or not). */
    public Optional<FactorVersionRecord> current(String name) {
        return Optional.ofNullable(fresh().current().get(name));
    }

    public Optional<FactorVersionRecord> version(String name, int version) {
        Map<Integer, FactorVersionRecord> versions = fresh().versions().get(name);
        return versions == null ? Optional.empty() : Optional.ofNullable(versions.get(version));
    }

    /** Current versions of all factors, by name; retired ones only when asked. */
    public List<FactorVersionRecord> listCurrent(boolean includeRetired) {
        List<FactorVersionRecord> out = new ArrayList<>();
        for (FactorVersionRecord v : fresh().byName()) {
            if (includeRetired || !v.retired()) {
                out.add(v);
            }
        }
        return out;
    }

    private Snapshot fresh() {
        long now = feed.version(ChangeFeed.Topic.FACTORS);
        Snapshot s = snapshot;
        if (s != null && s.feedVersion() == now) {
            return s;
        }
        Map<String, FactorVersionRecord> current = new HashMap<>();
        Map<String, Map<Integer, FactorVersionRecord>> versions = new HashMap<>();
        for (FactorVersionRecord v : factors.allVersions()) {
            versions.computeIfAbsent(v.name(), n -> new HashMap<>()).put(v.version(), v);
            if (v.current()) {
                current.put(v.name(), v);
            }
        }
        List<FactorVersionRecord> byName = new ArrayList<>(current.values());
        byName.sort(Comparator.comparing(FactorVersionRecord::name));
        Snapshot loaded = new Snapshot(now, Map.copyOf(current), Map.copyOf(versions), List.copyOf(byName));
        snapshot = loaded;
        return loaded;
    }
}
