package org.edgewise.driver.average.partition;

import java.util.SplittableRandom;
import org.edgewise.driver.UserError;
import org.edgewise.driver.average.ChildTables;
import org.edgewise.driver.average.LocalScores;
import org.edgewise.driver.average.OrderConstraints;
import org.edgewise.driver.average.dag.DagFeatures;
import org.edgewise.driver.average.givenorder.OrderSum;
import org.edgewise.driver.average.mcmc.DrawStore;
import org.edgewise.driver.average.mcmc.McmcMemory;
import org.edgewise.driver.average.mcmc.SteppedChain;

/**
 * One partition-MCMC chain (Kuipers &amp; Moffa 2017, "Partition MCMC for inference on acyclic
 * digraphs", JASA 112): Metropolis–Hastings over ordered partitions Λ = (T_1, …, T_m) of the
 * variables, targeting the structure-modular posterior summed per partition.
 *
 * <p><b>Convention</b> (fixed here; the paper's, listed from the sources): T_1 holds the nodes with
 * no parents; a node in T_k, k &gt; 1, has at least one parent in T_{k−1} and all its parents in
 * B_k = T_1 ∪ … ∪ T_{k−1}. Every DAG has exactly one such partition (T_1 its sources, T_k the nodes
 * whose longest path from a source has k − 1 edges), so with w_i(U) = s(i,U) + log ρ_i(U)
 * <pre>  π(Λ) = Π_i Σ_{U ⊆ B_k(i), U ∩ T_{k(i)−1} ≠ ∅} exp w_i(U)      (U = ∅ alone for T_1)</pre>
 * sums P(D|G)·Π ρ_i(U_i) over the DAGs whose partition is Λ, and Σ_Λ π(Λ) is the structure-modular
 * sum over all DAGs: the chain's partitions, each with a DAG drawn from its allowed parent sets by
 * weight, are draws of P(G | D) under the structure-modular prior (uniform prior over partitions).
 *
 * <p><b>Per-node score</b> ({@link PartitionScores}), by inclusion–exclusion on α_i(P) = Σ_{U ⊆ P} exp w_i(U) (the
 * {@link ChildTables} zeta transform): Σ_{U ⊆ B, U ∩ T ≠ ∅} = α_i(B) − α_i(B ∖ T) — two table lookups,
 * O(1). When the two agree to a relative 10⁻⁴ (the difference would lose digits) or the child is not
 * tabulated, the sum is taken directly over the child's allowed parent sets, O(#sets) (≤ 299 for
 * 12 candidates and d = 3; {@link PartitionMcmc} runs the chains on the sets that
 * {@link org.edgewise.driver.average.DominatedSets} keeps, 1 % of them on a 40-variable table with
 * 100,000 rows and no candidate limit, within a stated 10⁻¹² of the full posterior). Cost per move: a partition move
 * recomputes the masks (B, T) of every node, O(n·K) word operations, and rescores the nodes whose
 * masks changed; after a DAG move only the nodes whose layer moved and the children that have one
 * of them as a candidate are looked at ({@link PartitionState#followDag}; the same draws as the
 * full O(n·K) relayering, tested). The partition, its bookkeeping and the
 * partition proposals live in {@link PartitionState}, the DAG moves in {@link DagMoves}; this class
 * mixes the moves and records the draws.
 *
 * <p><b>State</b>: Λ and one DAG G whose partition is Λ ({@link PartitionDag}); the target is the joint
 * P(G | D) ∝ Π_i exp w_i(U_i) with Λ = Λ(G), whose marginal on Λ is π. <b>Moves</b>, each leaving
 * that joint invariant on its own, mixed with the shares of a {@link Mix}:
 * <ul>
 *   <li>DAG moves, after which Λ follows G (its layering, rescored): single-edge add / delete /
 *       reverse ({@link DagMoves#edge}, Madigan &amp; York 1995; Giudici &amp; Castelo 2003), a Gibbs
 *       draw of one child's parent set among the sets that keep G acyclic ({@link DagMoves#parents}),
 *       the new edge reversal ({@link DagMoves#reversal}, Grzegorczyk &amp; Husmeier 2008), and a
 *       joint Gibbs draw of the parent sets of a block of up to four nodes ({@link DagMoves#block});</li>
 *   <li>partition moves, each reversible with respect to π; when one is taken, the parent sets of
 *       the children whose allowed sets changed are redrawn from P(G | Λ', D):
 *     <ul>
 *       <li>split / join: the neighbours of Λ are every split of an element T_j into (A, T_j ∖ A),
 *           A a non-empty proper subset placed first, and every join of adjacent T_j, T_{j+1};
 *           there are N(Λ) = Σ_j (2^{|T_j|} − 2) + (m − 1) of them. One is proposed uniformly, so
 *           q(Λ'|Λ) = 1/N(Λ); a split's reverse is the join of its two parts and vice versa, so the
 *           acceptance is min(1, π(Λ')·N(Λ) / (π(Λ)·N(Λ'))) (Kuipers &amp; Moffa 2017, sec. 4.1);</li>
 *       <li>swap: two nodes in different elements exchange them, the pair drawn uniformly among
 *           such pairs, whose number C(n,2) − Σ_j C(|T_j|,2) the swap does not change: symmetric,
 *           acceptance min(1, π(Λ')/π(Λ)) (ibid., sec. 4.2).</li>
 *     </ul></li>
 * </ul>
 * Measured (docs/unknown-order.md): with partition moves alone (and the paper's node move, uniform
 * or as a heat-bath step) the chains froze on windowed candidate sets at n = 50 — almost every
 * partition move leaves some node without a candidate parent in the element before it (π = 0) —
 * while a single DAG move shifts the partition wherever the DAG goes; the node move, whose
 * heat-bath form rescored all 2m' + 1 places, cost ten times the ESS per second and was dropped.
 *
 * <p><b>Constraints</b>: forbidden and required edges are already in {@link LocalScores} (sets
 * removed); tiers are honoured by removing from each child's B and T the candidates that must
 * follow it, so π counts exactly the DAGs with no edge against the tiers — which are the DAGs with
 * a tier-respecting order when every variable is in a tier ({@link PartitionMcmc#checkTiers}
 * refuses the other case).
 *
 * <p>The draws go to a {@link DrawStore}: per candidate edge the Rao-Blackwellised
 * P(j → i | Λ, D) (the weight share of i's allowed sets that contain j), the DAG's log score, and the
 * {@link State}: a linear extension (nodes by element), one DAG drawn from Λ (each node's parent set
 * by weight among its allowed sets), the element of every node and, with features, the ancestor and
 * Markov-blanket bits of that DAG.
 *
 * <p>Memory per chain: O(n) state and scratch, per draw 4 bytes per candidate edge, 12n bytes of
 * state and n²/32 bytes of feature bits. Mutable, confined to one thread at a time.
 */
