package dev.winnow.store;

import java.util.Locale;

/** The stored and wire spelling of the project's enums: the constant's name in lower case ({@code panel_upload}). */
public final class WireNames {
    private WireNames() {
    }

    public static String of(Enum<?> value) {
        return value.name().toLowerCase(Locale.ROOT);
    }

    /** The constant of {@code type} spelt {@code wire}; IllegalStateException naming {@code what} otherwise. */
    public static <E extends Enum<E>> E parse(Class<E> type, String wire, String what) {
        for (E e : type.getEnumConstants()) {
            if (of(e).equals(wire)) {
                return e;
            }
        }
        throw new IllegalStateException("unknown " + what + " '" + wire + "'");
    }
}
