import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.SplittableRandom;

/**
 * Writes a synthetic discrete table for the benchmarks (not a test fixture): {@code vars} variables
 * of 2–4 states drawn from a fixed random network in which variable i has up to two parents among
 * the three before it, each parent configuration with its own random distribution (so candidate
 * pruning and the count arrays see real dependencies). Same seed, same bytes.
 * Usage: {@code java scripts/SyntheticTable.java OUT.csv ROWS VARS SEED}. Written to a temporary
 * sibling and renamed, so an interrupted run leaves no half table under the name.
 */
public final class SyntheticTable {
    public static void main(String[] args) throws IOException {
        Path out = Path.of(args[0]);
        long rows = Long.parseLong(args[1]);
        int n = Integer.parseInt(args[2]);
        SplittableRandom r = new SplittableRandom(Long.parseLong(args[3]));
        int[] states = new int[n];
        int[][] parents = new int[n][];
        double[][][] cpt = new double[n][][]; // [variable][parent configuration][state] cumulative
        for (int i = 0; i < n; i++) {
            states[i] = 2 + r.nextInt(3);
            int k = Math.min(i, r.nextInt(3));
            parents[i] = new int[k];
            for (int p = 0; p < k; p++) {
                parents[i][p] = i - 1 - p - (i > 3 ? r.nextInt(Math.min(2, i - 1 - p)) : 0);
            }
            int q = 1;
            for (int p : parents[i]) {
                q *= states[p];
            }
            cpt[i] = new double[q][states[i]];
            for (int j = 0; j < q; j++) {
                double sum = 0;
                for (int s = 0; s < states[i]; s++) {
                    double w = -Math.log(1 - r.nextDouble()) * (s == j % states[i] ? 4 : 1);
                    cpt[i][j][s] = w;
                    sum += w;
                }
                double c = 0;
                for (int s = 0; s < states[i]; s++) {
                    c += cpt[i][j][s] / sum;
                    cpt[i][j][s] = c;
                }
            }
        }
        Path tmp = out.resolveSibling("." + out.getFileName() + ".part");
        byte[] line = new byte[n * 2];
        int[] x = new int[n];
        try (OutputStream w = new BufferedOutputStream(Files.newOutputStream(tmp), 1 << 20)) {
            StringBuilder h = new StringBuilder();
            for (int i = 0; i < n; i++) {
                h.append(i == 0 ? "" : ",").append("v").append(i + 1);
            }
            w.write(h.append('\n').toString().getBytes(StandardCharsets.US_ASCII));
            for (long row = 0; row < rows; row++) {
                for (int i = 0; i < n; i++) {
                    int j = 0;
                    for (int p : parents[i]) {
                        j = j * states[p] + x[p];
                    }
                    double u = r.nextDouble();
                    int s = 0;
                    while (s < states[i] - 1 && u > cpt[i][j][s]) {
                        s++;
                    }
                    x[i] = s;
                    line[2 * i] = (byte) ('0' + s);
                    line[2 * i + 1] = (byte) (i == n - 1 ? '\n' : ',');
                }
                w.write(line);
            }
        }
        Files.move(tmp, out, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
    }
}
