package dev.winnow.store;

import org.jdbi.v3.core.Jdbi;

import java.util.Map;

/**
 * Maps security codes to panel-local integer ids during an upload. Codes new to the panel are inserted at once,
 * tagged with the staging upload, so a discarded upload takes its new codes with it.
 */
public final class SecurityDictionary {
    private final Jdbi jdbi;
    private final long panelId;
    private final long uploadId;
    private final Map<String, Integer> ids;
    private int nextId;

    SecurityDictionary(Jdbi jdbi, long panelId, long uploadId, Map<String, Integer> ids) {
        this.jdbi = jdbi;
        this.panelId = panelId;
        this.uploadId = uploadId;
        this.ids = ids;
        this.nextId = ids.values().stream().mapToInt(Integer::intValue).max().orElse(0) + 1;
    }

    public int idFor(String code) {
        Integer id = ids.get(code);
        if (id != null) {
            return id;
        }
        int fresh = nextId++;
        jdbi.useHandle(h -> h.createUpdate("INSERT INTO panel_securities (panel_id, security_id, code, upload_id) VALUES (:p, :s, :c, :u)")
                .bind("p", panelId).bind("s", fresh).bind("c", code).bind("u", uploadId).execute());
        ids.put(code, fresh);
        return fresh;
    }
}
