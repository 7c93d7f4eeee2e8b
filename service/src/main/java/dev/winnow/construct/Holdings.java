package dev.winnow.construct;

import java.time.LocalDate;
import java.util.ArrayList;
import java.util.List;

/**
 * What a factor holds at a date: the latest formation at or before it, each leg's securities with their weight at
 * formation (each leg sums to one, sub-portfolios combined with their coefficients) and that weight drifted through
 * the end of the date. A long-only factor has no short leg (empty list). Security ids are panel-local.
 */
public record Holdings(LocalDate date, LocalDate formationDate, List<Position> longLeg, List<Position> shortLeg) {

    /** One security of a leg; a security that left the leg since formation has drifted weight 0. */
    public record Position(int securityId, double weight, double driftedWeight) {
    }

    public Holdings {
        longLeg = List.copyOf(longLeg);
        shortLeg = List.copyOf(shortLeg);
    }

    static Holdings of(LocalDate date, LocalDate formationDate, LegWeights[] formed, LegWeights[] drifted) {
        return new Holdings(date, formationDate, positions(formed[0], drifted[0]),
                formed[1] == null ? List.of() : positions(formed[1], drifted[1]));
    }

    /** The union of the two legs' securities in id order, a side without the security weighing 0. */
    private static List<Position> positions(LegWeights formed, LegWeights drifted) {
        List<Position> out = new ArrayList<>();
        int a = 0;
        int b = 0;
        int[] ia = formed.ids();
        int[] ib = drifted.ids();
        while (a < ia.length || b < ib.length) {
            if (b >= ib.length || (a < ia.length && ia[a] < ib[b])) {
                out.add(new Position(ia[a], formed.weights()[a++], 0.0));
            } else if (a >= ia.length || ib[b] < ia[a]) {
                out.add(new Position(ib[b], 0.0, drifted.weights()[b++]));
            } else {
                out.add(new Position(ia[a], formed.weights()[a++], drifted.weights()[b++]));
            }
        }
        return out;
    }
}
