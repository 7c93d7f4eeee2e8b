package dev.winnow.construct;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.JsonNodeFactory;
import com.fasterxml.jackson.databind.node.ObjectNode;
import dev.winnow.construct.Recipe.Change;
import dev.winnow.construct.Recipe.Column;
import dev.winnow.construct.Recipe.Combine;
import dev.winnow.construct.Recipe.CrossSectional;
import dev.winnow.construct.Recipe.Demean;
import dev.winnow.construct.Recipe.Growth;
import dev.winnow.construct.Recipe.Lag;
import dev.winnow.construct.Recipe.Log;
import dev.winnow.construct.Recipe.Rank;
import dev.winnow.construct.Recipe.Ratio;
import dev.winnow.construct.Recipe.Term;
import dev.winnow.construct.Recipe.TrailingBeta;
import dev.winnow.construct.Recipe.TrailingMean;
import dev.winnow.construct.Recipe.TrailingReturn;
import dev.winnow.construct.Recipe.TrailingStdev;
import dev.winnow.construct.Recipe.Winsorize;
import dev.winnow.construct.Recipe.ZScore;
import java.util.ArrayList;
import java.util.Iterator;
import java.util.List;
import java.util.Set;
import java.util.TreeSet;
import java.util.function.BiConsumer;

/**
 * The wire form of a {@link Recipe}: reading a {@code signal} value (a column name, or an object with exactly one key
 * naming an operation; recipes nest), checking it against a panel, and its canonical JSON (string shorthand expanded,
 * defaults filled, keys in alphabetical order, short forms of rank/zscore/winsorize written long). Every problem names
 * its path inside the definition, as in {@code signal.combine[1].of.ratio[0]}.
 */
public final class RecipeJson {
    /** Largest {@code periods} of any operation and largest total lookback of a recipe, in grid dates. */
    public static final int MAX_PERIODS = 1300;
    /** Most operations in one recipe. */
    public static final int MAX_OPERATIONS = 100;
    /** Most terms of one combine. */
    public static final int MAX_TERMS = 20;

    private static final JsonNodeFactory NODES = JsonNodeFactory.instance;
    private static final Set<String> OPERATIONS = new TreeSet<>(List.of("column", "lag", "change", "growth",
            "trailing_return", "trailing_mean", "trailing_stdev", "trailing_beta", "ratio", "log", "combine", "rank",
            "zscore", "winsorize", "demean"));

    private RecipeJson() {
    }

    /** Reads a signal value at {@code path}; null (with problems added) when it cannot be read. */
    public static Recipe read(JsonNode node, String path, List<String> problems) {
        int before = problems.size();
        int[] operations = {0};
        Recipe recipe = readNode(node, path, problems, operations);
        if (problems.size() > before) {
            return null;
        }
        if (operations[0] > MAX_OPERATIONS) {
            problems.add(path + ": a recipe may hold at most " + MAX_OPERATIONS + " operations, this one has " + operations[0]);
            return null;
        }
        if (recipe.lookback() > MAX_PERIODS) {
            problems.add(path + ": the recipe reads " + recipe.lookback() + " grid dates back; at most " + MAX_PERIODS
                    + " are allowed");
            return null;
        }
        return recipe;
    }