public final class PartitionChain extends SteppedChain {
    /**
     * The shares of the moves in a step; swaps take the rest of 1. {@link #DEFAULT} chosen by ESS
     * per CPU-second (docs/unknown-order.md: random networks, n = 50 and 100, windowed candidates
     * and the tally's 12 candidates): the DAG moves are cheap (O(n + edges) when taken, O(1)–O(#sets)
     * when not) and mix; reversals and blocks turn directions, which mix slowest; the partition
     * moves cost an O(n·K) rescoring each and are kept at a small share.
     */
    record Mix(double edge, double parents, double reversal, double block, double splitJoin) {
        static final Mix DEFAULT = new Mix(0.35, 0.05, 0.3, 0.25, 0.05);
        /** The DAG moves, in the order their shares are laid on [0, 1): edge, parents, reversal, block. */
        static final int DAG_MOVES = 4;

        Mix {
            if (!(edge >= 0 && parents >= 0 && reversal >= 0 && block >= 0 && splitJoin >= 0
                    && edge + parents + reversal + block + splitJoin <= 1 + 1e-12)) {
                throw new IllegalArgumentException("move shares must be ≥ 0 and add up to at most 1: " + this);
            }
        }

        /** The share of DAG move {@code k} (0 edge, 1 parents, 2 reversal, 3 block). */
        double dagShare(int k) {
            return switch (k) {
                case 0 -> edge;
                case 1 -> parents;
                case 2 -> reversal;
                default -> block;
            };
        }
    }

    /** Largest n: N(Λ) involves 2^{|T_j|} as a double. */
    static final int MAX_VARIABLES = 1000;

    /** A stored draw: a linear extension of Λ, the drawn DAG (set index per child), elements, feature bits. */
    record State(int[] order, int[] sets, int[] element, long[] features) implements DrawStore.Drawn {
    }

    private final LocalScores ls;
    private final ChildTables tables;
    private final int n;
    private final int[] edgeOffset;
    private final boolean features;
    private final SplittableRandom rng;
    private final SplittableRandom drawRng;
    private final Mix mix;
    private final PartitionScores scores;
    private final PartitionState part;
    /** The chain's DAG, whose partition is Λ (drawn from P(G | Λ, D) after every partition move). */
    private PartitionDag dag;
    private DagMoves dagMoves;
    /**
     * Whether Λ follows a DAG move by relayering and rescoring all n nodes (O(n·K), the former way;
     * tests compare it draw for draw) instead of only the nodes whose layer or masks move.
     */
    boolean fullFollow;

