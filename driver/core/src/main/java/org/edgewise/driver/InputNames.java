package org.edgewise.driver;

/**
 * How a front end names the user's inputs and choices in the messages of a {@link UserError} — the
 * {@code what} argument of {@link Checks}, for names that travel with the scoring options into the
 * engines (a required edge is refused deep inside an order sum, an evidence of probability zero
 * deep inside a predictor). The core never spells a command-line option itself: the CLI passes its
 * option names (its own table, {@code cli/CliNames}), a library caller gets {@link #API}, the names
 * of the Java records' fields.
 *
 * @param ess                  the equivalent sample size
 * @param forbid               edges forbidden at query time
 * @param require              edges required at query time
 * @param tiers                tiers of variables
 * @param given                the evidence of a conditional probability
 * @param maxHiddenStates      the limit on the joint states of hidden variables summed out
 * @param exactCases           exact per-case probabilities over all orders
 * @param candidates           the tally's number of candidate parents per variable, as advice
 *                             ("tally with {@code candidates}")
 * @param draws                draws stored per chain
 * @param samples              DAGs or orders drawn for features
 * @param methodMcmc           the choice of order MCMC as the method
 * @param orderModular         the choice of the order-modular DAG prior
 * @param structureModular     the choice of the structure-modular DAG prior
 * @param drawFeatures         the features estimated from DAG draws (essential graph, ancestors,
 *                             Markov blanket)
 * @param intervention         the variables an effect query sets
 * @param target               the outcome of an effect query
 * @param versus               the contrasting setting of an effect query
 * @param order                the given variable order
 * @param oneCase              one case to predict
 * @param cases                a file of cases to predict
 * @param chains               the number of MCMC chains
 */
public record InputNames(String ess, String forbid, String require, String tiers, String given,
                         String maxHiddenStates, String exactCases, String candidates, String draws,
                         String samples, String methodMcmc, String orderModular, String structureModular,
                         String drawFeatures, String intervention, String target, String versus,
                         String order, String oneCase, String cases, String chains) {
    /** The names of the Java API: the fields of the request records and the enum constants. */
    public static final InputNames API = new InputNames("ess", "forbid", "require", "tiers", "given",
            "maxHiddenStates", "ExactCasePrediction", "candidates K", "draws", "orderSamples", "method MCMC",
            "dagPrior ORDER_MODULAR", "dagPrior STRUCTURE_MODULAR", "essentialGraph, ancestors or markovBlanket",
            "intervention", "target", "versus", "order", "caseText", "casesFile", "chains");
}
