package dev.winnow.charts;

/**
 * What every chart shares: its size in pixels, the title and description read by screen readers, and the ETag of
 * the data it draws (written into the document's metadata, so a saved copy still says which data it shows).
 */
public record ChartFrame(int width, int height, String title, String description, String dataTag) {
    public static final int MIN_WIDTH = 320;
    public static final int MAX_WIDTH = 4000;
    public static final int MIN_HEIGHT = 200;
    public static final int MAX_HEIGHT = 3000;
    public static final int DEFAULT_WIDTH = 800;
    public static final int DEFAULT_HEIGHT = 400;

    public ChartFrame {
        if (width < MIN_WIDTH || width > MAX_WIDTH || height < MIN_HEIGHT || height > MAX_HEIGHT) {
            throw new IllegalArgumentException("chart size " + width + "x" + height + " is outside " + MIN_WIDTH + "-" + MAX_WIDTH
                    + " x " + MIN_HEIGHT + "-" + MAX_HEIGHT);
        }
        if (title == null || title.isBlank() || description == null || description.isBlank()) {
            throw new IllegalArgumentException("a chart needs a title and a description");
        }
    }

    /** Opens the root element with title, description and metadata; the caller closes it with {@code </svg>}. */
    Svg begin(String kind) {
        Svg svg = new Svg();
        svg.open("svg", "xmlns", "http://www.w3.org/2000/svg", "version", "1.1", "width", width, "height", height,
                "viewBox", "0 0 " + width + " " + height, "role", "img", "aria-labelledby", "chart-title chart-desc",
                "data-kind", kind, "font-family", "sans-serif", "font-size", "12").newline();
        svg.text("title", title, "id", "chart-title").newline();
        svg.text("desc", description + " Research statistics, not investment advice.", "id", "chart-desc").newline();
        if (dataTag != null) {
            svg.text("metadata", "ETag of the data drawn: " + dataTag, "id", "chart-data").newline();
        }
        svg.empty("rect", "x", 0, "y", 0, "width", width, "height", height, "fill", "#FFFFFF").newline();
        svg.text("text", title, "x", 16, "y", 22, "font-size", "15", "font-weight", "bold", "fill", Palette.BLACK, "aria-hidden", "true").newline();
        return svg;
    }
}
