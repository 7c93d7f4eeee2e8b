package dev.winnow.research;

import dev.winnow.stats.ReturnSeries;
import dev.winnow.stats.TradingCosts;
import dev.winnow.store.FactorStore;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.FactorStore.StoredTurnover;

import java.time.LocalDate;
import java.util.List;

/** {@link TradingCosts} of a stored factor version: its gross spread series and its formations' turnover. */
public final class StoredCosts {
    private StoredCosts() {
    }

    /** Costs of the stretch first..last of the version's series. */
    public static TradingCosts of(FactorStore factors, FactorVersionRecord v, LocalDate first, LocalDate last) {
        ReturnSeries gross = factors.series(v.factorId(), v.version(), FactorStore.Leg.SPREAD);
        List<StoredTurnover> turnover = factors.turnover(v.factorId(), v.version());
        return TradingCosts.of(gross, turnover.stream().map(StoredTurnover::formationDate).toList(),
                turnover.stream().mapToDouble(StoredTurnover::turnover).toArray(), first, last);
    }
}
