package org.edgewise.driver.cli;

import java.util.Locale;
import org.edgewise.driver.UserError;
import picocli.CommandLine.Option;

/** {@code --order} and {@code --method}, shared by {@code edges} and {@code predict}, with their one validation. */
public final class MethodMixin {
    @Option(names = "--order", paramLabel = "a,b,c,…", description = "variable order, first to last: a variable's parents come before it") public String order;

    @Option(names = "--method", paramLabel = "order|exact|mcmc", description = "order: given order (default with --order); exact, mcmc: averaged over unknown orders") public String method;

    /**
     * The method asked for — {@code order}, {@code exact} or {@code mcmc} — checked against
     * {@code --order}; {@code what} names the job in the message ("averaging", "prediction").
     */
    public String resolve(String what) {
        String m = method == null ? (order != null ? "order" : null) : method.trim().toLowerCase(Locale.ROOT);
        if (m == null) {
            throw new UserError("give --order a,b,c,… (" + what + " given an order) or --method exact|mcmc (over unknown orders)");
        }
        switch (m) {
            case "order":
                if (order == null) {
                    throw new UserError("--method order needs --order a,b,c,…");
                }
                return m;
            case "exact":
            case "mcmc":
                if (order != null) {
                    throw new UserError("--order and --method " + m + " exclude each other: " + m + " averages over unknown orders");
                }
                return m;
            default:
                throw new UserError("--method must be order, exact or mcmc, got '" + method + "'");
        }
    }
}
