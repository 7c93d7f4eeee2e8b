package dev.winnow.app.seed;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;

/** Draws the fictional companies of the demo market: names, labels, listing lives and risk parameters. */
final class DemoCompanies {

    private static final String[] NAME_STARTS = {
        "Cor", "Tes", "Bral", "Quin", "Ost", "Vey", "Dral", "Fen", "Hask", "Ilm", "Jor", "Kel", "Lun", "Mir",
        "Orr", "Pell", "Rask", "Sorv", "Ulv", "Wex", "Yar", "Zeph", "Acr", "Blen", "Cald"};
    private static final String[] NAME_ENDS = {
        "vane", "saly", "drith", "mora", "quell", "tarn", "vessa", "lindor", "orrel", "zeth", "brae", "cavi",
        "dune", "ethra", "foss", "gale", "holm", "brisse", "juno", "kett"};
    private static final String[] NAME_KINDS = {
        "Holdings", "Mills", "Works", "Group", "Industries", "Systems", "Foods", "Energy", "Logistics",
        "Materials", "Labs", "Partners", "Networks", "Textiles", "Instruments"};

    /** Share of companies on the main board (larger, calmer); the rest trade on the growth board. */
    static final double MAIN_SHARE = 0.4;
    /** Share of companies already listed when the burn-in starts; the rest list later. */
    static final double INITIAL_SHARE = 0.6;
    /** Chance that a company delists before the sample ends. */
    static final double DELISTING_SHARE = 0.35;
    /** Chance that a delisting is a failure with a large loss rather than a takeover at a premium. */
    static final double FAILURE_SHARE = 0.6;
    /** Fewest months a company trades before it may delist. */
    static final int MINIMUM_LIFE = 24;

    private DemoCompanies() {
    }

    /** {@code count} companies over months -burnIn .. months-1. */
    static List<DemoCompany> draw(int count, int burnIn, int months, SeededDraws draws) {
        List<DemoCompany> companies = new ArrayList<>(count);
        Set<String> names = new HashSet<>();
        for (int i = 0; i < count; i++) {
            String security = String.format(Locale.ROOT, "QX%04d", i + 1);
            String name = uniqueName(names, draws);
            String sector = PanelLayout.SECTORS.get(draws.integer(0, PanelLayout.SECTORS.size() - 1));
            boolean main = draws.chance(MAIN_SHARE);
            int first = draws.chance(INITIAL_SHARE) ? -burnIn : draws.integer(1, Math.max(1, months - MINIMUM_LIFE));
            int last = months - 1;
            double delistingReturn = Double.NaN;
            if (draws.chance(DELISTING_SHARE) && first + MINIMUM_LIFE < months - 1) {
                last = draws.integer(Math.max(first + MINIMUM_LIFE, 1), months - 2);
                delistingReturn = draws.chance(FAILURE_SHARE) ? draws.uniform(-0.85, -0.25) : draws.uniform(0.10, 0.45);
            }
            double beta = Math.min(1.8, Math.max(0.4, 1.0 + 0.25 * draws.gaussian()));
            double volatility = (main ? 0.05 : 0.085) * StrictMath.exp(0.2 * draws.gaussian());
            double logCap = main ? StrictMath.log(4000.0) + 0.7 * draws.gaussian() : StrictMath.log(700.0) + 0.8 * draws.gaussian();
            companies.add(new DemoCompany(security, name, sector, main ? PanelLayout.MAIN_TIER : PanelLayout.GROWTH_TIER,
                    first, last, beta, volatility, StrictMath.exp(logCap), delistingReturn));
        }
        return companies;
    }

    private static String uniqueName(Set<String> taken, SeededDraws draws) {
        while (true) {
            String name = NAME_STARTS[draws.integer(0, NAME_STARTS.length - 1)]
                    + NAME_ENDS[draws.integer(0, NAME_ENDS.length - 1)] + " "
                    + NAME_KINDS[draws.integer(0, NAME_KINDS.length - 1)];
            if (taken.add(name)) {
                return name;
            }
        }
    }
}
