package dev.winnow.api;

import java.util.regex.Pattern;

/** Names of panels and factors as they appear in paths. */
final class Names {
    private static final Pattern NAME = Pattern.compile("[A-Za-z0-9][A-Za-z0-9._-]{0,99}");

    private Names() {
    }

    static String check(String kind, String name) {
        if (name == null || !NAME.matcher(name).matches()) {
            throw ApiProblem.badRequest(kind + " name '" + name + "' must be 1-100 characters of letters, digits, '.', '_' or '-', starting with a letter or digit.");
        }
        return name;
    }
}
