package dev.winnow.charts;

import java.util.Locale;

/**
 * A minimal writer of SVG 1.1 markup: elements with escaped attribute values and text, numbers written with two
 * decimals (a hundredth of a pixel) in the root locale. Nothing it writes refers outside the document.
 */
final class Svg {
    private final StringBuilder out = new StringBuilder(16_384);

    /** A coordinate or length: two decimals, no exponent, "-0.00" written as "0.00". */
    static String num(double v) {
        if (!Double.isFinite(v)) {
            throw new IllegalArgumentException("an SVG coordinate must be finite, got " + v);
        }
        String s = String.format(Locale.ROOT, "%.2f", v);
        return s.equals("-0.00") ? "0.00" : s;
    }

    /** XML escaping for text content and attribute values in double quotes. */
    static String escape(String text) {
        StringBuilder sb = new StringBuilder(text.length() + 8);
        for (int i = 0; i < text.length(); i++) {
            char c = text.charAt(i);
            switch (c) {
                case '&' -> sb.append("&amp;");
                case '<' -> sb.append("&lt;");
                case '>' -> sb.append("&gt;");
                case '"' -> sb.append("&quot;");
                case '\'' -> sb.append("&apos;");
                default -> {
                    if (c < 0x20 && c != '\n' && c != '\t') {
                        sb.append(' ');
                    } else {
                        sb.append(c);
                    }
                }
            }
        }
        return sb.toString();
    }

    /** Opens an element; {@code attributes} alternate names and values (values are escaped). */
    Svg open(String name, Object... attributes) {
        out.append('<').append(name);
        attributes(attributes);
        out.append('>');
        return this;
    }

    /** An empty element. */
    Svg empty(String name, Object... attributes) {
        out.append('<').append(name);
        attributes(attributes);
        out.append("/>");
        return this;
    }

    /** An element holding only text. */
    Svg text(String name, String text, Object... attributes) {
        open(name, attributes);
        out.append(escape(text));
        return close(name);
    }

    Svg close(String name) {
        out.append("</").append(name).append('>');
        return this;
    }

    Svg newline() {
        out.append('\n');
        return this;
    }

    private void attributes(Object[] attributes) {
        if (attributes.length % 2 != 0) {
            throw new IllegalArgumentException("attributes come in name/value pairs");
        }
        for (int i = 0; i < attributes.length; i += 2) {
            Object value = attributes[i + 1];
            if (value == null) {
                continue;
            }
            String text = value instanceof Double d ? num(d) : String.valueOf(value);
            out.append(' ').append(attributes[i]).append("=\"").append(escape(text)).append('"');
        }
    }

    @Override
    public String toString() {
        return out.toString();
    }
}
