package dev.winnow.research;

import dev.winnow.stats.Frequency;
import dev.winnow.stats.PortfolioRisk;
import dev.winnow.store.PanelStore.PanelRecord;

import java.time.LocalDate;
import java.util.List;
import java.util.Optional;
import java.util.function.Consumer;

/**
 * The risk of a portfolio against a benchmark in the factor model of a loadings regression: the active weights'
 * exposures from the securities' loadings at the date, F the annualised factor covariance at the panel's frequency
 * over the last common date at or before it ({@link FactorLibrary#covariance}), the specific variance
 * periods-per-year x sum_i w_i^2 s_i^2 over the securities with loadings, and the Euler decomposition of
 * {@link PortfolioRisk}.
 */
public final class PortfolioRiskStudy {
    private final LoadingsService loadings;
    private final FactorLibrary library;

    public PortfolioRiskStudy(LoadingsService loadings, FactorLibrary library) {
        this.loadings = loadings;
        this.library = library;
    }

    /**
     * One risk question: the panel and date, the securities with their active weights (holdings minus benchmark),
     * the loadings settings and the covariance settings.
     */
    public record Query(PanelRecord panel, LocalDate date, List<String> securities, double[] activeWeights,
                        LoadingsSettings regression, CovarianceSettings covariance) {
    }

    /** The exposures the decomposition rests on, the factor covariance used, and the decomposition. */
    public record Report(LoadingsService.Exposures exposures, FactorLibrary.Covariance covariance, PortfolioRisk risk) {
        public List<String> factors() {
            return exposures.spec().factors();
        }

        /** The codes of the securities without loadings at the date, in request order. */
        public List<String> missing() {
            return exposures.exposure().missingHoldings().stream().map(exposures.securities()::get).toList();
        }
    }

    /** {@code source} hears whether the loadings were "stored" or "computed", before any computing. */
    public Report risk(Query q, Consumer<String> source) {
        LoadingsService.RiskInputs inputs = loadings.riskInputs(q.panel(), q.date(), q.securities(), q.activeWeights(), q.regression(), source);
        Frequency frequency = Optional.ofNullable(Frequency.fromWireName(q.panel().frequency())).orElse(Frequency.DAILY);
        FactorLibrary.Covariance covariance = library.covariance(library.selectVersions(inputs.versions()), q.covariance(), frequency, true);
        double specific = PortfolioRisk.specificVariance(inputs.coveredWeights(), inputs.residualVols(), frequency.periodsPerYear());
        try {
            PortfolioRisk risk = PortfolioRisk.of(inputs.exposures().exposure().exposures(), covariance.estimate().covariance(), specific);
            return new Report(inputs.exposures(), covariance, risk);
        } catch (IllegalArgumentException e) {
            throw new InvalidRequestException("The portfolio's risk cannot be decomposed: " + e.getMessage()
                    + " (active weights all zero, or a covariance that is not positive for these exposures).");
        }
    }
}
