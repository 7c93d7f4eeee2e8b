package dev.winnow.api;

import com.fasterxml.jackson.annotation.JsonProperty;
import dev.winnow.research.FactorLibrary;
import dev.winnow.research.PortfolioRiskStudy;
import dev.winnow.research.SeriesNames;
import dev.winnow.stats.PortfolioRisk;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;

/** Wire forms (snake_case records) of the risk system's reads; NaN is written as null by {@link Json}. */
final class LibraryWire {
    private LibraryWire() {
    }

    /** One series of the aligned download: its name as asked, the factor version it reads and that version's data version. */
    record Described(String name, int version, @JsonProperty("data_version") long dataVersion) {
    }

    /** {@code GET /v1/returns}: {@code returns} maps each name to its column, null where the series has no return. */
    record Returns(String frequency, String join, List<Described> factors, LocalDate[] dates, Map<String, double[]> returns) {
        static Returns of(FactorLibrary.AlignedReturns a) {
            List<Described> described = new ArrayList<>();
            Map<String, double[]> columns = new LinkedHashMap<>();
            List<SeriesNames.Named> series = a.loaded().selection().series();
            for (int i = 0; i < series.size(); i++) {
                SeriesNames.Named n = series.get(i);
                described.add(new Described(n.name(), n.version().version(), n.version().dataVersion()));
                columns.put(n.name(), a.aligned().values()[i]);
            }
            return new Returns(a.loaded().frequency() == null ? null : a.loaded().frequency().wireName(),
                    a.join().name().toLowerCase(Locale.ROOT), described, a.aligned().dates(), columns);
        }
    }

    /** {@code GET /v1/covariance}. */
    record Covariance(List<String> factors, String frequency, LocalDate first, LocalDate last, int observations,
                      @JsonProperty("half_life") Double halfLife, @JsonProperty("nw_lags") int nwLags, boolean annualized,
                      double[][] covariance, double[] volatility, double[][] correlation) {
        static Covariance of(FactorLibrary.Covariance c) {
            return new Covariance(c.names(), c.frequency().wireName(), c.first(), c.last(), c.observations(), c.settings().halfLife(),
                    c.settings().nwLags(), c.annualized(), c.estimate().covariance(), c.estimate().volatility(), c.estimate().correlation());
        }
    }

    /** One factor's part of a portfolio's risk. */
    record Contribution(String factor, double exposure, double marginal, double contribution, double share) {
    }

    /** {@code POST /v1/risk}. */
    record Risk(String panel, LocalDate date, List<String> factors, double[] exposures,
                @JsonProperty("total_volatility") double totalVolatility, @JsonProperty("factor_volatility") double factorVolatility,
                @JsonProperty("specific_volatility") double specificVolatility, List<Contribution> contributions,
                @JsonProperty("specific_contribution") double specificContribution, @JsonProperty("specific_share") double specificShare,
                double coverage, List<String> missing) {
        static Risk of(PortfolioRiskStudy.Report report) {
            PortfolioRisk r = report.risk();
            double[] exposures = report.exposures().exposure().exposures();
            List<String> names = report.factors();
            double[] marginal = r.marginal();
            double[] contributions = r.contributions();
            double[] shares = r.shares();
            List<Contribution> parts = new ArrayList<>();
            for (int k = 0; k < exposures.length; k++) {
                parts.add(new Contribution(names.get(k), exposures[k], marginal[k], contributions[k], shares[k]));
            }
            return new Risk(report.exposures().panel().name(), report.exposures().date(), names, exposures, r.totalVolatility(),
                    r.factorVolatility(), r.specificVolatility(), parts, r.specificContribution(), r.specificShare(),
                    report.exposures().exposure().coverage(), report.missing());
        }
    }
}