    private static Recipe readNode(JsonNode node, String path, List<String> problems, int[] operations) {
        operations[0]++;
        if (node == null || node.isNull()) {
            problems.add(path + ": a signal is required: a numeric column name or a recipe object");
            return null;
        }
        if (node.isTextual()) {
            return column(node.asText(), path, problems);
        }
        if (!node.isObject() || node.size() != 1) {
            problems.add(path + ": a signal is a column name or an object with exactly one key naming an operation, one of "
                    + OPERATIONS);
            return null;
        }
        String op = node.fieldNames().next();
        JsonNode arg = node.get(op);
        String at = path + "." + op;
        switch (op) {
            case "column":
                if (!arg.isTextual()) {
                    problems.add(at + ": must be a column name (string)");
                    return null;
                }
                return column(arg.asText(), at, problems);
            case "lag":
            case "change":
            case "growth":
            case "trailing_mean":
            case "trailing_stdev": {
                if (!fields(arg, at, Set.of("of", "periods"), Set.of("of", "periods"), problems)) {
                    return null;
                }
                int min = op.equals("trailing_stdev") ? 2 : 1;
                Integer p = integer(arg.get("periods"), at + ".periods", min, MAX_PERIODS, problems);
                Recipe of = readNode(arg.get("of"), at + ".of", problems, operations);
                if (p == null || of == null) {
                    return null;
                }
                return switch (op) {
                    case "lag" -> new Lag(of, p);
                    case "change" -> new Change(of, p);
                    case "growth" -> new Growth(of, p);
                    case "trailing_mean" -> new TrailingMean(of, p);
                    default -> new TrailingStdev(of, p);
                };
            }
            case "trailing_return": {
                if (!fields(arg, at, Set.of("periods", "skip"), Set.of("periods"), problems)) {
                    return null;
                }
                Integer p = integer(arg.get("periods"), at + ".periods", 1, MAX_PERIODS, problems);
                Integer s = arg.has("skip") ? integer(arg.get("skip"), at + ".skip", 0, MAX_PERIODS, problems) : Integer.valueOf(0);
                return p == null || s == null ? null : new TrailingReturn(p, s);
            }
            case "trailing_beta": {
                if (!fields(arg, at, Set.of("against", "periods", "min_periods"), Set.of("against", "periods"), problems)) {
                    return null;
                }
                String against = text(arg.get("against"), at + ".against", "a factor name", problems);
                Integer p = integer(arg.get("periods"), at + ".periods", 3, MAX_PERIODS, problems);
                if (p == null || against == null) {
                    return null;
                }
                int fallback = Math.max(3, (p + 1) / 2);
                Integer m = arg.has("min_periods") ? integer(arg.get("min_periods"), at + ".min_periods", 3, p, problems)
                        : Integer.valueOf(fallback);
                return m == null ? null : new TrailingBeta(against, p, m);
            }
            case "ratio": {
                if (!arg.isArray() || arg.size() != 2) {
                    problems.add(at + ": must be an array of two signals [numerator, denominator]");
                    return null;
                }
                Recipe a = readNode(arg.get(0), at + "[0]", problems, operations);
                Recipe b = readNode(arg.get(1), at + "[1]", problems, operations);
                return a == null || b == null ? null : new Ratio(a, b);
            }
            case "log": {
                Recipe of = readNode(arg, at, problems, operations);
                return of == null ? null : new Log(of);
            }
            case "combine": {
                if (!arg.isArray() || arg.isEmpty() || arg.size() > MAX_TERMS) {
                    problems.add(at + ": must be an array of 1 to " + MAX_TERMS + " terms {\"weight\": w, \"of\": signal}");
                    return null;
                }
                List<Term> terms = new ArrayList<>();
                boolean ok = true;
                for (int i = 0; i < arg.size(); i++) {
                    String t = at + "[" + i + "]";
                    if (!fields(arg.get(i), t, Set.of("weight", "of"), Set.of("weight", "of"), problems)) {
                        ok = false;
                        continue;
                    }
                    Double w = number(arg.get(i).get("weight"), t + ".weight", problems);
                    Recipe of = readNode(arg.get(i).get("of"), t + ".of", problems, operations);
                    if (w == null || of == null) {
                        ok = false;
                    } else {
                        terms.add(new Term(w, of));
                    }
                }
                return ok ? new Combine(terms) : null;
            }
            case "rank":
            case "zscore":
            case "winsorize":
            case "demean":
                return crossSectional(op, arg, at, problems, operations);
            default:
                problems.add(path + ": unknown operation '" + op + "'; operations are " + OPERATIONS);
                return null;
        }
    }

