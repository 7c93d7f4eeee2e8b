package dev.winnow.construct;

import java.time.LocalDate;

/**
 * One period's factor return: the spread (long leg minus short leg, or the market return minus the risk-free
 * return), each leg's return (short leg NaN for the market), and the spread net of trading costs.
 */
public record FactorObservation(LocalDate date, double spread, double longLeg, double shortLeg, double net) {
}
