package dev.winnow.api;

import dev.winnow.construct.LoadingsTable;
import dev.winnow.research.LoadingsService.Characteristic;
import dev.winnow.research.LoadingsService.Table;

import java.util.List;

/** The CSV form of loadings answers: one row a security in code order; an undefined number is an empty cell. */
final class LoadingsCsv {
    private LoadingsCsv() {
    }

    static String table(Table answer) {
        LoadingsTable table = answer.table();
        List<Integer> rows = answer.rows();
        List<String> factorNames = answer.spec().factors();
        StringBuilder out = new StringBuilder(64 + rows.size() * (40 + 24 * factorNames.size()));
        out.append("security,n,alpha");
        factorNames.forEach(f -> out.append(",beta_").append(f));
        out.append(",r_squared,residual_vol\n");
        for (int row : rows) {
            out.append(Responses.csvText(answer.codes().get(table.securityIds()[row]))).append(',').append(table.usable()[row])
                    .append(',').append(Responses.csvNumber(table.alpha()[row]));
            for (double[] column : table.betas()) {
                out.append(',').append(Responses.csvNumber(column[row]));
            }
            out.append(',').append(Responses.csvNumber(table.rSquared()[row]))
                    .append(',').append(Responses.csvNumber(table.residualVol()[row])).append('\n');
        }
        return out.toString();
    }

    static String characteristic(Characteristic answer) {
        StringBuilder out = new StringBuilder("security");
        answer.columns().forEach(c -> out.append(',').append(Responses.csvText(c)));
        out.append('\n');
        for (int row : answer.rows()) {
            out.append(Responses.csvText(answer.codes().get(answer.securityIds()[row])));
            for (double[] column : answer.scores()) {
                out.append(',').append(Responses.csvNumber(column[row]));
            }
            out.append('\n');
        }
        return out.toString();
    }
}
