package dev.winnow.store;

import org.jdbi.v3.core.Jdbi;
import org.jdbi.v3.core.statement.PreparedBatch;

import java.util.ArrayList;
import java.util.List;
import java.util.Map;

/**
 * Maps security codes to panel-local integer ids during an upload. Codes new to the panel are recorded against the
 * staging upload, so a discarded upload takes its new codes with it: at once, or (batched) in groups of
 * {@value #BATCH} and at {@link #flush}, which must then run before the upload commits.
 */
public final class SecurityDictionary {
    private static final int BATCH = 1000;

    private final Jdbi jdbi;
    private final long panelId;
    private final long uploadId;
    private final Map<String, Integer> ids;
    private final boolean batched;
    private final List<Map.Entry<String, Integer>> pending = new ArrayList<>();
    private int nextId;

    SecurityDictionary(Jdbi jdbi, long panelId, long uploadId, Map<String, Integer> ids, boolean batched) {
        this.jdbi = jdbi;
        this.panelId = panelId;
        this.uploadId = uploadId;
        this.ids = ids;
        this.batched = batched;
        this.nextId = ids.values().stream().mapToInt(Integer::intValue).max().orElse(0) + 1;
    }

    public int idFor(String code) {
        Integer id = ids.get(code);
        if (id != null) {
            return id;
        }
        int fresh = nextId++;
        ids.put(code, fresh);
        pending.add(Map.entry(code, fresh));
        if (!batched || pending.size() >= BATCH) {
            flush();
        }
        return fresh;
    }

    /** Records the new codes not yet written, in one transaction. */
    public void flush() {
        if (pending.isEmpty()) {
            return;
        }
        jdbi.useTransaction(h -> {
            PreparedBatch batch = h.prepareBatch("INSERT INTO panel_securities (panel_id, security_id, code, upload_id) VALUES (:p, :s, :c, :u)");
            for (Map.Entry<String, Integer> e : pending) {
                batch.bind("p", panelId).bind("s", e.getValue()).bind("c", e.getKey()).bind("u", uploadId).add();
            }
            batch.execute();
        });
        pending.clear();
    }
}
