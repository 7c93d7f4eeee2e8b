package dev.winnow.research;

import dev.winnow.store.VersionStatus;
import dev.winnow.construct.FactorDefinition;
import com.fasterxml.jackson.annotation.JsonProperty;
import dev.winnow.construct.Holdings;
import dev.winnow.store.FactorStore.FactorVersionRecord;
import dev.winnow.store.PanelStore;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Map;

/**
 * What a factor version actually holds at a date ({@code GET /v1/factors/{f}/holdings}): the legs of its latest
 * formation at or before the date, each security's weight at formation and drifted through the end of the date.
 */
public final class FactorHoldings {
    private final FactorBuilds builds;
    private final PanelStore panels;

    public FactorHoldings(FactorBuilds builds, PanelStore panels) {
        this.builds = builds;
        this.panels = panels;
    }

    /** One security of a leg. */
    public record Position(String security, double weight, @JsonProperty("drifted_weight") double driftedWeight) {
    }

    /** Both legs; {@code short} is empty for the market method. */
    public record Legs(@JsonProperty("long") List<Position> longLeg, @JsonProperty("short") List<Position> shortLeg) {
    }

    /** The answer. */
    public record View(String factor, int version, LocalDate date, @JsonProperty("formation_date") LocalDate formationDate,
                       Legs legs) {
    }

    /**
     * @param date any date, or null for the panel's last date; the holdings are those at the end of the latest grid
     *             date on or before it
     * @throws ConflictException for an external series or a version that is not built
     * @throws InvalidRequestException for a date before the panel or before the first formation
     */
    public View at(FactorVersionRecord v, LocalDate date) {
        if (v.method() == FactorDefinition.Method.EXTERNAL) {
            throw new ConflictException("Factor '" + v.name() + "' is an external series (its returns are uploaded), so it"
                    + " holds no securities.");
        }
        if (v.status() != VersionStatus.READY) {
            throw new ConflictException("Factor '" + v.name() + "' version " + v.version() + " is " + v.status().wireName()
                    + ", not ready; wait for its build job.");
        }
        List<LocalDate> grid;
        Holdings h;
        try {
            grid = builds.grid(v);
        } catch (FactorBuilds.FactorBuildException e) {
            throw new ConflictException(e.getMessage());
        }
        int index = grid.size() - 1;
        if (date != null) {
            int i = Collections.binarySearch(grid, date);
            index = i >= 0 ? i : -i - 2;
        }
        if (index < 0) {
            throw new InvalidRequestException("Date " + date + " precedes the panel's first date " + grid.get(0) + ".");
        }
        try {
            h = builds.holdings(v, index);
        } catch (FactorBuilds.FactorBuildException e) {
            throw new ConflictException(e.getMessage());
        }
        if (h == null) {
            throw new InvalidRequestException("Factor '" + v.name() + "' has no formation on or before " + grid.get(index)
                    + "; ask for a later date.");
        }
        Map<Integer, String> codes = panels.securityCodes(v.panelId());
        return new View(v.name(), v.version(), h.date(), h.formationDate(),
                new Legs(positions(h.longLeg(), codes), positions(h.shortLeg(), codes)));
    }

    private static List<Position> positions(List<Holdings.Position> leg, Map<Integer, String> codes) {
        List<Position> out = new ArrayList<>(leg.size());
        for (Holdings.Position p : leg) {
            out.add(new Position(codes.get(p.securityId()), p.weight(), p.driftedWeight()));
        }
        out.sort(java.util.Comparator.comparing(Position::security));
        return out;
    }
}