    PartitionChain(LocalScores ls, ChildTables tables, OrderConstraints oc, int[] edgeOffset, boolean features,
                   SplittableRandom rng, DrawStore draws, Mix mix) {
        this(ls, tables, oc, edgeOffset, features, rng, draws, mix, null);
    }

    /**
     * A chain from a DAG drawn given {@code startOrder} ({@link org.edgewise.driver.average.mcmc.DispersedStart};
     * a random allowed order when null or of no posterior weight); the start's quantities go to
     * {@code draws} ({@link DrawStore#start}).
     */
    PartitionChain(LocalScores ls, ChildTables tables, OrderConstraints oc, int[] edgeOffset, boolean features,
                   SplittableRandom rng, DrawStore draws, Mix mix, int[] startOrder) {
        super(draws);
        this.mix = mix;
        this.ls = ls;
        this.tables = tables;
        this.n = ls.variableCount();
        if (n > MAX_VARIABLES) {
            throw new UserError("partition MCMC handles at most " + MAX_VARIABLES + " variables, this store has " + n);
        }
        this.edgeOffset = edgeOffset;
        this.features = features;
        this.rng = rng;
        this.drawRng = rng.split();
        scores = new PartitionScores(ls, tables, oc);
        part = new PartitionState(ls, scores);
        start(oc, startOrder);
        float[] row = new float[edgeOffset[n]];
        int[] sets = new int[n];
        for (int i = 0; i < n; i++) {
            sets[i] = part.tallyAndDraw(i, drawRng.nextDouble(), row, edgeOffset[i]);
        }
        draws.start(row, new State(part.linearExtension(), sets, part.elements().clone(),
                features ? DagFeatures.indicators(ls, sets, part.linearExtension()) : null));
    }

    /** The start: a DAG drawn given {@code first} (or a random allowed order), and its partition. */
    private void start(OrderConstraints oc, int[] first) {
        long[] mask = new long[n];
        double[] z = new double[n];
        int[] element = new int[n];
        for (int attempt = 0; ; attempt++) {
            int[] order = attempt == 0 && first != null ? first : oc.randomOrder(rng);
            int[] pos = OrderSum.positions(order, n);
            boolean ok = true;
            for (int i = 0; i < n; i++) {
                mask[i] = ls.predecessorMask(i, pos);
                z[i] = OrderSum.childLogSum(ls, i, mask[i]);
                ok &= z[i] > Double.NEGATIVE_INFINITY;
            }
            if (ok) {
                int[] chosen = DagFeatures.sampleDag(ls, mask, z, rng);
                dag = new PartitionDag(ls, chosen);
                dagMoves = new DagMoves(ls, tables, scores, dag, rng);
                for (int v : order) {
                    int layer = 0;
                    for (int p : ls.parents(v, chosen[v])) {
                        layer = Math.max(layer, element[p] + 1);
                    }
                    element[v] = layer;
                }
                break;
            }
            if (attempt == 1000) {
                throw new UserError("no starting order with positive posterior found in 1000 random orders "
                        + "(the required edges and the in-degree bound leave almost no order possible)");
            }
        }
        if (!(part.start(element) > Double.NEGATIVE_INFINITY)) {
            throw new IllegalStateException("the partition of a drawn DAG has no weight");
        }
    }

    @Override
    protected void move() {
        step();
    }

    /**
     * Bytes a partition chain holds beyond an order chain's state (for {@link McmcMemory}): its
     * partition state and scratch, {@value #STATE_BYTES_PER_VARIABLE} bytes per variable (4 int and
     * 9 long/double arrays of length n, 14 int scratch arrays of {@link PartitionDag},
     * {@link PartitionState} and {@link DagMoves}, one boolean, and the block move's three strongest
     * candidates); the children bitsets, 8·⌈n/64⌉ bytes
     * per variable; per candidate edge 4 bytes (who has x as a candidate, for the incremental
     * follow); and per child the set index, 12 bytes per slot of an open-addressing table of at most
     * 4 × its allowed sets.
     */
    public static long extraBytes(LocalScores ls) {
        int n = ls.variableCount();
        long bytes = (long) STATE_BYTES_PER_VARIABLE * n + 8L * ((n + 63) >>> 6) * n;
        for (int i = 0; i < n; i++) {
            bytes += 12L * PartitionDag.slots(ls.setCount(i)) + 4L * ls.candidates(i).length;
        }
        return bytes;
    }

