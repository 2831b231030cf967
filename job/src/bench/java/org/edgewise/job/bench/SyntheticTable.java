package org.edgewise.job.bench;

import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import org.edgewise.driver.AtomicWrite;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;

/**
 * The benchmarks' synthetic tables (not a test fixture): {@code vars} variables v0, v1, … of 2–4
 * states (states s0, s1, …) from a {@link RandomNetwork} in which each variable has up to
 * {@code maxParents} parents among the {@code window} before it, with skewed conditional
 * tables (u³ + 0.02, normalised) so candidate pruning and the count arrays see dependencies of
 * varied strength; rows drawn by the one {@link ForwardSampler}. Same arguments, same bytes.
 * Written to a temporary sibling and renamed, so an interrupted run leaves no half table.
 *
 * <p>Usage: {@code SyntheticTable OUT.csv ROWS VARS SEED [MAX_PARENTS WINDOW]} (defaults 2 and 3,
 * what {@code scripts/bench scale} uses); {@code TallyBench} calls {@link #generate} with 3 and 6.
 */
public final class SyntheticTable {
    private SyntheticTable() {
    }

    public static void main(String[] args) throws IOException {
        int maxParents = args.length > 4 ? Integer.parseInt(args[4]) : 2;
        int window = args.length > 5 ? Integer.parseInt(args[5]) : 3;
        generate(Path.of(args[0]), Long.parseLong(args[1]), Integer.parseInt(args[2]), maxParents, window,
                Long.parseLong(args[3]));
    }

    /** The generating network of a table (its arities and structure depend on the seed only). */
    public static Network network(int vars, int maxParents, int window, long seed) {
        return RandomNetwork.generate("v", RandomNetwork.arities(vars, 2, 4, seed), maxParents, window, 3, 0.02,
                seed + 1);
    }

    public static void generate(Path csv, long rows, int vars, int maxParents, int window, long seed)
            throws IOException {
        Network net = network(vars, maxParents, window, seed);
        AtomicWrite.file(csv, tmp -> {
            try (OutputStream out = new BufferedOutputStream(Files.newOutputStream(tmp), 1 << 20)) {
                new ForwardSampler(net).writeCsv(rows, seed + 2, out, n -> { });
            }
        });
    }
}
