package dev.winnow.api;

import com.fasterxml.jackson.annotation.JsonProperty;
import dev.winnow.research.FamaMacBethStudy;
import dev.winnow.stats.EstimateSeries;
import dev.winnow.stats.FactorModelTest;

import java.time.LocalDate;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/** Wire forms (snake_case records) of the cross-sectional studies; NaN is written as null by {@link Json}. */
final class CrossSectionWire {
    private CrossSectionWire() {
    }

    record Coefficient(String name, double mean, double stdev, @JsonProperty("t_stat") double tStat,
                       @JsonProperty("nw_t_stat") double nwTStat, @JsonProperty("nw_lags") int nwLags,
                       @JsonProperty("p_value") double pValue) {
        static Coefficient of(FamaMacBethStudy.Coefficient c) {
            EstimateSeries s = c.summary();
            return new Coefficient(c.name(), s.mean(), s.stdev(), s.tStat(), s.nwTStat(), s.nwLags(), s.pValue());
        }
    }

    record Portfolios(String factor, int version, String frequency, String form, List<String> portfolios,
                      List<LocalDate> dates, Map<String, double[]> returns) {
    }

    record IcSummary(int horizon, int n, double mean, double stdev, @JsonProperty("ic_ir") double icIr,
                     @JsonProperty("t_stat") double tStat, @JsonProperty("nw_t_stat") double nwTStat,
                     @JsonProperty("nw_lags") int nwLags, @JsonProperty("share_positive") double sharePositive) {
    }

    record InformationCoefficients(String factor, int version, String method, List<Integer> horizons, List<LocalDate> dates,
                                   Map<String, double[]> ic, List<IcSummary> summary) {
        static InformationCoefficients of(dev.winnow.research.InformationCoefficients.Result r, String method) {
            Map<String, double[]> ic = new LinkedHashMap<>();
            List<IcSummary> summary = new java.util.ArrayList<>();
            for (int k = 0; k < r.horizons().size(); k++) {
                int h = r.horizons().get(k);
                ic.put(String.valueOf(h), r.ic().get(k));
                EstimateSeries s = r.summary().get(k);
                summary.add(new IcSummary(h, s.n(), s.mean(), s.stdev(), s.meanOverStdev(), s.tStat(), s.nwTStat(), s.nwLags(),
                        s.sharePositive()));
            }
            return new InformationCoefficients(r.version().name(), r.version().version(), method, r.horizons(), r.dates(), ic, summary);
        }
    }

    record SlopeSeries(List<LocalDate> dates, Map<String, double[]> slopes) {
    }

    record FamaMacBeth(String panel, int periods, int skipped, LocalDate first, LocalDate last,
                       List<Coefficient> coefficients, @JsonProperty("mean_r_squared") double meanRSquared,
                       @JsonProperty("mean_securities") double meanSecurities, SlopeSeries series) {
        static FamaMacBeth of(FamaMacBethStudy.Result r) {
            return new FamaMacBeth(r.panel(), r.periods(), r.skipped(), r.first(), r.last(),
                    r.coefficients().stream().map(Coefficient::of).toList(), r.meanRSquared(), r.meanSecurities(),
                    new SlopeSeries(r.dates(), new LinkedHashMap<>(r.slopes())));
        }
    }

    /** {@code date,intercept,<name>,...}, one row per regression run. */
    static String famaMacBethCsv(FamaMacBethStudy.Result r) {
        StringBuilder sb = new StringBuilder("date");
        for (String name : r.slopes().keySet()) {
            sb.append(',').append(Responses.csvText(name));
        }
        sb.append('\n');
        for (int t = 0; t < r.dates().size(); t++) {
            sb.append(r.dates().get(t));
            for (double[] series : r.slopes().values()) {
                sb.append(',').append(Responses.csvNumber(series[t]));
            }
            sb.append('\n');
        }
        return sb.toString();
    }

    record AssetRegression(String asset, double alpha, @JsonProperty("alpha_t") double alphaT,
                           @JsonProperty("alpha_nw_t") double alphaNwT, Map<String, Double> betas,
                           @JsonProperty("r_squared") double rSquared, @JsonProperty("residual_vol") double residualVol) {
    }

    record ModelTest(List<String> factors, List<String> assets, @JsonProperty("risk_free") String riskFree, int months,
                     LocalDate first, LocalDate last, double grs, @JsonProperty("p_value") double pValue,
                     @JsonProperty("nw_lags") int nwLags, @JsonProperty("mean_abs_alpha") double meanAbsAlpha,
                     @JsonProperty("mean_r_squared") double meanRSquared, List<AssetRegression> regressions) {
        static ModelTest of(List<String> factors, List<String> assets, String riskFree, FactorModelTest.OnSeries on) {
            FactorModelTest.Result r = on.result();
            List<AssetRegression> rows = new java.util.ArrayList<>();
            for (int i = 0; i < assets.size(); i++) {
                FactorModelTest.AssetRegression a = r.regressions().get(i);
                Map<String, Double> betas = new LinkedHashMap<>();
                for (int j = 0; j < factors.size(); j++) {
                    betas.put(factors.get(j), a.betas()[j]);
                }
                rows.add(new AssetRegression(assets.get(i), a.alpha(), a.alphaT(), a.alphaNwT(), betas, a.rSquared(), a.residualVol()));
            }
            return new ModelTest(factors, assets, riskFree, r.months(), on.first(), on.last(), r.grs(), r.pValue(), r.nwLags(),
                    r.meanAbsAlpha(), r.meanRSquared(), rows);
        }
    }
}
