package org.edgewise.driver.average.dag;

import org.edgewise.driver.average.convergence.Estimate;

/**
 * DAGs drawn from a posterior, asked for structural features: as parent bitmasks ({@link DagDraws},
 * n ≤ 31) or as parent lists ({@link ParentListDraws}, any n). Both estimate a feature the same way
 * ({@link DagDraws#estimate(DagDraws.Feature, int, int, int, double[][])}), so a feature's mean and
 * Monte Carlo error do not depend on the representation.
 */
public interface DrawnDags {
    int variableCount();

    /** Mean, MCSE, R̂ (NaN for independent draws) and effective sample size of {@code f}. */
    Estimate estimate(DagDraws.Feature f);

    /** The edge a → b. */
    DagDraws.Feature edge(int a, int b);

    /** a and b adjacent. */
    DagDraws.Feature adjacent(int a, int b);

    /** a → b compelled (directed in the essential graph). */
    DagDraws.Feature compelled(int a, int b);

    /** a and b adjacent and the edge reversible (undirected in the essential graph). */
    DagDraws.Feature reversible(int a, int b);

    /** a ⇝ b: a directed path from a to b. */
    DagDraws.Feature ancestor(int a, int b);

    /** a in the Markov blanket of b: parent, child or co-parent. */
    DagDraws.Feature blanket(int a, int b);
}
