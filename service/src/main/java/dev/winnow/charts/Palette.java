package dev.winnow.charts;

/**
 * Colours from the Okabe-Ito palette (Okabe and Ito 2008, "Color Universal Design"), chosen so that the lines stay
 * distinct for the common forms of colour-vision deficiency (common practice). Lines are also told apart by dash
 * pattern and width, so colour is never the only cue.
 */
public final class Palette {
    public static final String BLACK = "#000000";
    public static final String ORANGE = "#E69F00";
    public static final String SKY_BLUE = "#56B4E9";
    public static final String BLUISH_GREEN = "#009E73";
    public static final String BLUE = "#0072B2";
    public static final String VERMILLION = "#D55E00";
    public static final String REDDISH_PURPLE = "#CC79A7";

    /** The spread, long leg and short leg of a factor. */
    public static final String SPREAD = BLUE;
    public static final String LONG = BLUISH_GREEN;
    public static final String SHORT = VERMILLION;

    /** Grey of grid lines and secondary text; #595959 on white has a contrast ratio of 7:1 (WCAG 2.1 AAA). */
    public static final String GREY_TEXT = "#595959";
    public static final String GRID = "#D9D9D9";

    private Palette() {
    }

    /**
     * The diverging fill of a correlation from -1 to 1: Okabe-Ito blue at -1, white at 0, vermillion at +1,
     * interpolated linearly in sRGB.
     */
    static String diverging(double value) {
        double v = Math.max(-1.0, Math.min(1.0, value));
        int[] end = v < 0 ? new int[]{0x00, 0x72, 0xB2} : new int[]{0xD5, 0x5E, 0x00};
        double a = Math.abs(v);
        int r = (int) Math.round(255 + (end[0] - 255) * a);
        int g = (int) Math.round(255 + (end[1] - 255) * a);
        int b = (int) Math.round(255 + (end[2] - 255) * a);
        return String.format(java.util.Locale.ROOT, "#%02X%02X%02X", r, g, b);
    }

    /**
     * Black or white, whichever contrasts more with {@code hex} by the WCAG 2.1 relative luminance
     * (W3C Web Content Accessibility Guidelines 2.1, definition of relative luminance and contrast ratio).
     */
    static String textOn(String hex) {
        double l = luminance(hex);
        double withBlack = (l + 0.05) / 0.05;
        double withWhite = 1.05 / (l + 0.05);
        return withBlack >= withWhite ? BLACK : "#FFFFFF";
    }

    /** Relative luminance of an sRGB colour #RRGGBB (WCAG 2.1). */
    static double luminance(String hex) {
        int rgb = Integer.parseInt(hex.substring(1), 16);
        return 0.2126 * channel((rgb >> 16) & 0xFF) + 0.7152 * channel((rgb >> 8) & 0xFF) + 0.0722 * channel(rgb & 0xFF);
    }

    private static double channel(int c) {
        double s = c / 255.0;
        return s <= 0.03928 ? s / 12.92 : Math.pow((s + 0.055) / 1.055, 2.4);
    }
}
