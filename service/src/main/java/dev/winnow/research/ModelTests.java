package dev.winnow.research;

import dev.winnow.stats.FactorModelTest;
import dev.winnow.stats.ReturnSeries;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/**
 * Tests of a factor model on test assets ({@link FactorModelTest}: per-asset time-series regressions and the
 * Gibbons-Ross-Shanken test) on the monthly basis of the evidence table, over the months every asset, factor and the
 * risk-free series (when named) have.
 */
public final class ModelTests {
    private final SeriesNames names;

    public ModelTests(SeriesNames names) {
        this.names = names;
    }

    public record Request(List<String> factors, List<String> assets, String riskFree, LocalDate from, LocalDate to) {
        public Request {
            factors = List.copyOf(factors);
            assets = List.copyOf(assets);
        }
    }

    public FactorModelTest.OnSeries run(Request request) {
        Set<String> seen = new HashSet<>();
        for (String name : request.factors()) {
            if (!seen.add(name)) {
                throw new InvalidRequestException("'factors' names '" + name + "' twice; list each factor once.");
            }
        }
        for (String name : request.assets()) {
            if (request.factors().contains(name)) {
                throw new InvalidRequestException("'" + name + "' is both a factor and a test asset; a factor prices itself"
                        + " exactly, so leave it out of 'assets'.");
            }
            if (!seen.add(name)) {
                throw new InvalidRequestException("'assets' names '" + name + "' twice; list each asset once.");
            }
        }
        List<ReturnSeries> factors = new ArrayList<>();
        for (String name : request.factors()) {
            factors.add(names.monthly(name, "factors", request.from(), request.to()));
        }
        List<ReturnSeries> assets = new ArrayList<>();
        for (String name : request.assets()) {
            assets.add(names.monthly(name, "assets", request.from(), request.to()));
        }
        ReturnSeries riskFree = request.riskFree() == null ? null
                : names.monthly(request.riskFree(), "risk_free", request.from(), request.to());
        return FactorModelTest.ofSeries(assets, factors, riskFree);
    }
}