    private static Recipe crossSectional(String op, JsonNode arg, String at, List<String> problems, int[] operations) {
        boolean longForm = arg != null && arg.isObject() && arg.has("of");
        if (op.equals("winsorize") || op.equals("demean")) {
            Set<String> required = op.equals("demean") ? Set.of("of", "within") : Set.of("of");
            Set<String> allowed = op.equals("demean") ? Set.of("of", "within") : Set.of("of", "lower", "upper", "within");
            if (!fields(arg, at, allowed, required, problems)) {
                return null;
            }
        } else if (longForm && !fields(arg, at, Set.of("of", "within"), Set.of("of"), problems)) {
            return null;
        }
        Recipe of = readNode(longForm ? arg.get("of") : arg, longForm ? at + ".of" : at, problems, operations);
        String within = longForm && arg.has("within") ? text(arg.get("within"), at + ".within", "a label column name", problems) : null;
        if (of == null || (longForm && arg.has("within") && within == null)) {
            return null;
        }
        switch (op) {
            case "rank":
                return new Rank(of, within);
            case "zscore":
                return new ZScore(of, within);
            case "demean":
                return new Demean(of, within);
            default:
                Double lower = arg.has("lower") ? number(arg.get("lower"), at + ".lower", problems) : Double.valueOf(0.01);
                Double upper = arg.has("upper") ? number(arg.get("upper"), at + ".upper", problems) : Double.valueOf(0.99);
                if (lower == null || upper == null) {
                    return null;
                }
                if (!(lower >= 0 && lower < upper && upper <= 1)) {
                    problems.add(at + ": needs 0 <= lower < upper <= 1, got lower " + lower + " and upper " + upper);
                    return null;
                }
                return new Winsorize(of, lower, upper, within);
        }
    }

    /** Checks the columns and label columns a recipe reads against a panel, each problem with its path. */
    public static void check(Recipe recipe, PanelSchema schema, String panel, String path, List<String> problems) {
        walk(recipe, path, (r, at) -> {
            if (r instanceof Column c && !schema.isNumeric(c.name())) {
                problems.add(at + ": " + (schema.isLabel(c.name()) ? "column '" + c.name() + "' of panel " + panel
                        + " holds labels, not numbers" : "no column '" + c.name() + "' in panel " + panel)
                        + "; numeric columns are " + String.join(", ", schema.numericColumns()));
            } else if (r instanceof CrossSectional x && x.within() != null && !schema.isLabel(x.within())) {
                List<String> labels = schema.labelColumns();
                problems.add(at + "." + operation(r) + ".within: no label column '" + x.within() + "' in panel " + panel + "; label columns are "
                        + (labels.isEmpty() ? "(none)" : String.join(", ", labels)));
            }
        });
    }

    /**
     * Visits every operation with its canonical path (the path a problem about it names): {@code path} for the root,
     * {@code .lag.of}, {@code .ratio[0]}, {@code .combine[1].of}, {@code .rank.of} and so on below.
     */
    public static void walk(Recipe recipe, String path, BiConsumer<Recipe, String> visitor) {
        visitor.accept(recipe, path);
        String op = operation(recipe);
        if (recipe instanceof Ratio r) {
            walk(r.numerator(), path + ".ratio[0]", visitor);
            walk(r.denominator(), path + ".ratio[1]", visitor);
        } else if (recipe instanceof Combine c) {
            for (int i = 0; i < c.terms().size(); i++) {
                walk(c.terms().get(i).of(), path + ".combine[" + i + "].of", visitor);
            }
        } else if (recipe instanceof Log l) {
            walk(l.of(), path + ".log", visitor);
        } else {
            for (Recipe input : recipe.inputs()) {
                walk(input, path + "." + op + ".of", visitor);
            }
        }
    }

    /** Canonical JSON of a recipe. */
    public static ObjectNode toJson(Recipe recipe) {
        ObjectNode o = NODES.objectNode();
        String op = operation(recipe);
        if (recipe instanceof Column c) {
            o.put(op, c.name());
        } else if (recipe instanceof Lag r) {
            ofAndPeriods(o.putObject(op), r.of(), r.periods());
        } else if (recipe instanceof Change r) {
            ofAndPeriods(o.putObject(op), r.of(), r.periods());
        } else if (recipe instanceof Growth r) {
            ofAndPeriods(o.putObject(op), r.of(), r.periods());
        } else if (recipe instanceof TrailingMean r) {
            ofAndPeriods(o.putObject(op), r.of(), r.periods());
        } else if (recipe instanceof TrailingStdev r) {
            ofAndPeriods(o.putObject(op), r.of(), r.periods());
        } else if (recipe instanceof TrailingReturn r) {
            o.putObject(op).put("periods", r.periods()).put("skip", r.skip());
        } else if (recipe instanceof TrailingBeta r) {
            o.putObject(op).put("against", r.against()).put("min_periods", r.minPeriods()).put("periods", r.periods());
        } else if (recipe instanceof Ratio r) {
            ArrayNode a = o.putArray(op);
            a.add(toJson(r.numerator()));
            a.add(toJson(r.denominator()));
        } else if (recipe instanceof Log r) {
            o.set(op, toJson(r.of()));
        } else if (recipe instanceof Combine r) {
            ArrayNode a = o.putArray(op);
            for (Term t : r.terms()) {
                ObjectNode term = a.addObject();
                term.set("of", toJson(t.of()));
                term.put("weight", t.weight());
            }
        } else if (recipe instanceof Winsorize r) {
            ObjectNode w = o.putObject(op);
            w.put("lower", r.lower());
            w.set("of", toJson(r.of()));
            w.put("upper", r.upper());
            if (r.within() != null) {
                w.put("within", r.within());
            }
        } else if (recipe instanceof CrossSectional r) {
            ObjectNode w = o.putObject(op);
            w.set("of", toJson(r.of()));
            if (r.within() != null) {
                w.put("within", r.within());
            }
        }
        return o;
    }

