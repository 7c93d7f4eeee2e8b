package dev.winnow.research;

import dev.winnow.construct.DefinitionJson;
import dev.winnow.construct.FactorDefinition;
import dev.winnow.construct.FactorDefinition.Role;
import dev.winnow.store.FactorStore.FactorVersionRecord;

import java.util.HashMap;
import java.util.List;
import java.util.Map;

/**
 * Which factors are inputs. A factor's role is the one its current definition declares ({@code "role": "factor"} or
 * {@code "input"}); a current definition without a role makes the factor an input while some live definition names it
 * as its {@code risk_free}, and a candidate factor otherwise. The role holds for every version of the factor: an
 * input's old versions are no trials either.
 */
public final class FactorRoles {
    private final Map<String, Role> declared;
    private final Map<String, String> riskFreeOf;

    private FactorRoles(Map<String, Role> declared, Map<String, String> riskFreeOf) {
        this.declared = declared;
        this.riskFreeOf = riskFreeOf;
    }

    /** The roles decided from the current versions among {@code versions} (other versions are ignored). */
    public static FactorRoles of(List<FactorVersionRecord> versions) {
        Map<String, Role> declared = new HashMap<>();
        Map<String, String> riskFreeOf = new HashMap<>();
        for (FactorVersionRecord v : versions) {
            if (!v.current()) {
                continue;
            }
            FactorDefinition def = definitionOf(v);
            if (def == null) {
                continue;
            }
            if (def.declaredRole() != null) {
                declared.put(v.name(), def.declaredRole());
            }
            if (!v.retired() && def.riskFree() != null) {
                riskFreeOf.merge(def.riskFree(), v.name(), (a, b) -> a.compareTo(b) <= 0 ? a : b);
            }
        }
        return new FactorRoles(declared, riskFreeOf);
    }

    public Role role(String factor) {
        Role role = declared.get(factor);
        if (role != null) {
            return role;
        }
        return riskFreeOf.containsKey(factor) ? Role.INPUT : Role.FACTOR;
    }

    public boolean input(String factor) {
        return role(factor) == Role.INPUT;
    }

    /** A live factor that names this one as its risk_free rate (the first by name), or null. */
    public String riskFreeOf(String factor) {
        return riskFreeOf.get(factor);
    }

    /** Why the factor is an input, or null when it is a candidate factor. */
    public String inputReason(String factor) {
        if (!input(factor)) {
            return null;
        }
        if (declared.get(factor) == Role.INPUT) {
            return "an input (its definition declares \"role\": \"input\"): a series other factors and studies read, not a candidate premium";
        }
        return "an input: the risk-free rate that factor '" + riskFreeOf(factor) + "' subtracts, a rate every premium is measured against"
                + " (declare \"role\": \"factor\" to count it as a trial)";
    }

    private static FactorDefinition definitionOf(FactorVersionRecord v) {
        DefinitionJson.Parsed parsed = DefinitionJson.read(v.definitionJson());
        return parsed.ok() ? parsed.definition() : null;
    }
}
