package dev.winnow.api;

import java.util.Locale;

/** Token scopes, each including the ones below it: admin ⊇ write ⊇ read. */
public enum Scope {
    READ, WRITE, ADMIN;

    public boolean covers(Scope required) {
        return compareTo(required) >= 0;
    }

    public String wireName() {
        return name().toLowerCase(Locale.ROOT);
    }

    public static Scope fromWireName(String text) {
        for (Scope s : values()) {
            if (s.wireName().equals(text)) {
                return s;
            }
        }
        return null;
    }
}
