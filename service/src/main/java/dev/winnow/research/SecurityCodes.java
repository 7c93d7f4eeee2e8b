package dev.winnow.research;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * A panel's security codes as of one data version (new codes only become visible with an upload's commit, which
 * moves the data version), with each id's rank in code order for sorting answers.
 */
public record SecurityCodes(long dataVersion, Map<Integer, String> byId, Map<String, Integer> byCode, int[] rankById) {

    public static SecurityCodes of(long dataVersion, Map<Integer, String> byId) {
        Map<String, Integer> byCode = new HashMap<>();
        byId.forEach((id, code) -> byCode.put(code, id));
        List<Integer> ids = new ArrayList<>(byId.keySet());
        ids.sort(Comparator.comparing(byId::get));
        int[] rank = new int[ids.stream().mapToInt(Integer::intValue).max().orElse(0) + 1];
        for (int r = 0; r < ids.size(); r++) {
            rank[ids.get(r)] = r;
        }
        return new SecurityCodes(dataVersion, byId, byCode, rank);
    }

    /** Row indices of a table's securities, ordered by security code. */
    public List<Integer> rowsByCode(int[] securityIds) {
        List<Integer> rows = new ArrayList<>(securityIds.length);
        for (int i = 0; i < securityIds.length; i++) {
            rows.add(i);
        }
        rows.sort(Comparator.comparingInt(i -> securityIds[i] < rankById.length ? rankById[securityIds[i]] : Integer.MAX_VALUE));
        return rows;
    }
}
