package dev.winnow.api;

import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.NodeList;
import org.xml.sax.InputSource;

import javax.xml.parsers.DocumentBuilderFactory;
import java.io.StringReader;
import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

/**
 * A chart answer parsed by the JDK's XML parser (javax.xml, not Winnow's writer), with the scale it declares: the
 * plot area and the date and value domains. {@link #x} and {@link #y} map a date and a value to where they must be
 * drawn; tests compare those with the coordinates in the document.
 */
final class SvgChart {
    final Document doc;
    final Element root;
    final double plotX;
    final double plotY;
    final double plotW;
    final double plotH;
    final LocalDate day0;
    final LocalDate day1;
    final double yMin;
    final double yMax;
    final boolean log;

    SvgChart(String svg) {
        try {
            DocumentBuilderFactory f = DocumentBuilderFactory.newInstance();
            f.setFeature("http://apache.org/xml/features/disallow-doctype-decl", true);
            f.setNamespaceAware(true);
            doc = f.newDocumentBuilder().parse(new InputSource(new StringReader(svg)));
        } catch (Exception e) {
            throw new AssertionError("not well-formed XML: " + e.getMessage() + "\n" + svg.substring(0, Math.min(500, svg.length())), e);
        }
        root = doc.getDocumentElement();
        assertEquals("svg", root.getLocalName());
        assertEquals("http://www.w3.org/2000/svg", root.getNamespaceURI());
        Element plot = byId("plot");
        String[] area = plot.getAttribute("data-plot").split(" ");
        plotX = Double.parseDouble(area[0]);
        plotY = Double.parseDouble(area[1]);
        plotW = Double.parseDouble(area[2]);
        plotH = Double.parseDouble(area[3]);
        if (plot.hasAttribute("data-x-domain")) {
            String[] xd = plot.getAttribute("data-x-domain").split(" ");
            day0 = LocalDate.parse(xd[0]);
            day1 = LocalDate.parse(xd[1]);
        } else {
            day0 = day1 = null;
        }
        if (plot.hasAttribute("data-y-domain")) {
            String[] yd = plot.getAttribute("data-y-domain").split(" ");
            yMin = Double.parseDouble(yd[0]);
            yMax = Double.parseDouble(yd[1]);
            log = plot.getAttribute("data-y-scale").equals("log10");
        } else {
            yMin = yMax = Double.NaN;
            log = false;
        }
    }

    Element byId(String id) {
        NodeList all = doc.getElementsByTagNameNS("*", "*");
        for (int i = 0; i < all.getLength(); i++) {
            Element e = (Element) all.item(i);
            if (id.equals(e.getAttribute("id"))) {
                return e;
            }
        }
        fail("no element with id " + id);
        return null;
    }

    List<Element> elements(String tag) {
        List<Element> out = new ArrayList<>();
        NodeList nodes = doc.getElementsByTagNameNS("*", tag);
        for (int i = 0; i < nodes.getLength(); i++) {
            out.add((Element) nodes.item(i));
        }
        return out;
    }

    List<Element> withClass(String cls) {
        List<Element> out = new ArrayList<>();
        for (Element e : elements("*")) {
            if (List.of(e.getAttribute("class").split(" ")).contains(cls)) {
                out.add(e);
            }
        }
        return out;
    }

    String text(String tag) {
        List<Element> found = elements(tag);
        assertFalse(found.isEmpty(), "no <" + tag + ">");
        return found.get(0).getTextContent();
    }

    /** Where a date must be drawn on the declared scale. */
    double x(LocalDate d) {
        return plotX + (d.toEpochDay() - day0.toEpochDay()) / (double) (day1.toEpochDay() - day0.toEpochDay()) * plotW;
    }

    /** Where a value must be drawn on the declared scale. */
    double y(double v) {
        double f = log ? (Math.log10(v) - Math.log10(yMin)) / (Math.log10(yMax) - Math.log10(yMin)) : (v - yMin) / (yMax - yMin);
        return plotY + plotH - f * plotH;
    }

    /** The vertices of the series path with this data-series key, in drawing order. */
    List<double[]> series(String key) {
        for (Element e : withClass("series")) {
            if (key.equals(e.getAttribute("data-series"))) {
                List<double[]> points = new ArrayList<>();
                for (String token : e.getAttribute("d").trim().split("\\s+")) {
                    assertTrue(token.charAt(0) == 'M' || token.charAt(0) == 'L', "unexpected path command in " + token);
                    String[] xy = token.substring(1).split(",");
                    points.add(new double[]{Double.parseDouble(xy[0]), Double.parseDouble(xy[1])});
                }
                return points;
            }
        }
        fail("no series '" + key + "'");
        return null;
    }

    /**
     * Asserts that the series is drawn at exactly the given dates and values (non-finite values left out), to the
     * hundredth of a pixel the document writes.
     */
    void assertPlotted(String key, List<LocalDate> dates, double[] values) {
        List<double[]> drawn = series(key);
        List<double[]> expected = new ArrayList<>();
        for (int i = 0; i < dates.size(); i++) {
            if (Double.isFinite(values[i])) {
                expected.add(new double[]{x(dates.get(i)), y(values[i])});
            }
        }
        assertEquals(expected.size(), drawn.size(), "points of " + key);
        for (int i = 0; i < expected.size(); i++) {
            assertEquals(expected.get(i)[0], drawn.get(i)[0], 0.0051, key + " x of point " + i);
            assertEquals(expected.get(i)[1], drawn.get(i)[1], 0.0051, key + " y of point " + i);
        }
    }

    /**
     * The document is self-contained and accessible: a title and a description first, no script, no foreign content,
     * no external reference (href, url(), @import) and no embedded image.
     */
    void assertSelfContainedAndLabelled() {
        assertFalse(text("title").isBlank());
        assertFalse(text("desc").isBlank());
        assertEquals("img", root.getAttribute("role"));
        for (String banned : List.of("script", "foreignObject", "image", "use", "a", "style", "iframe")) {
            assertTrue(elements(banned).isEmpty(), "contains <" + banned + ">");
        }
        for (Element e : elements("*")) {
            var attributes = e.getAttributes();
            for (int i = 0; i < attributes.getLength(); i++) {
                String name = attributes.item(i).getNodeName();
                String value = attributes.item(i).getNodeValue();
                assertFalse(name.endsWith("href"), "reference attribute " + name + " on <" + e.getTagName() + ">");
                assertFalse(name.startsWith("on"), "event handler " + name);
                assertFalse(value.contains("url(") || value.contains("@import") || value.contains("javascript:"),
                        "external reference in " + name + "=" + value);
            }
        }
        assertNotNull(byId("chart-data"));
    }

    /** Every date tick sits at its date on the declared scale, and every value tick at its value. */
    void assertTicksOnScale() {
        List<Element> xTicks = withClass("x-tick");
        List<Element> yTicks = withClass("y-tick");
        assertTrue(xTicks.size() >= 2, "at least two date ticks");
        assertTrue(yTicks.size() >= 2, "at least two value ticks");
        for (Element t : xTicks) {
            LocalDate d = LocalDate.parse(t.getAttribute("data-date"));
            assertEquals(x(d), Double.parseDouble(t.getAttribute("x")), 0.0051, "tick " + d);
            assertTrue(d.toString().startsWith(t.getTextContent()), "tick label " + t.getTextContent() + " names " + d);
        }
        for (Element t : yTicks) {
            double v = Double.parseDouble(t.getAttribute("data-value"));
            assertEquals(y(v) + 4, Double.parseDouble(t.getAttribute("y")), 0.0051, "tick " + v);
        }
    }
}