    /** Bytes of partition state and scratch per variable (see {@link #extraBytes}). */
    static final int STATE_BYTES_PER_VARIABLE = 4 * 4 + 9 * 8 + 14 * 4 + 1 + 3 * 4;

    /** Sets the share of block moves on v and its strongest candidates ({@link DagMoves#block}; tests, benchmarks). */
    void strongBlockShare(double share) {
        dagMoves.strongShare = share;
    }

    /** The former step, for tests and benchmarks side by side: full relayering and the block draw's exps taken twice. */
    void former() {
        fullFollow = true;
        dagMoves.expTwice = true;
    }

    /** Current log π(Λ) (tests). */
    double logScore() {
        return part.score();
    }

    /** log π(Λ) of the partition with {@code element[v]} the (0-based) element of node v (tests). */
    double logScoreOf(int[] element) {
        return scores.logScoreOf(element);
    }

    /** The chain's DAG: each child's parent-set index in {@link LocalScores#masks(int)} (a copy; tests). */
    int[] dagSets() {
        return dag.sets();
    }

    /** Current element of every node (a copy; tests). */
    int[] elements() {
        return part.elements().clone();
    }

    /** One step: a DAG move by the shares of {@link #mix}, else a split/join or a swap of Λ. */
    void step() {
        if (n < 2) {
            return;
        }
        double u = rng.nextDouble();
        dag.clearDirty();
        for (int k = 0; k < Mix.DAG_MOVES; k++) {
            double share = mix.dagShare(k);
            if (u < share) {
                if (dagMove(k)) {
                    follow();
                }
                return;
            }
            u -= share;
        }
        double logRatio;
        if (u < mix.splitJoin()) {
            logRatio = part.proposeSplitJoin(rng);
        } else {
            if (part.elementCount() == 1) {
                return;
            }
            logRatio = part.proposeSwap(rng);
        }
        double delta = part.rescore();
        if (!(delta > Double.NEGATIVE_INFINITY)) {
            return;
        }
        double a = delta + logRatio;
        if (a < 0 && Math.log(rng.nextDouble()) >= a) {
            return;
        }
        accept(delta);
    }

    /** DAG move {@code k} (in {@link Mix#dagShare}'s numbering); true when it changed the DAG. */
    private boolean dagMove(int k) {
        return switch (k) {
            case 0 -> dagMoves.edge(part.elements());
            case 1 -> dagMoves.parents();
            case 2 -> dagMoves.reversal();
            default -> dagMoves.block();
        };
    }

    /**
     * A partition move's acceptance: Λ' becomes the state and the chain's DAG is redrawn from
     * P(G | Λ', D) where that differs from P(G | Λ, D) — the children whose masks changed; the
     * others' parent sets are already draws from their (unchanged) conditional, which factorises
     * over children and which the move, deciding on Λ alone, leaves as it was.
     */
    private void accept(double delta) {
        accepted++;
        part.commit(delta);
        for (int k = 0; k < part.changedCount(); k++) {
            int v = part.changed(k);
            dag.setParents(v, part.drawAllowed(v, rng.nextDouble()));
        }
    }

    /** Λ follows the chain's DAG after a DAG move: its partition, rescored and made the state. */
    private void follow() {
        double delta;
        if (fullFollow) {
            part.proposeLayers(dag);
            delta = part.rescore();
        } else {
            delta = part.followDag(dag);
        }
        if (!(delta > Double.NEGATIVE_INFINITY)) {
            throw new IllegalStateException("the partition of an accepted DAG has no weight");
        }
        accepted++;
        part.commit(delta);
    }

    @Override
    protected void record() {
        float[] row = new float[edgeOffset[n]];
        int[] sets = new int[n];
        for (int i = 0; i < n; i++) {
            sets[i] = part.tallyAndDraw(i, drawRng.nextDouble(), row, edgeOffset[i]);
        }
        int[] order = part.linearExtension();
        long[] feats = features ? DagFeatures.indicators(ls, sets, order) : null;
        draws.add(stepsDone, row, dagLogScore(), new State(order, sets, part.elements().clone(), feats));
    }

    /**
     * The log-score trace: log of the target density at the chain's state, Σ_i w_i(U_i) of its DAG G
     * (log P(G) + log P(D | G) up to a constant) — the chain's lp. Not log π(Λ): that sum over the
     * partition's DAGs moves by fractions of a nat when a weak edge shifts some element, so slowly
     * that its R̂ flagged runs whose every edge had R̂ &lt; 1.002 and ESS &gt; 2,700 (n = 100, measured).
     */
    private double dagLogScore() {
        double lp = 0;
        for (int i = 0; i < n; i++) {
            lp += ls.weights(i)[dag.set(i)];
        }
        return lp;
    }
}
