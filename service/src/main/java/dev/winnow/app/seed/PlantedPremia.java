package dev.winnow.app.seed;

import java.util.List;

/**
 * The monthly expected-return premia planted in the demo market, per unit of cross-sectional z-score of a signal at
 * month t, earned in month t+1. The three noise characteristics carry no premium.
 *
 * @param bookToPrice        premium on {@code book_to_price} (positive: cheap companies earn more)
 * @param momentum           premium on {@code momentum_12_1} (positive: past winners keep winning)
 * @param grossProfitability premium on {@code gross_profitability} (positive)
 * @param assetGrowth        premium on {@code asset_growth} (negative: fast asset growers earn less)
 * @param logMarketCap       premium on the logarithm of {@code market_cap} (negative: small companies earn more)
 */
public record PlantedPremia(
        double bookToPrice,
        double momentum,
        double grossProfitability,
        double assetGrowth,
        double logMarketCap) {

    /** The premia of the committed demo scenario. */
    public static final PlantedPremia DEMO = new PlantedPremia(0.0024, 0.0022, 0.0020, -0.0020, -0.0022);

    /** Premium per unit z of each column of {@link PanelLayout#CHARACTERISTICS}, in that order (0 for noise). */
    public double[] perCharacteristic() {
        List<String> columns = PanelLayout.CHARACTERISTICS;
        double[] premia = new double[columns.size()];
        premia[columns.indexOf("book_to_price")] = bookToPrice;
        premia[columns.indexOf("momentum_12_1")] = momentum;
        premia[columns.indexOf("gross_profitability")] = grossProfitability;
        premia[columns.indexOf("asset_growth")] = assetGrowth;
        return premia;
    }

    /** Premium per unit z of a panel characteristic column by name; 0 for the noise columns. */
    public double of(String column) {
        int index = PanelLayout.CHARACTERISTICS.indexOf(column);
        if (index < 0) {
            throw new IllegalArgumentException("no characteristic column named " + column + "; expected one of " + PanelLayout.CHARACTERISTICS);
        }
        return perCharacteristic()[index];
    }
}
