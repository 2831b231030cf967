package org.edgewise.driver.bench;

import java.io.BufferedOutputStream;
import java.io.IOException;
import java.io.OutputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashMap;
import java.util.Map;
import org.edgewise.driver.network.ForwardSampler;
import org.edgewise.driver.network.Network;
import org.edgewise.driver.network.RandomNetwork;
import org.edgewise.driver.result.EdgeResult;
import org.edgewise.driver.result.ResultJson;

/**
 * {@code scripts/bench cli-wide}'s two helpers: {@code data N ROWS SEED FILE} writes a table
 * forward-sampled from a random network (ternary, at most 2 parents among the 6 variables before
 * each, {@code RandomNetwork} seed SEED, rows seed SEED + 1) as CSV; {@code diff A.json B.json}
 * prints, for two {@code edges} results, their verdicts and the largest |Δ| over edge posteriors.
 */
public final class HeldOutBench {
    private HeldOutBench() {
    }

    public static void main(String[] args) throws IOException {
        if (args[0].equals("data")) {
            Network net = RandomNetwork.generate("v", Integer.parseInt(args[1]), 3, 2, 6, 1.5, 0, Long.parseLong(args[3]));
            try (OutputStream out = new BufferedOutputStream(Files.newOutputStream(Path.of(args[4])))) {
                new ForwardSampler(net).writeCsv(Long.parseLong(args[2]), Long.parseLong(args[3]) + 1, out, k -> { });
            }
            return;
        }
        EdgeResult a = ResultJson.readEdges(Path.of(args[1]));
        EdgeResult b = ResultJson.readEdges(Path.of(args[2]));
        Map<String, Double> pa = new HashMap<>();
        for (EdgeResult.Edge e : a.edges()) {
            pa.put(e.from() + "->" + e.to(), e.posterior());
        }
        double max = 0;
        String where = "-";
        for (EdgeResult.Edge e : b.edges()) {
            double d = Math.abs(e.posterior() - pa.get(e.from() + "->" + e.to()));
            if (d > max) {
                max = d;
                where = e.from() + " -> " + e.to();
            }
        }
        for (EdgeResult r : new EdgeResult[] {a, b}) {
            EdgeResult.Diagnostics d = r.diagnostics();
            System.out.printf("  %s prior, seed %d: converged %s (%s) after %d steps/chain, %.1f s sampling; max R-hat %.4f, "
                            + "min bulk eff. n %.0f, max MCSE %s%n", r.dagPrior(), d.seed(), d.converged(), d.stopReason(),
                    d.steps() + d.burnIn(), d.samplingSeconds(), d.rhat(), d.bulkEffectiveSampleSize(), d.mcse());
        }
        System.out.printf("  max |delta| over edge posteriors between the two runs: %.4f (%s)%n", max, where);
    }
}