    /** Canonical JSON text of a recipe. */
    public static String canonical(Recipe recipe) {
        return toJson(recipe).toString();
    }

    /** The operation's wire name. */
    public static String operation(Recipe recipe) {
        if (recipe instanceof Column) {
            return "column";
        } else if (recipe instanceof Lag) {
            return "lag";
        } else if (recipe instanceof Change) {
            return "change";
        } else if (recipe instanceof Growth) {
            return "growth";
        } else if (recipe instanceof TrailingReturn) {
            return "trailing_return";
        } else if (recipe instanceof TrailingMean) {
            return "trailing_mean";
        } else if (recipe instanceof TrailingStdev) {
            return "trailing_stdev";
        } else if (recipe instanceof TrailingBeta) {
            return "trailing_beta";
        } else if (recipe instanceof Ratio) {
            return "ratio";
        } else if (recipe instanceof Log) {
            return "log";
        } else if (recipe instanceof Combine) {
            return "combine";
        } else if (recipe instanceof Rank) {
            return "rank";
        } else if (recipe instanceof ZScore) {
            return "zscore";
        } else if (recipe instanceof Winsorize) {
            return "winsorize";
        }
        return "demean";
    }

    private static void ofAndPeriods(ObjectNode o, Recipe of, int periods) {
        o.set("of", toJson(of));
        o.put("periods", periods);
    }

    private static Recipe column(String name, String path, List<String> problems) {
        if (name.isBlank()) {
            problems.add(path + ": a column name must not be empty");
            return null;
        }
        return new Column(name);
    }

    private static boolean fields(JsonNode arg, String at, Set<String> allowed, Set<String> required, List<String> problems) {
        if (arg == null || !arg.isObject()) {
            problems.add(at + ": must be an object with " + new TreeSet<>(allowed));
            return false;
        }
        boolean ok = true;
        for (Iterator<String> it = arg.fieldNames(); it.hasNext(); ) {
            String name = it.next();
            if (!allowed.contains(name)) {
                problems.add(at + "." + name + ": unknown parameter; allowed are " + new TreeSet<>(allowed));
                ok = false;
            }
        }
        for (String name : new TreeSet<>(required)) {
            if (!arg.has(name) || arg.get(name).isNull()) {
                problems.add(at + "." + name + ": is required");
                ok = false;
            }
        }
        return ok;
    }

    private static Integer integer(JsonNode v, String at, int min, int max, List<String> problems) {
        if (v == null || !v.isIntegralNumber() || !v.canConvertToInt() || v.asInt() < min || v.asInt() > max) {
            problems.add(at + ": must be a whole number from " + min + " to " + max + ", got " + v);
            return null;
        }
        return v.asInt();
    }

    private static Double number(JsonNode v, String at, List<String> problems) {
        if (v == null || !v.isNumber() || !Double.isFinite(v.asDouble())) {
            problems.add(at + ": must be a finite number, got " + v);
            return null;
        }
        return v.asDouble();
    }

    private static String text(JsonNode v, String at, String what, List<String> problems) {
        if (v == null || !v.isTextual() || v.asText().isBlank()) {
            problems.add(at + ": must be " + what + " (a non-empty string)");
            return null;
        }
        return v.asText();
    }
}
