package dev.winnow.construct;

import java.time.LocalDate;

/** A formation at rebalance point {@code date} with its turnover (sum of absolute weight changes over both legs). */
public record Formation(LocalDate date, double turnover) {
}
